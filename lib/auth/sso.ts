/**
 * Company sign-in through OpenID Connect, free of Next.js: arctic builds the PKCE authorization URL,
 * the code exchange, discovery, keys and userinfo go through `outbound.ts` (address rules, time-out,
 * size cap, one generic error), and jose validates the ID token (signature, issuer, audience, azp,
 * expiry, nonce). The result is the same lucia session as a password sign-in.
 *
 * The rules that keep company sign-in from becoming an account takeover:
 * - A company identity is the pair (issuer, subject) recorded when it was first used. Only that pair
 *   signs in as its account. A different subject or issuer that claims the e-mail of an existing
 *   account never reaches it without a linking step the account itself proves: its password, or a
 *   one-time link mailed to the account's address and opened in the browser that came back from the
 *   provider (the pending link is bound to a secret held only in that browser's httpOnly cookie).
 * - A domain counts only once proven: a one-time link mailed to an administrative address of the
 *   domain (admin@, administrator@, hostmaster@, postmaster@, webmaster@). Public mail providers are
 *   refused outright (`public-mail-domains.ts`), a domain has one verified owner, and an existing
 *   account that belongs to other organizations only is never sent to the claimer's provider.
 * - The e-mail must be verified: `email_verified` true in the userinfo answer or the ID token. When
 *   the provider says nothing about it, the address is accepted only if its domain is one this
 *   organization has proven AND the issuer's host is that domain or below it (the domain's owner runs
 *   the provider, so it vouches for its own addresses). `email_verified: false` is always refused.
 * - A removal or a refused request is recorded (`membership_blocks`); company sign-in does not bring
 *   the person back until an owner re-admits them (an invitation, or approving a new request).
 */
import { and, eq, isNotNull, isNull, ne, sql } from 'drizzle-orm';
import { OAuth2Client, CodeChallengeMethod, generateCodeVerifier, generateState } from 'arctic';
import {
  createLocalJWKSet,
  jwtVerify,
  type JSONWebKeySet,
  type JWTPayload,
  type JWTVerifyGetKey,
} from 'jose';
import { generateIdFromEntropySize, type Session } from 'lucia';
import { z } from 'zod';
import { db } from '@/db/client';
import {
  domainVerifications,
  memberships,
  membershipBlocks,
  membershipRequests,
  organizations,
  pendingLinks,
  ssoConfigs,
  ssoDomains,
  userIdentities,
  users,
  type Role,
} from '@/db/schema';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { composeMail, sendMail } from '@/lib/mail';
import { lucia } from './lucia';
import { newToken, hashToken } from './tokens';
import { openSecret, sealSecret } from './secret-box';
import { OUTBOUND_ERROR, outboundJson, urlRefusal } from './outbound';
import { ADMIN_MAILBOXES, isPublicMailDomain, type AdminMailbox } from './public-mail-domains';

export const callbackUrl = () => `${env.appUrl()}/auth/company/callback`;
export const LINK_TTL_MINUTES = 15;
export const DOMAIN_PROOF_TTL_HOURS = 24;
export { OUTBOUND_ERROR };

// No enum here on purpose: conform's form parsing turns the empty option into undefined inside an
// enum, so "None until an owner approves" could not be chosen. A plain optional string keeps '' and
// a missing value both meaning "none".
const ROLE_VALUES: readonly string[] = ['owner', 'engineer', 'reviewer', 'contractor'];
const roleOrNone = z
  .string({ error: 'Role for people who arrive this way: choose a role or "None until an owner approves".' })
  .nullish()
  .refine((v) => !v || ROLE_VALUES.includes(v), {
    error: 'Role for people who arrive this way: choose a role or "None until an owner approves".',
  })
  .transform((r) => (r ? (r as Role) : null));

