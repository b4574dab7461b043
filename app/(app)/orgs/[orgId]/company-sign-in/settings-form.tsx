'use client';
import { startTransition, useActionState } from 'react';
import { ROLE_LABEL, ROLES } from '@/lib/auth/permissions';
import { saveCompanySignInAction } from './actions';

interface Current { issuer: string; clientId: string; hasSecret: boolean; domains: string[]; newMemberRole: string | null; passwordsAllowed: boolean }

export function CompanySignInForm({ organizationId, current, callbackUrl }: { organizationId: string; current: Current | null; callbackUrl: string }) {
  const [result, action, pending] = useActionState(saveCompanySignInAction, undefined);
  const err = (k: string) => (result?.error?.[k] ? <p className="field-error">{result.error[k]!.join(' ')}</p> : null);
  return (
    <form className="panel max-w-2xl space-y-4 p-5" onSubmit={(e) => { e.preventDefault(); const fd = new FormData(e.currentTarget); startTransition(() => action(fd)); }}>
      <input type="hidden" name="organizationId" value={organizationId} />
      {result?.status === 'success' ? <p role="status" className="text-sm text-mineral-800">Company sign-in saved.</p> : null}
      {result?.error?.[''] ? <p role="alert" className="text-sm text-alarm-700">{result.error[''].join(' ')}</p> : null}
      <div><label className="label" htmlFor="cs-issuer">Issuer URL</label><input id="cs-issuer" name="issuer" className="input" defaultValue={current?.issuer ?? ''} />{err('issuer')}</div>
      <div><label className="label" htmlFor="cs-client">Client id</label><input id="cs-client" name="clientId" className="input" defaultValue={current?.clientId ?? ''} />{err('clientId')}</div>
      <div><label className="label" htmlFor="cs-secret">Client secret</label><input id="cs-secret" name="clientSecret" type="password" autoComplete="off" className="input" placeholder={current?.hasSecret ? 'stored — leave empty to keep it' : ''} />{err('clientSecret')}
        <p className="mt-1 text-xs text-ink-500">Stored encrypted; it is never shown again or sent to a browser.</p></div>
      <div><label className="label" htmlFor="cs-domains">Allowed e-mail domains</label><input id="cs-domains" name="domains" className="input" defaultValue={current?.domains.join(', ') ?? ''} />{err('domains')}</div>
      <div><label className="label" htmlFor="cs-role">Role for people who arrive this way</label>
        <select id="cs-role" name="newMemberRole" className="input" defaultValue={current?.newMemberRole ?? ''}>
          <option value="">None until an owner approves</option>{ROLES.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
        </select></div>
      <label className="flex items-center gap-2 text-sm"><input type="checkbox" name="passwordsAllowed" defaultChecked={current?.passwordsAllowed ?? true} /> Passwords stay allowed for members</label>
      <p className="text-xs text-ink-500">Register this redirect address with your identity provider: <code>{callbackUrl}</code></p>
      <button className="btn-primary" disabled={pending}>Save company sign-in</button>
    </form>
  );
}
