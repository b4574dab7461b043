export { PrintButton } from '@/components/print-button';