export const ssoConfigSchema = z.object({
  organizationId: z.uuid({ error: 'The organization is missing; reload the page.' }),
  issuer: z
    .string({
      error: 'Issuer URL: give the address of your identity provider, e.g. https://login.example.com',
    })
    .trim()
    .pipe(
      z.url({
        error: 'Issuer URL: give the address of your identity provider, e.g. https://login.example.com',
      }),
    )
    .transform((u) => u.replace(/\/$/, ''))
    .refine((u) => !urlRefusal(u), {
      error:
        'Issuer URL: use the https address of your identity provider on the public internet (no local or private addresses).',
    }),
  clientId: z
    .string({ error: 'Client id: give the client id your identity provider issued.' })
    .trim()
    .min(1, { error: 'Client id: give the client id your identity provider issued.' }),
  clientSecret: z.string().optional(),
  domains: z
    .string({ error: 'Allowed e-mail domains: give at least one, e.g. example.com' })
    .trim()
    .min(3, { error: 'Allowed e-mail domains: give at least one, e.g. example.com' })
    .transform((s) => [
      ...new Set(
        s
          .toLowerCase()
          .split(/[\s,;]+/)
          .filter(Boolean),
      ),
    ])
    .pipe(
      z
        .array(
          z.string().regex(/^[a-z0-9]([a-z0-9-]*[a-z0-9])?(\.[a-z0-9]([a-z0-9-]*[a-z0-9])?)*\.[a-z]{2,}$/, {
            error: 'Allowed e-mail domains: domains look like example.com',
          }),
        )
        .min(1),
    )
    .refine((ds) => !ds.some(isPublicMailDomain), {
      error:
        "Allowed e-mail domains: public mail providers (like gmail.com or outlook.com) cannot be claimed; use your organization's own domain.",
    }),
  newMemberRole: roleOrNone,
  passwordsAllowed: z.preprocess((v) => v === 'on' || v === true || v === 'true', z.boolean()),
});

/**
 * Saves an organization's company sign-in. Domains newly listed start unproven; ones already proven
 * stay proven; one that another organization has proven is refused.
 */
export async function saveSsoConfig(input: z.input<typeof ssoConfigSchema>) {
  const parsed = ssoConfigSchema.safeParse(input);
  if (!parsed.success) {
    const fields: Record<string, string[]> = {};
    for (const i of parsed.error.issues) (fields[String(i.path[0] ?? 'form')] ??= []).push(i.message);
    throw new AppError(
      'invalid',
      Object.values(fields)
        .map((v) => v[0])
        .join(' '),
      fields,
    );
  }
  const c = parsed.data;
  return db.transaction(async (tx) => {
    const [existing] = await tx
      .select()
      .from(ssoConfigs)
      .where(eq(ssoConfigs.organizationId, c.organizationId))
      .for('update');
    if (!existing && !c.clientSecret)
      throw new AppError('invalid', 'Client secret: give the client secret.', {
        clientSecret: ['Client secret: give the client secret.'],
      });
    const taken = await tx
      .select()
      .from(ssoDomains)
      .where(
        and(
          sql`${ssoDomains.domain} in ${c.domains}`,
          ne(ssoDomains.organizationId, c.organizationId),
          isNotNull(ssoDomains.verifiedAt),
        ),
      );
    if (taken.length) {
      const msg = `Allowed e-mail domains: ${taken.map((t) => t.domain).join(', ')} already belongs to another organization's company sign-in.`;
      throw new AppError('conflict', msg, { domains: [msg] });
    }
    const values = {
      issuer: c.issuer,
      clientId: c.clientId,
      clientSecretEnc: c.clientSecret ? sealSecret(c.clientSecret) : existing!.clientSecretEnc,
      newMemberRole: c.newMemberRole,
      passwordsAllowed: c.passwordsAllowed,
      updatedAt: new Date(),
    };
    await tx
      .insert(ssoConfigs)
      .values({ organizationId: c.organizationId, ...values })
      .onConflictDoUpdate({ target: ssoConfigs.organizationId, set: values });
    await tx
      .delete(ssoDomains)
      .where(
        and(eq(ssoDomains.organizationId, c.organizationId), sql`${ssoDomains.domain} not in ${c.domains}`),
      );
    await tx
      .delete(domainVerifications)
      .where(
        and(
          eq(domainVerifications.organizationId, c.organizationId),
          sql`${domainVerifications.domain} not in ${c.domains}`,
        ),
      );
    await tx
      .insert(ssoDomains)
      .values(c.domains.map((domain) => ({ domain, organizationId: c.organizationId })))
      .onConflictDoNothing();
    const rows = await tx.select().from(ssoDomains).where(eq(ssoDomains.organizationId, c.organizationId));
    return {
      domains: c.domains,
      unproven: rows
        .filter((r) => !r.verifiedAt)
        .map((r) => r.domain)
        .sort(),
    };
  });
}

