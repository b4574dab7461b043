import Link from 'next/link';
import { Wordmark } from '@/components/logo';

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-ink-100 px-4 pt-16">
      <Link href="/" className="mb-8 no-underline">
        <Wordmark />
      </Link>
      <div className="panel w-full max-w-sm p-6 shadow-sm">{children}</div>
    </div>
  );
}
