import { SimpleForm } from '@/components/simple-form';
import { resetPasswordAction } from '../../actions';

export const metadata = { title: 'Choose a new password' };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <>
      <h1 className="mb-4">Choose a new password</h1>
      <SimpleForm
        action={resetPasswordAction}
        schema="resetPassword"
        submitLabel="Save password"
        hidden={{ token }}
        fields={[
          {
            name: 'password',
            label: 'New password',
            type: 'password',
            autoComplete: 'new-password',
            hint: 'At least 12 characters. Signing in elsewhere ends when you save.',
          },
        ]}
      />
    </>
  );
}
