import Link from 'next/link';
import { SimpleForm } from '@/components/simple-form';
import { getInvitation } from '@/lib/auth/service';
import { validateRequest } from '@/lib/auth/session';
import { ROLE_LABEL } from '@/lib/auth/permissions';
import { acceptInviteExistingAction, acceptInviteNewAction } from '../../actions';

export const metadata = { title: 'Invitation' };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const inv = await getInvitation(token);
  if (inv.status !== 'open') {
    return (
      <>
        <h1 className="mb-2">Invitation not usable</h1>
        <p role="alert" className="text-sm text-ink-700">
          {inv.status === 'expired'
            ? 'This invitation has expired.'
            : 'This invitation has already been used or is not valid.'}{' '}
          Ask the organization owner for a new one.
        </p>
      </>
    );
  }
  const { user } = await validateRequest();
  return (
    <>
      <h1 className="mb-1">Join {inv.organizationName}</h1>
      <p className="mb-4 text-sm text-ink-600">
        Invitation for <strong>{inv.email}</strong> as <strong>{ROLE_LABEL[inv.role]}</strong>.
      </p>
      {user ? (
        <SimpleForm
          action={acceptInviteExistingAction}
          schema="acceptInviteExisting"
          submitLabel="Accept and join"
          hidden={{ token }}
          fields={[]}
        />
      ) : (
        <>
          <p className="mb-3 text-sm">
            Already have a Lagwise account with this address? <Link href="/sign-in">Sign in</Link>, then open
            this link again. Otherwise create your account here:
          </p>
          <SimpleForm
            action={acceptInviteNewAction}
            schema="acceptInviteNew"
            submitLabel="Create account and join"
            hidden={{ token }}
            fields={[
              { name: 'name', label: 'Your name', autoComplete: 'name' },
              {
                name: 'password',
                label: 'Password',
                type: 'password',
                autoComplete: 'new-password',
                hint: 'At least 12 characters.',
              },
            ]}
          />
        </>
      )}
    </>
  );
}