export async function getSsoConfig(organizationId: string) {
  const [c] = await db.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, organizationId));
  if (!c) return null;
  const rows = await db
    .select()
    .from(ssoDomains)
    .where(eq(ssoDomains.organizationId, organizationId))
    .orderBy(ssoDomains.domain);
  // The secret never leaves the server: only whether one is set.
  return {
    issuer: c.issuer,
    clientId: c.clientId,
    hasSecret: !!c.clientSecretEnc,
    domains: rows.map((d) => d.domain),
    domainStatus: rows.map((d) => ({
      domain: d.domain,
      verified: !!d.verifiedAt,
      verifiedVia: d.verifiedVia,
    })),
    newMemberRole: c.newMemberRole,
    passwordsAllowed: c.passwordsAllowed,
  };
}

/** Mails a one-time proof link for a claimed, unproven domain to one of its administrative mailboxes; older links for it stop working. */
export async function requestDomainProof(o: {
  organizationId: string;
  domain: string;
  mailbox: AdminMailbox;
  actorId: string;
}) {
  const domain = o.domain.trim().toLowerCase();
  if (!ADMIN_MAILBOXES.includes(o.mailbox))
    throw new AppError('invalid', 'Mailbox: choose one of the administrative addresses.', {
      mailbox: ['Choose one of the administrative addresses.'],
    });
  if (isPublicMailDomain(domain)) throw new AppError('invalid', 'Public mail providers cannot be claimed.');
  const [claim] = await db
    .select()
    .from(ssoDomains)
    .where(and(eq(ssoDomains.organizationId, o.organizationId), eq(ssoDomains.domain, domain)));
  if (!claim)
    throw new AppError(
      'not_found',
      `${domain} is not one of this organization's company sign-in domains. Save it in the settings first.`,
    );
  if (claim.verifiedAt) throw new AppError('conflict', `${domain} is proven already.`);
  const [org] = await db.select().from(organizations).where(eq(organizations.id, o.organizationId));
  const sentTo = `${o.mailbox}@${domain}`;
  const { token, hash } = newToken();
  await db.transaction(async (tx) => {
    await tx
      .delete(domainVerifications)
      .where(
        and(eq(domainVerifications.organizationId, o.organizationId), eq(domainVerifications.domain, domain)),
      );
    await tx.insert(domainVerifications).values({
      tokenHash: hash,
      organizationId: o.organizationId,
      domain,
      sentTo,
      requestedBy: o.actorId,
      expiresAt: new Date(Date.now() + DOMAIN_PROOF_TTL_HOURS * 3_600_000),
    });
  });
  await sendMail(
    composeMail({
      to: sentTo,
      subject: `Confirm that ${org.name} may use ${domain} for company sign-in on Lagwise`,
      lines: [
        `${org.name} asked Lagwise to let people with ${domain} addresses sign in through its company identity provider.`,
        `This message went to ${sentTo} because only the administrators of ${domain} can read that mailbox. If ${org.name} is your organization and you agree, open the link and confirm. It works once and expires in ${DOMAIN_PROOF_TTL_HOURS} hours.`,
      ],
      link: { label: 'Confirm the domain', url: `${env.appUrl()}/verify-domain/${token}` },
      footer: `If you do not know ${org.name}, ignore this message: nothing changes.`,
    }),
  );
  return { sentTo };
}

export async function getDomainProof(token: string) {
  const [row] = await db
    .select({ v: domainVerifications, orgName: organizations.name })
    .from(domainVerifications)
    .innerJoin(organizations, eq(organizations.id, domainVerifications.organizationId))
    .where(eq(domainVerifications.tokenHash, hashToken(token)));
  if (!row || row.v.usedAt || row.v.expiresAt.getTime() < Date.now()) return { status: 'unusable' as const };
  return {
    status: 'open' as const,
    domain: row.v.domain,
    organizationName: row.orgName,
    sentTo: row.v.sentTo,
  };
}

