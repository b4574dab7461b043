import Link from 'next/link';
import { requireUser } from '@/lib/auth/session';
import { listOrganizationsForUser } from '@/db/queries/projects';
import { can, ROLE_LABEL, SCOPE_LABEL, scopesForRole } from '@/lib/auth/permissions';
import { listApiTokens, listTokenEvents, TOKEN_EXPIRY_CHOICES } from '@/lib/auth/api-tokens';
import { TokenPanel } from './token-panel';

export const metadata = { title: 'API tokens' };

const when = (d: Date | null) => (d ? `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC` : '—');

export default async function TokensPage() {
  const { user } = await requireUser();
  const orgs = await listOrganizationsForUser({ userId: user.id });
  const sections = await Promise.all(
    orgs.map(async (o) => ({
      ...o,
      mayCreate: can(o.role, 'tokens.create'),
      scopes: scopesForRole(o.role).map((s) => ({ value: s, label: SCOPE_LABEL[s] })),
      tokens: (await listApiTokens({ userId: user.id, organizationId: o.id })).map((t) => ({
        id: t.id,
        name: t.name,
        prefix: t.prefix,
        scopes: t.scopes,
        expiresAt: when(t.expiresAt),
        createdAt: when(t.createdAt),
        lastUsedAt: when(t.lastUsedAt),
        revokedAt: t.revokedAt ? when(t.revokedAt) : null,
        expired: t.expiresAt.getTime() <= Date.now(),
      })),
      events: (await listTokenEvents({ userId: user.id, organizationId: o.id, limit: 20 })).map((e) => ({
        ...e,
        at: when(e.at),
      })),
    })),
  );
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <p className="mb-2 text-sm">
        <Link href="/account">← Your account</Link>
      </p>
      <h1 className="mb-2">API tokens</h1>
      <p className="mb-6 max-w-3xl text-sm text-ink-600">
        A personal access token lets a script call the Lagwise API as you, in one organization, with only the
        scopes you give it: send it as <code>Authorization: Bearer lgw_…</code>. It is shown once when you
        make it; Lagwise keeps only a fingerprint of it. Every use is recorded. Revoke a token you no longer
        need.
      </p>
      {sections.map((s) => (
        <section key={s.id} className="panel mb-6 p-5" aria-label={`Tokens in ${s.name}`}>
          <h2 className="mb-1">{s.name}</h2>
          <p className="mb-4 text-sm text-ink-600">Your role: {ROLE_LABEL[s.role]}</p>
          {s.mayCreate || s.tokens.length ? (
            <TokenPanel
              organizationId={s.id}
              mayCreate={s.mayCreate}
              scopes={s.scopes}
              expiryChoices={[...TOKEN_EXPIRY_CHOICES]}
              tokens={s.tokens}
              events={s.events}
            />
          ) : null}
          {!s.mayCreate ? (
            <p className="text-sm text-ink-600" role="note">
              Your role in {s.name} does not allow making API tokens; owners and engineers can make them.
            </p>
          ) : null}
        </section>
      ))}
    </main>
  );
}
