import Link from 'next/link';
import { redirect } from 'next/navigation';
import { SimpleForm } from '@/components/simple-form';
import { validateRequest } from '@/lib/auth/session';
import { cookies } from 'next/headers';
import { LINK_COOKIE, SSO_MESSAGE_COOKIE } from '@/lib/auth/cookie-names';
import { companySignInAction, sendLinkMailAction, signInAction } from '../actions';

export const metadata = { title: 'Sign in' };

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<{ reset?: string; company?: string }>;
}) {
  if ((await validateRequest()).user) redirect('/projects');
  const { reset, company } = await searchParams;
  const jar = await cookies();
  const companyMessage = company ? jar.get(SSO_MESSAGE_COOKIE)?.value : undefined;
  const linking = !!jar.get(LINK_COOKIE)?.value;
  return (
    <>
      <h1 className="mb-4">Sign in</h1>
      {reset ? (
        <p role="status" className="mb-4 text-sm text-mineral-800">
          Password changed. Sign in with the new one.
        </p>
      ) : null}
      {companyMessage ? (
        <p
          role="status"
          data-testid="company-message"
          className="mb-4 rounded border border-ochre-300 bg-ochre-50 px-3 py-2 text-sm text-ochre-900"
        >
          {companyMessage}
        </p>
      ) : null}
      {linking ? (
        <div className="mb-4 rounded border border-ink-200 px-3 py-2">
          <p className="mb-2 text-sm">A company account waits to be linked to your Lagwise account.</p>
          <SimpleForm
            action={sendLinkMailAction}
            schema="empty"
            submitLabel="E-mail me a one-time link"
            fields={[]}
            successMessage="Sent to the address of your Lagwise account. Open the link in this browser within 15 minutes."
          />
        </div>
      ) : null}
      <SimpleForm
        action={signInAction}
        schema="signIn"
        submitLabel="Sign in"
        fields={[
          { name: 'email', label: 'E-mail', type: 'email', autoComplete: 'username' },
          { name: 'password', label: 'Password', type: 'password', autoComplete: 'current-password' },
        ]}
      />
      <div className="mt-5 border-t border-ink-200 pt-4">
        <h2 className="mb-2 text-sm">Sign in with your company account</h2>
        <SimpleForm
          action={companySignInAction}
          schema="companySignIn"
          submitLabel="Continue with company sign-in"
          fields={[
            {
              name: 'email',
              label: 'Work e-mail',
              type: 'email',
              autoComplete: 'username',
              hint: 'For organizations that have set up company sign-in.',
            },
          ]}
        />
      </div>
      <div className="mt-4 flex justify-between text-sm">
        <Link href="/forgot-password">Forgot password?</Link>
        <Link href="/sign-up">Create an organization</Link>
      </div>
    </>
  );
}