/** Opening the mailed link and confirming proves the domain for that organization (once; one verified owner per domain). */
export async function confirmDomainProof(token: string) {
  return db.transaction(async (tx) => {
    const [v] = await tx
      .select()
      .from(domainVerifications)
      .where(eq(domainVerifications.tokenHash, hashToken(token)))
      .for('update');
    if (!v || v.usedAt || v.expiresAt.getTime() < Date.now())
      throw new AppError(
        'invalid',
        'This confirmation link has been used, has expired or is not valid. Ask the organization owner to send a new one.',
      );
    const [other] = await tx
      .select()
      .from(ssoDomains)
      .where(
        and(
          eq(ssoDomains.domain, v.domain),
          isNotNull(ssoDomains.verifiedAt),
          ne(ssoDomains.organizationId, v.organizationId),
        ),
      );
    if (other) throw new AppError('conflict', `${v.domain} is already proven by another organization.`);
    const [claim] = await tx
      .update(ssoDomains)
      .set({ verifiedAt: new Date(), verifiedVia: v.sentTo })
      .where(
        and(
          eq(ssoDomains.organizationId, v.organizationId),
          eq(ssoDomains.domain, v.domain),
          isNull(ssoDomains.verifiedAt),
        ),
      )
      .returning();
    if (!claim)
      throw new AppError(
        'invalid',
        'This confirmation link has been used, has expired or is not valid. Ask the organization owner to send a new one.',
      );
    await tx
      .update(domainVerifications)
      .set({ usedAt: new Date() })
      .where(eq(domainVerifications.tokenHash, v.tokenHash));
    return { domain: v.domain, organizationId: v.organizationId };
  });
}

/**
 * The organization whose company sign-in serves this address: a proven domain only, and never for an
 * existing account that belongs to other organizations but not to the claimer.
 */
export async function ssoForEmail(email: string) {
  const address = email.trim().toLowerCase();
  const domain = address.split('@')[1] ?? '';
  const [row] = await db
    .select({ cfg: ssoConfigs, name: organizations.name })
    .from(ssoDomains)
    .innerJoin(ssoConfigs, eq(ssoConfigs.organizationId, ssoDomains.organizationId))
    .innerJoin(organizations, eq(organizations.id, ssoDomains.organizationId))
    .where(and(eq(ssoDomains.domain, domain), isNotNull(ssoDomains.verifiedAt)));
  if (!row) return null;
  const orgsOfAccount = await db
    .select({ organizationId: memberships.organizationId })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(sql`lower(${users.email}) = ${address}`);
  if (orgsOfAccount.length && !orgsOfAccount.some((m) => m.organizationId === row.cfg.organizationId))
    return null;
  return { ...row.cfg, organizationName: row.name };
}

interface Discovery {
  issuer: string;
  authorization_endpoint: string;
  token_endpoint: string;
  userinfo_endpoint?: string;
  jwks_uri: string;
}
const discoveries = new Map<string, { at: number; d: Discovery }>();
const CACHE_MS = 300_000;

/** The provider's discovery document; every endpoint in it must pass the same address rules as the issuer. */
export async function discover(issuer: string): Promise<Discovery> {
  const hit = discoveries.get(issuer);
  if (hit && Date.now() - hit.at < CACHE_MS) return hit.d;
  const { json } = await outboundJson(`${issuer}/.well-known/openid-configuration`);
  const d = json as Partial<Discovery> | null;
  const endpoints = [
    d?.authorization_endpoint,
    d?.token_endpoint,
    d?.jwks_uri,
    ...(d?.userinfo_endpoint !== undefined ? [d.userinfo_endpoint] : []),
  ];
  if (!d || d.issuer !== issuer || endpoints.some((e) => typeof e !== 'string' || urlRefusal(e))) {
    console.error('[sso] discovery document refused for', issuer);
    throw new AppError('unsupported', OUTBOUND_ERROR);
  }
  discoveries.set(issuer, { at: Date.now(), d: d as Discovery });
  return d as Discovery;
}

const jwksCache = new Map<string, { at: number; keys: JWTVerifyGetKey }>();
async function jwksFor(uri: string): Promise<JWTVerifyGetKey> {
  const hit = jwksCache.get(uri);
  if (hit && Date.now() - hit.at < CACHE_MS) return hit.keys;
  const { json } = await outboundJson(uri);
  let keys: JWTVerifyGetKey;
  try {
    keys = createLocalJWKSet(json as JSONWebKeySet);
  } catch {
    throw new AppError('unsupported', OUTBOUND_ERROR);
  }
  jwksCache.set(uri, { at: Date.now(), keys });
  return keys;
}

