import { SimpleForm } from '@/components/simple-form';
import { linkCompanyAccountAction } from '../../actions';

export const metadata = { title: 'Link your company account' };

export default async function LinkCompanyPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <>
      <h1 className="mb-1">Link your company account</h1>
      <p className="mb-4 text-sm text-ink-600">
        This works only in the browser where you signed in with the company account, within 15 minutes.
      </p>
      <SimpleForm
        action={linkCompanyAccountAction}
        schema="token"
        submitLabel="Link my company account"
        hidden={{ token }}
        fields={[]}
      />
    </>
  );
}
