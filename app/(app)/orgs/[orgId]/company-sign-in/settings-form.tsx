'use client';
import { startTransition, useActionState } from 'react';
import { ROLE_LABEL, ROLES } from '@/lib/auth/permissions';
import { SimpleForm } from '@/components/simple-form';
import { saveCompanySignInAction, sendDomainProofAction } from './actions';

interface Current {
  issuer: string;
  clientId: string;
  hasSecret: boolean;
  domains: string[];
  newMemberRole: string | null;
  passwordsAllowed: boolean;
  domainStatus: { domain: string; verified: boolean; verifiedVia: string | null }[];
}
const MAILBOXES = ['admin', 'administrator', 'hostmaster', 'postmaster', 'webmaster'];

export function CompanySignInForm({
  organizationId,
  current,
  callbackUrl,
}: {
  organizationId: string;
  current: Current | null;
  callbackUrl: string;
}) {
  const [result, action, pending] = useActionState(saveCompanySignInAction, undefined);
  const err = (k: string) =>
    result?.error?.[k] ? <p className="field-error">{result.error[k]!.join(' ')}</p> : null;
  return (
    <div className="space-y-6">
      <form
        className="panel max-w-2xl space-y-4 p-5"
        onSubmit={(e) => {
          e.preventDefault();
          const fd = new FormData(e.currentTarget);
          startTransition(() => action(fd));
        }}
      >
        <input type="hidden" name="organizationId" value={organizationId} />
        {result?.status === 'success' ? (
          <p role="status" className="text-sm text-mineral-800">
            Company sign-in saved.
          </p>
        ) : null}
        {result?.error?.[''] ? (
          <p role="alert" className="text-sm text-alarm-700">
            {result.error[''].join(' ')}
          </p>
        ) : null}
        <div>
          <label className="label" htmlFor="cs-issuer">
            Issuer URL
          </label>
          <input id="cs-issuer" name="issuer" className="input" defaultValue={current?.issuer ?? ''} />
          {err('issuer')}
        </div>
        <div>
          <label className="label" htmlFor="cs-client">
            Client id
          </label>
          <input id="cs-client" name="clientId" className="input" defaultValue={current?.clientId ?? ''} />
          {err('clientId')}
        </div>
        <div>
          <label className="label" htmlFor="cs-secret">
            Client secret
          </label>
          <input
            id="cs-secret"
            name="clientSecret"
            type="password"
            autoComplete="off"
            className="input"
            placeholder={current?.hasSecret ? 'stored — leave empty to keep it' : ''}
          />
          {err('clientSecret')}
          <p className="mt-1 text-xs text-ink-500">
            Stored encrypted; it is never shown again or sent to a browser.
          </p>
        </div>
        <div>
          <label className="label" htmlFor="cs-domains">
            Allowed e-mail domains
          </label>
          <input
            id="cs-domains"
            name="domains"
            className="input"
            defaultValue={current?.domains.join(', ') ?? ''}
          />
          {err('domains')}
          <p className="mt-1 text-xs text-ink-500">
            Your organization&apos;s own domains. A domain takes effect once proven (below); public mail
            providers cannot be claimed.
          </p>
        </div>
        <div>
          <label className="label" htmlFor="cs-role">
            Role for people who arrive this way
          </label>
          <select
            id="cs-role"
            name="newMemberRole"
            className="input"
            defaultValue={current?.newMemberRole ?? ''}
          >
            <option value="">None until an owner approves</option>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABEL[r]}
              </option>
            ))}
          </select>
          {err('newMemberRole')}
          <p className="mt-1 text-xs text-ink-500">
            People you removed or refused stay out until you invite them again.
          </p>
        </div>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" name="passwordsAllowed" defaultChecked={current?.passwordsAllowed ?? true} />{' '}
          Passwords stay allowed for members
        </label>
        <p className="text-xs text-ink-500">
          Register this redirect address with your identity provider: <code>{callbackUrl}</code>
        </p>
        <button type="submit" className="btn-primary" disabled={pending}>
          Save company sign-in
        </button>
      </form>
      {current?.domainStatus.length ? (
        <section className="panel max-w-2xl p-5" aria-label="Domain proof">
          <h2 className="mb-2">Domains</h2>
          <p className="mb-3 text-sm text-ink-600">
            A domain counts once someone who reads one of its administrative mailboxes confirms it through a
            one-time link.
          </p>
          <ul className="space-y-4 text-sm">
            {current.domainStatus.map((d) => (
              <li key={d.domain} data-testid={`domain-${d.domain}`}>
                <p>
                  <strong>{d.domain}</strong> ·{' '}
                  {d.verified
                    ? `proven (${d.verifiedVia ?? 'confirmed'})`
                    : 'not proven yet — company sign-in does not use it'}
                </p>
                {d.verified ? null : (
                  <SimpleForm
                    action={sendDomainProofAction}
                    schema="domainProof"
                    submitLabel={`Send proof link for ${d.domain}`}
                    hidden={{ organizationId, domain: d.domain }}
                    successMessage="Sent. Ask the mailbox's reader to open the link and confirm."
                    fields={[
                      {
                        name: 'mailbox',
                        label: `Mailbox at ${d.domain}`,
                        type: 'select',
                        options: MAILBOXES.map((m) => ({ value: m, label: `${m}@${d.domain}` })),
                      },
                    ]}
                  />
                )}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