/**
 * Verifies an ID token: signature against the issuer's keys, issuer, audience, expiry, nonce, and —
 * when it names several audiences or an authorized party — that the authorized party (azp) is this
 * client (OpenID Connect Core 1.0 §3.1.3.7, steps 4 and 5).
 */
export async function verifyIdToken(o: {
  idToken: string;
  keys: JWTVerifyGetKey;
  issuer: string;
  audience: string;
  nonce: string;
}): Promise<JWTPayload> {
  let payload: JWTPayload;
  try {
    ({ payload } = await jwtVerify(o.idToken, o.keys, {
      issuer: o.issuer,
      audience: o.audience,
      clockTolerance: 5,
      requiredClaims: ['sub', 'exp', 'iat'],
    }));
  } catch (e) {
    const code = (e as { code?: string }).code ?? '';
    const why =
      code === 'ERR_JWT_EXPIRED'
        ? 'it has expired'
        : code === 'ERR_JWT_CLAIM_VALIDATION_FAILED'
          ? `its ${(e as { claim?: string }).claim ?? 'claims'} does not match`
          : 'its signature is not valid';
    throw new AppError(
      'invalid',
      `The company sign-in was refused: the identity token is not acceptable (${why}).`,
    );
  }
  const audiences = Array.isArray(payload.aud) ? payload.aud : [payload.aud];
  if ((audiences.length > 1 || payload.azp !== undefined) && payload.azp !== o.audience) {
    throw new AppError(
      'invalid',
      'The company sign-in was refused: the identity token is not acceptable (it was issued to another party: azp).',
    );
  }
  if (payload.nonce !== o.nonce)
    throw new AppError(
      'invalid',
      'The company sign-in was refused: the identity token does not belong to this sign-in (nonce).',
    );
  return payload;
}

export interface SsoStart {
  url: string;
  state: string;
  codeVerifier: string;
  nonce: string;
  organizationId: string;
}

export async function beginSso({ email }: { email: string }): Promise<SsoStart> {
  const cfg = await ssoForEmail(email);
  if (!cfg)
    throw new AppError(
      'invalid',
      `No company sign-in is set up for ${email.split('@')[1] ?? 'this address'}. Sign in with your password.`,
    );
  const d = await discover(cfg.issuer);
  const state = generateState(),
    codeVerifier = generateCodeVerifier(),
    nonce = generateState();
  const client = new OAuth2Client(cfg.clientId, null, callbackUrl());
  const url = client.createAuthorizationURLWithPKCE(
    d.authorization_endpoint,
    state,
    CodeChallengeMethod.S256,
    codeVerifier,
    ['openid', 'email', 'profile'],
  );
  url.searchParams.set('nonce', nonce);
  url.searchParams.set('login_hint', email);
  return { url: url.toString(), state, codeVerifier, nonce, organizationId: cfg.organizationId };
}

export type SsoOutcome =
  | { kind: 'signed-in'; userId: string; session: Session }
  | { kind: 'pending'; organizationName: string }
  | { kind: 'blocked'; organizationName: string }
  | { kind: 'link-required'; linkToken: string; email: string; hasPassword: boolean };

/** The authorization-code exchange (client_secret_basic, as arctic sends it), through the outbound rules. */
async function exchangeCode(o: {
  tokenEndpoint: string;
  clientId: string;
  clientSecret: string;
  code: string;
  codeVerifier: string;
}) {
  const body = new URLSearchParams({
    grant_type: 'authorization_code',
    code: o.code,
    redirect_uri: callbackUrl(),
    code_verifier: o.codeVerifier,
  });
  const basic = Buffer.from(
    `${encodeURIComponent(o.clientId)}:${encodeURIComponent(o.clientSecret)}`,
  ).toString('base64');
  const r = await outboundJson(o.tokenEndpoint, {
    method: 'POST',
    body: body.toString(),
    okStatuses: [200, 400, 401],
    headers: { 'content-type': 'application/x-www-form-urlencoded', authorization: `Basic ${basic}` },
  });
  const t = r.json as { id_token?: unknown; access_token?: unknown } | null;
  if (r.status !== 200 || !t || typeof t.id_token !== 'string' || typeof t.access_token !== 'string') {
    throw new AppError(
      'invalid',
      'The company sign-in could not be completed: the authorization code was refused (used already, expired or not ours). Start again.',
    );
  }
  return { idToken: t.id_token, accessToken: t.access_token };
}

