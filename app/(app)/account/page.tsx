import { requireUser } from '@/lib/auth/session';
import { SimpleForm } from '@/components/simple-form';
import { changePasswordAction, signOutOtherSessionsAction } from './actions';

export const metadata = { title: 'Your account' };

export default async function AccountPage() {
  const { user } = await requireUser();
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <h1 className="mb-4">Your account</h1>
      <p className="mb-6 text-sm text-ink-600">
        {user.name} · {user.email}
      </p>
      <div className="grid gap-6 md:grid-cols-2">
        <section className="panel p-5">
          <h2 className="mb-3">Change password</h2>
          <SimpleForm
            action={changePasswordAction}
            schema="changePassword"
            submitLabel="Change password"
            successMessage="Password changed. Every other session was signed out, and a notice went to your address."
            fields={[
              {
                name: 'currentPassword',
                label: 'Current password',
                type: 'password',
                autoComplete: 'current-password',
              },
              {
                name: 'newPassword',
                label: 'New password',
                type: 'password',
                autoComplete: 'new-password',
                hint: 'At least 12 characters; not a common password.',
              },
            ]}
          />
        </section>
        <section className="panel p-5">
          <h2 className="mb-3">Sessions</h2>
          <p className="mb-3 text-sm text-ink-600">
            Signed in on another computer or browser you no longer use? End those sessions; this one stays.
          </p>
          <SimpleForm
            action={signOutOtherSessionsAction}
            schema="empty"
            submitLabel="Sign out other sessions"
            fields={[]}
            successMessage="Every other session was signed out."
          />
        </section>
      </div>
    </main>
  );
}
