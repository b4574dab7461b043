import Link from 'next/link';
import { SimpleForm } from '@/components/simple-form';
import { forgotPasswordAction } from '../actions';

export const metadata = { title: 'Reset password' };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="mb-1">Reset your password</h1>
      <p className="mb-4 text-sm text-ink-600">We e-mail a link that works once, for one hour.</p>
      <SimpleForm
        action={forgotPasswordAction}
        schema="forgotPassword"
        submitLabel="Send reset link"
        successMessage="If an account uses that address, a reset link is on its way."
        fields={[{ name: 'email', label: 'E-mail', type: 'email', autoComplete: 'username' }]}
      />
      <p className="mt-4 text-sm">
        <Link href="/sign-in">Back to sign in</Link>
      </p>
    </>
  );
}