const isTrue = (v: unknown) => v === true || v === 'true';
const isFalse = (v: unknown) => v === false || v === 'false';

/**
 * The e-mail rule (see the file comment): verified by the provider, or — when the provider is silent —
 * vouched for by this organization's proven domain together with an issuer inside that domain.
 */
export function emailVouched(o: {
  issuer: string;
  domain: string;
  domainProven: boolean;
  flags: unknown[];
}): boolean {
  if (o.flags.some(isFalse)) return false;
  if (o.flags.some(isTrue)) return true;
  if (!o.domainProven) return false;
  let host: string;
  try {
    host = new URL(o.issuer).hostname.toLowerCase();
  } catch {
    return false;
  }
  return host === o.domain || host.endsWith(`.${o.domain}`);
}

/** The callback: checks state, exchanges the code, validates the ID token, then finds the bound account or asks for linking. */
export async function completeSso(o: {
  code: string | null;
  state: string | null;
  expected: { state: string; codeVerifier: string; nonce: string; organizationId: string } | null;
}): Promise<SsoOutcome> {
  if (!o.expected || !o.state || o.state !== o.expected.state)
    throw new AppError(
      'invalid',
      'This sign-in link is not valid any more (state mismatch). Start the company sign-in again.',
    );
  if (!o.code)
    throw new AppError('invalid', 'The company sign-in did not return an authorization code. Start again.');
  const [cfg] = await db
    .select()
    .from(ssoConfigs)
    .where(eq(ssoConfigs.organizationId, o.expected.organizationId));
  if (!cfg) throw new AppError('invalid', 'Company sign-in is no longer set up for this organization.');
  const d = await discover(cfg.issuer);
  const tokens = await exchangeCode({
    tokenEndpoint: d.token_endpoint,
    clientId: cfg.clientId,
    clientSecret: openSecret(cfg.clientSecretEnc),
    code: o.code,
    codeVerifier: o.expected.codeVerifier,
  });
  const claims = await verifyIdToken({
    idToken: tokens.idToken,
    keys: await jwksFor(d.jwks_uri),
    issuer: cfg.issuer,
    audience: cfg.clientId,
    nonce: o.expected.nonce,
  });
  const info = d.userinfo_endpoint
    ? (((
        await outboundJson(d.userinfo_endpoint, {
          headers: { authorization: `Bearer ${tokens.accessToken}` },
        })
      ).json as { sub?: string; email?: string; email_verified?: unknown; name?: string } | null) ?? {})
    : {};
  if (info.sub !== undefined && info.sub !== claims.sub)
    throw new AppError(
      'invalid',
      'The company sign-in was refused: the user information does not match the identity token.',
    );
  const email = String(info.email ?? claims.email ?? '')
    .trim()
    .toLowerCase();
  if (!email?.includes('@'))
    throw new AppError('invalid', 'The company account has no verified e-mail address.');
  const domain = email.split('@')[1];
  const [owns] = await db
    .select()
    .from(ssoDomains)
    .where(
      and(
        eq(ssoDomains.domain, domain),
        eq(ssoDomains.organizationId, cfg.organizationId),
        isNotNull(ssoDomains.verifiedAt),
      ),
    );
  // The flags of the source the address came from count (and the token's, when it names the same address); a "false" anywhere refuses.
  const fromInfo = info.email !== undefined;
  const flags = [
    info.email_verified,
    ...(!fromInfo || String(claims.email ?? '').toLowerCase() === email ? [claims.email_verified] : []),
  ];
  if (!emailVouched({ issuer: cfg.issuer, domain, domainProven: !!owns, flags }))
    throw new AppError('invalid', 'The company account has no verified e-mail address.');
  if (!owns) throw new AppError('forbidden', `${email} is not in a domain this organization signs in with.`);
  const subject = String(claims.sub);
  const [org] = await db.select().from(organizations).where(eq(organizations.id, cfg.organizationId));

  const [identity] = await db
    .select()
    .from(userIdentities)
    .where(and(eq(userIdentities.issuer, cfg.issuer), eq(userIdentities.subject, subject)));
  let userId = identity?.userId;
  if (!userId) {
    const [existing] = await db.select().from(users).where(sql`lower(${users.email}) = ${email}`);
    if (existing) {
      // Never attach a new (issuer, subject) to an existing account by e-mail alone: the account proves the link.
      const { token, hash } = newToken();
      await db.insert(pendingLinks).values({
        tokenHash: hash,
        issuer: cfg.issuer,
        subject,
        email,
        userId: existing.id,
        organizationId: cfg.organizationId,
        expiresAt: new Date(Date.now() + LINK_TTL_MINUTES * 60_000),
      });
      return { kind: 'link-required', linkToken: token, email, hasPassword: !!existing.passwordHash };
    }
    userId = await db.transaction(async (tx) => {
      const id = generateIdFromEntropySize(10);
      await tx
        .insert(users)
        .values({ id, email, name: String(info.name ?? claims.name ?? email), passwordHash: null });
      await tx.insert(userIdentities).values({ issuer: cfg.issuer, subject, userId: id });
      return id;
    });
  }
  const admitted = await admitMember({
    organizationId: cfg.organizationId,
    userId,
    newMemberRole: cfg.newMemberRole,
  });
  if (admitted !== 'member') return { kind: admitted, organizationName: org.name };
  return { kind: 'signed-in', userId, session: await lucia.createSession(userId, {}) };
}

