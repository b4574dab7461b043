import Link from 'next/link';
import { SimpleForm } from '@/components/simple-form';
import { getSignUpRequest } from '@/lib/auth/service';
import { confirmSignUpAction } from '../../../actions';

export const metadata = { title: 'Finish creating your account' };

// A page with a button rather than a link that acts: mail scanners open links, only people press buttons.
export default async function ConfirmSignUpPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const r = await getSignUpRequest(token);
  if (!r)
    return (
      <>
        <h1 className="mb-2">Link not usable</h1>
        <p role="alert" className="text-sm">
          This link has been used, has expired or is not valid. <Link href="/sign-up">Sign up again</Link>.
        </p>
      </>
    );
  return (
    <>
      <h1 className="mb-1">Finish creating your account</h1>
      <p className="mb-4 text-sm text-ink-600">
        Account <strong>{r.email}</strong> with the organization <strong>{r.organizationName}</strong>.
      </p>
      <SimpleForm
        action={confirmSignUpAction}
        schema="token"
        submitLabel="Create my account"
        hidden={{ token }}
        fields={[]}
      />
    </>
  );
}
