import Link from 'next/link';
import { SimpleForm } from '@/components/simple-form';
import { signUpAction } from '../actions';

export const metadata = { title: 'Create an organization' };

export default function SignUpPage() {
  return (
    <>
      <h1 className="mb-1">Create an organization</h1>
      <p className="mb-4 text-sm text-ink-600">
        You become its owner and can invite engineers, safety reviewers and contractors.
      </p>
      <SimpleForm
        action={signUpAction}
        schema="signUp"
        submitLabel="Create account"
        successMessage="Check your e-mail: we sent a message to that address to finish creating your account. The link works once and expires in 24 hours."
        fields={[
          { name: 'name', label: 'Your name', autoComplete: 'name' },
          { name: 'email', label: 'Work e-mail', type: 'email', autoComplete: 'email' },
          {
            name: 'password',
            label: 'Password',
            type: 'password',
            autoComplete: 'new-password',
            hint: 'At least 12 characters; not a common password.',
          },
          { name: 'organizationName', label: 'Organization', autoComplete: 'organization' },
        ]}
      />
      <p className="mt-4 text-sm">
        Already have an account? <Link href="/sign-in">Sign in</Link>
      </p>
    </>
  );
}