/** Membership on arrival through company sign-in: a member stays; a removed or refused person stays out; others get the set role or wait. */
async function admitMember(o: {
  organizationId: string;
  userId: string;
  newMemberRole: Role | null;
}): Promise<'member' | 'pending' | 'blocked'> {
  return db.transaction(async (tx) => {
    const [member] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, o.organizationId), eq(memberships.userId, o.userId)));
    if (member) return 'member';
    const [block] = await tx
      .select()
      .from(membershipBlocks)
      .where(
        and(eq(membershipBlocks.organizationId, o.organizationId), eq(membershipBlocks.userId, o.userId)),
      );
    if (block) return 'blocked';
    if (o.newMemberRole) {
      await tx
        .insert(memberships)
        .values({ organizationId: o.organizationId, userId: o.userId, role: o.newMemberRole })
        .onConflictDoNothing();
      return 'member';
    }
    await tx
      .insert(membershipRequests)
      .values({ organizationId: o.organizationId, userId: o.userId })
      .onConflictDoNothing();
    return 'pending';
  });
}

async function openPendingLink(linkToken: string | undefined) {
  if (!linkToken) return null;
  const [p] = await db
    .select()
    .from(pendingLinks)
    .where(eq(pendingLinks.tokenHash, hashToken(linkToken)));
  if (!p || p.expiresAt.getTime() < Date.now()) return null;
  return p;
}

/** Records the identity for the account the pending link names, once, in one transaction with the link's removal. */
async function bindIdentity(p: typeof pendingLinks.$inferSelect) {
  return db.transaction(async (tx) => {
    const [gone] = await tx.delete(pendingLinks).where(eq(pendingLinks.tokenHash, p.tokenHash)).returning();
    if (!gone || !p.userId) return false;
    const [u] = await tx.select().from(users).where(eq(users.id, p.userId));
    if (!u || u.email.toLowerCase() !== p.email) return false;
    const [already] = await tx
      .select()
      .from(userIdentities)
      .where(and(eq(userIdentities.issuer, p.issuer), eq(userIdentities.subject, p.subject)));
    if (already) return already.userId === p.userId;
    await tx.insert(userIdentities).values({ issuer: p.issuer, subject: p.subject, userId: p.userId });
    return true;
  });
}

/** After a password sign-in in the browser that holds the linking cookie: link the waiting identity when it was meant for this account. */
export async function linkPendingIdentity({ userId, linkToken }: { userId: string; linkToken: string }) {
  const p = await openPendingLink(linkToken);
  if (!p || p.userId !== userId) return { linked: false as const };
  return { linked: await bindIdentity(p) };
}

