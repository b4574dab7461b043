import { SimpleForm } from '@/components/simple-form';
import { getDomainProof } from '@/lib/auth/sso';
import { confirmDomainAction } from '../../actions';

export const metadata = { title: 'Confirm a domain' };

export default async function VerifyDomainPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const v = await getDomainProof(token);
  if (v.status !== 'open')
    return (
      <>
        <h1 className="mb-2">Link not usable</h1>
        <p role="alert" className="text-sm">
          This confirmation link has been used, has expired or is not valid. Ask the organization owner to
          send a new one.
        </p>
      </>
    );
  return (
    <>
      <h1 className="mb-1">Confirm {v.domain}</h1>
      <p className="mb-4 text-sm text-ink-600">
        {v.organizationName} asks to let people with <strong>{v.domain}</strong> addresses sign in through its
        company identity provider. This link was sent to {v.sentTo}. Confirm only if {v.organizationName} is
        your organization.
      </p>
      <SimpleForm
        action={confirmDomainAction}
        schema="token"
        submitLabel={`Confirm ${v.domain} for ${v.organizationName}`}
        hidden={{ token }}
        fields={[]}
        successMessage={`${v.domain} is confirmed for ${v.organizationName}.`}
      />
    </>
  );
}
