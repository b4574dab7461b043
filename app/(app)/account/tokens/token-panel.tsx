'use client';
import { useState, useTransition } from 'react';
import { useRouter } from 'next/navigation';
import { createTokenAction, revokeTokenAction } from './actions';

interface TokenRow {
  id: string;
  name: string;
  prefix: string;
  scopes: string[];
  expiresAt: string;
  createdAt: string;
  lastUsedAt: string;
  revokedAt: string | null;
  expired: boolean;
}
interface EventRow {
  id: number;
  at: string;
  tokenId: string;
  action: string;
  method: string | null;
  path: string | null;
  status: number | null;
}

const EVENT_LABEL: Record<string, string> = {
  created: 'made',
  revoked: 'revoked',
  used: 'used',
  refused: 'refused',
};

/** Make a token (shown once), list tokens with their last use, revoke. */
export function TokenPanel({
  organizationId,
  mayCreate,
  scopes,
  expiryChoices,
  tokens,
  events,
}: {
  organizationId: string;
  mayCreate: boolean;
  scopes: { value: string; label: string }[];
  expiryChoices: number[];
  tokens: TokenRow[];
  events: EventRow[];
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [error, setError] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const [made, setMade] = useState<{ token: string; name: string } | null>(null);
  const [copied, setCopied] = useState(false);
  const names = new Map(tokens.map((t) => [t.id, t.name]));

  function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    const input = {
      name: String(fd.get('name') ?? ''),
      scopes: fd.getAll('scopes').map(String),
      days: Number(fd.get('days')),
    };
    const form = e.currentTarget;
    start(async () => {
      const r = await createTokenAction(organizationId, input);
      if (!r.ok) {
        setError(r.error);
        setFieldErrors(r.fields ?? {});
        return;
      }
      setError(null);
      setFieldErrors({});
      setCopied(false);
      setMade({ token: r.data.token, name: r.data.name });
      form.reset();
      router.refresh();
    });
  }

  function revoke(id: string) {
    start(async () => {
      const r = await revokeTokenAction({ tokenId: id });
      if (!r.ok) {
        setError(r.error);
        return;
      }
      setError(null);
      router.refresh();
    });
  }

  return (
    <div className="space-y-5">
      {error ? (
        <div
          role="alert"
          className="rounded border border-alarm-500 bg-alarm-50 px-3 py-2 text-sm text-alarm-700"
        >
          {error}
        </div>
      ) : null}
      {made ? (
        <div
          role="status"
          className="rounded border border-mineral-300 bg-mineral-50 p-3 text-sm text-mineral-900"
        >
          <p className="mb-2 font-medium">
            Token “{made.name}” made. Copy it now: it is shown only this once.
          </p>
          <div className="flex gap-2">
            <input
              aria-label="New API token"
              readOnly
              value={made.token}
              className="input font-mono"
              onFocus={(e) => e.currentTarget.select()}
            />
            <button
              type="button"
              className="btn-quiet"
              onClick={() => {
                void navigator.clipboard?.writeText(made.token).then(
                  () => setCopied(true),
                  () => {},
                );
              }}
            >
              {copied ? 'Copied' : 'Copy'}
            </button>
            <button type="button" className="btn-quiet" onClick={() => setMade(null)}>
              Done
            </button>
          </div>
        </div>
      ) : null}
      {mayCreate ? (
        <form onSubmit={submit} className="grid gap-4 md:grid-cols-3" aria-label="Make an API token">
          <div>
            <label htmlFor={`name-${organizationId}`} className="label">
              Token name
            </label>
            <input
              id={`name-${organizationId}`}
              name="name"
              className="input"
              maxLength={80}
              placeholder="e.g. nightly batch"
              aria-invalid={fieldErrors.name ? true : undefined}
            />
            {fieldErrors.name ? <p className="field-error">{fieldErrors.name.join(' ')}</p> : null}
          </div>
          <fieldset>
            <legend className="label">Scopes</legend>
            {scopes.map((s) => (
              <label key={s.value} className="flex items-center gap-2 text-sm">
                <input type="checkbox" name="scopes" value={s.value} defaultChecked={s.value === 'calc'} />{' '}
                <code>{s.value}</code> <span className="text-ink-500">{s.label}</span>
              </label>
            ))}
            {fieldErrors.scopes ? <p className="field-error">{fieldErrors.scopes.join(' ')}</p> : null}
          </fieldset>
          <div>
            <label htmlFor={`days-${organizationId}`} className="label">
              Expires after
            </label>
            <select id={`days-${organizationId}`} name="days" className="input" defaultValue="90">
              {expiryChoices.map((d) => (
                <option key={d} value={d}>
                  {d} days
                </option>
              ))}
            </select>
            <button type="submit" className="btn-primary mt-4" disabled={pending}>
              {pending ? 'Working…' : 'Make token'}
            </button>
          </div>
        </form>
      ) : null}
      {tokens.length ? (
        // On a narrow screen the table scrolls in its own box, not the page.
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead>
              <tr className="border-b border-ink-200 text-xs uppercase text-ink-500">
                <th className="py-1">Name</th>
                <th>Token</th>
                <th>Scopes</th>
                <th>Made</th>
                <th>Expires</th>
                <th>Last used</th>
                <th>State</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {tokens.map((t) => {
                const state = t.revokedAt ? `Revoked ${t.revokedAt}` : t.expired ? 'Expired' : 'Active';
                return (
                  <tr key={t.id} className="border-b border-ink-100" data-testid="token-row">
                    <td className="py-1.5">{t.name}</td>
                    <td className="font-mono text-xs">{t.prefix}…</td>
                    <td>{t.scopes.join(', ')}</td>
                    <td>{t.createdAt}</td>
                    <td>{t.expiresAt}</td>
                    <td>{t.lastUsedAt}</td>
                    <td>{state}</td>
                    <td>
                      {!t.revokedAt ? (
                        <button
                          type="button"
                          className="btn-danger"
                          disabled={pending}
                          onClick={() => revoke(t.id)}
                          aria-label={`Revoke ${t.name}`}
                        >
                          Revoke
                        </button>
                      ) : null}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="text-sm text-ink-500">No tokens yet.</p>
      )}
      {events.length ? (
        <details>
          <summary className="cursor-pointer text-sm">Recent token activity</summary>
          <ul className="mt-2 space-y-0.5 text-xs text-ink-700">
            {events.map((e) => (
              <li key={e.id}>
                {e.at} · {names.get(e.tokenId) ?? 'token'} · {EVENT_LABEL[e.action] ?? e.action}
                {e.path ? ` · ${e.method} ${e.path} → ${e.status}` : ''}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