/** Mails a one-time link to the address of the account a pending link names; it works only in the browser holding the linking cookie. */
export async function sendLinkMail({ linkToken }: { linkToken: string | undefined }) {
  const p = await openPendingLink(linkToken);
  if (!p?.userId)
    throw new AppError(
      'invalid',
      'The company sign-in to link has expired. Start the company sign-in again.',
    );
  const [u] = await db.select().from(users).where(eq(users.id, p.userId));
  const { token, hash } = newToken();
  await db.update(pendingLinks).set({ mailTokenHash: hash }).where(eq(pendingLinks.tokenHash, p.tokenHash));
  await sendMail(
    composeMail({
      to: u.email,
      subject: 'Link your company account to Lagwise',
      lines: [
        `Hello ${u.name},`,
        `Someone signed in to Lagwise with a company account for ${p.email} and asked to link it to your Lagwise account.`,
        `If that was you, open the link in the same browser within ${LINK_TTL_MINUTES} minutes. It works once.`,
      ],
      link: { label: 'Link my company account', url: `${env.appUrl()}/link-company/${token}` },
      footer: 'If it was not you, ignore this message: nothing is linked without it.',
    }),
  );
  return { sentTo: u.email };
}

/** The mailed link, opened: needs the mailed secret and the linking cookie of the browser that asked for it. */
export async function linkWithMail({
  linkToken,
  mailToken,
}: {
  linkToken: string | undefined;
  mailToken: string;
}) {
  const [p] = await db
    .select()
    .from(pendingLinks)
    .where(eq(pendingLinks.mailTokenHash, hashToken(mailToken)));
  if (!p || p.expiresAt.getTime() < Date.now())
    throw new AppError(
      'invalid',
      'This link has been used, has expired or is not valid. Start the company sign-in again.',
    );
  if (!linkToken || hashToken(linkToken) !== p.tokenHash)
    throw new AppError('forbidden', 'Open this link in the browser where you started the company sign-in.');
  if (!(await bindIdentity(p)))
    throw new AppError(
      'invalid',
      'This link has been used, has expired or is not valid. Start the company sign-in again.',
    );
  return { linked: true as const, email: p.email };
}

/** Whether this person may sign in with a password (false when an organization of theirs requires company sign-in). */
export async function passwordAllowedFor(userId: string): Promise<boolean> {
  const r = await db
    .select({ allowed: ssoConfigs.passwordsAllowed })
    .from(memberships)
    .innerJoin(ssoConfigs, eq(ssoConfigs.organizationId, memberships.organizationId))
    .where(eq(memberships.userId, userId));
  return r.every((x) => x.allowed);
}

export async function listMembershipRequests({ organizationId }: { organizationId: string }) {
  return db
    .select({ userId: users.id, name: users.name, email: users.email, since: membershipRequests.createdAt })
    .from(membershipRequests)
    .innerJoin(users, eq(users.id, membershipRequests.userId))
    .where(eq(membershipRequests.organizationId, organizationId));
}

/** Approving is an owner re-admitting the person: any earlier removal or refusal is lifted. */
export async function approveMembershipRequest({
  organizationId,
  userId,
  role,
}: {
  organizationId: string;
  userId: string;
  role: Role;
}) {
  await db.transaction(async (tx) => {
    const [r] = await tx
      .delete(membershipRequests)
      .where(
        and(eq(membershipRequests.organizationId, organizationId), eq(membershipRequests.userId, userId)),
      )
      .returning();
    if (!r) throw new AppError('not_found', 'No such request.');
    await tx
      .delete(membershipBlocks)
      .where(and(eq(membershipBlocks.organizationId, organizationId), eq(membershipBlocks.userId, userId)));
    await tx.insert(memberships).values({ organizationId, userId, role }).onConflictDoNothing();
  });
}

/** Refusing a request sticks: company sign-in does not file a new one until an owner invites the person. */
export async function refuseMembershipRequest({
  organizationId,
  userId,
}: {
  organizationId: string;
  userId: string;
}) {
  await db.transaction(async (tx) => {
    const [r] = await tx
      .delete(membershipRequests)
      .where(
        and(eq(membershipRequests.organizationId, organizationId), eq(membershipRequests.userId, userId)),
      )
      .returning();
    if (!r) throw new AppError('not_found', 'No such request.');
    await tx
      .insert(membershipBlocks)
      .values({ organizationId, userId, reason: 'refused' })
      .onConflictDoUpdate({
        target: [membershipBlocks.organizationId, membershipBlocks.userId],
        set: { reason: 'refused', createdAt: new Date() },
      });
  });
}
