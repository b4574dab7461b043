import Link from 'next/link';
import { redirect } from 'next/navigation';
import { SimpleForm } from '@/components/simple-form';
import { validateRequest } from '@/lib/auth/session';
import { signInAction } from '../actions';

export const metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ reset?: string }> }) {
  if ((await validateRequest()).user) redirect('/projects');
  const { reset } = await searchParams;
  return (
    <>
      <h1 className="mb-4">Sign in</h1>
      {reset ? <p role="status" className="mb-4 text-sm text-mineral-800">Password changed. Sign in with the new one.</p> : null}
      <SimpleForm action={signInAction} schema="signIn" submitLabel="Sign in" fields={[
        { name: 'email', label: 'E-mail', type: 'email', autoComplete: 'username' },
        { name: 'password', label: 'Password', type: 'password', autoComplete: 'current-password' },
      ]} />
      <div className="mt-4 flex justify-between text-sm">
        <Link href="/forgot-password">Forgot password?</Link>
        <Link href="/sign-up">Create an organization</Link>
      </div>
    </>
  );
}
