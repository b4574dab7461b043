import { loadOrganization } from '@/lib/server/page';
import { Denied } from '@/components/denied';
import { callbackUrl, getSsoConfig } from '@/lib/auth/sso';
import { CompanySignInForm } from './settings-form';

export const metadata = { title: 'Company sign-in' };

export default async function CompanySignInPage({ params }: { params: Promise<{ orgId: string }> }) {
  const { orgId } = await params;
  const { allowed } = await loadOrganization(orgId, 'org.settings');
  if (!allowed)
    return (
      <main className="p-6">
        <Denied what="Company sign-in settings" />
      </main>
    );
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <h1 className="mb-2">Company sign-in</h1>
      <p className="mb-4 max-w-2xl text-sm text-ink-600">
        People of your organization sign in with their company account (OpenID Connect). A company account is
        tied to the Lagwise account it first signed in as; someone who already has a Lagwise account links a
        new company account once, with the Lagwise password or a link mailed to their address.
      </p>
      <CompanySignInForm
        organizationId={orgId}
        current={await getSsoConfig(orgId)}
        callbackUrl={callbackUrl()}
      />
    </main>
  );
}
