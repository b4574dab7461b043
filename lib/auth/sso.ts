/**
 * Company sign-in through OpenID Connect, free of Next.js: arctic's OAuth 2.0 client with PKCE and
 * state, endpoint discovery, ID-token validation with jose (signature, issuer, audience, expiry,
 * nonce) and the userinfo e-mail. The result is the same lucia session as a password sign-in.
 * A person who already has a password account is linked only after one password sign-in.
 */
import { and, eq, sql } from 'drizzle-orm';
import { OAuth2Client, CodeChallengeMethod, generateCodeVerifier, generateState } from 'arctic';
import { createRemoteJWKSet, jwtVerify, type JWTPayload, type JWTVerifyGetKey } from 'jose';
import { generateIdFromEntropySize, type Session } from 'lucia';
import { z } from 'zod';
import { db } from '@/db/client';
import { memberships, membershipRequests, organizations, pendingLinks, ssoConfigs, ssoDomains, userIdentities, users, type Role } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { lucia } from './lucia';
import { newToken, hashToken } from './tokens';
import { openSecret, sealSecret } from './secret-box';

export const SSO_TIMEOUT_MS = Number(process.env.OIDC_TIMEOUT_MS ?? 5000);
export const callbackUrl = () => `${env.appUrl()}/auth/company/callback`;

export const ssoConfigSchema = z.object({
  organizationId: z.uuid(),
  issuer: z.url({ error: 'Give the issuer URL, e.g. https://login.example.com' }).transform((u) => u.replace(/\/$/, '')),
  clientId: z.string().trim().min(1, { error: 'Give the client id' }),
  clientSecret: z.string().optional(),
  domains: z.string().trim().min(3, { error: 'Give at least one e-mail domain' }).transform((s) => [...new Set(s.toLowerCase().split(/[\s,;]+/).filter(Boolean))])
    .pipe(z.array(z.string().regex(/^[a-z0-9.-]+\.[a-z]{2,}$/, { error: 'Domains look like example.com' })).min(1)),
  newMemberRole: z.enum(['', 'owner', 'engineer', 'reviewer', 'contractor']).transform((r) => (r === '' ? null : (r as Role))),
  passwordsAllowed: z.preprocess((v) => v === 'on' || v === true || v === 'true', z.boolean()),
});

/** Saves an organization's company sign-in. A domain another organization claims is refused. */
export async function saveSsoConfig(input: z.input<typeof ssoConfigSchema>) {
  const c = ssoConfigSchema.parse(input);
  return db.transaction(async (tx) => {
    const [existing] = await tx.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, c.organizationId));
    if (!existing && !c.clientSecret) throw new AppError('invalid', 'Give the client secret.', { clientSecret: ['Give the client secret.'] });
    const taken = await tx.select().from(ssoDomains).where(sql`${ssoDomains.domain} in ${c.domains} and ${ssoDomains.organizationId} <> ${c.organizationId}`);
    if (taken.length) throw new AppError('conflict', `${taken.map((t) => t.domain).join(', ')} already belongs to another organization's company sign-in.`, { domains: ['A domain can belong to one organization only.'] });
    const values = { issuer: c.issuer, clientId: c.clientId, clientSecretEnc: c.clientSecret ? sealSecret(c.clientSecret) : existing!.clientSecretEnc, newMemberRole: c.newMemberRole, passwordsAllowed: c.passwordsAllowed, updatedAt: new Date() };
    await tx.insert(ssoConfigs).values({ organizationId: c.organizationId, ...values }).onConflictDoUpdate({ target: ssoConfigs.organizationId, set: values });
    await tx.delete(ssoDomains).where(eq(ssoDomains.organizationId, c.organizationId));
    await tx.insert(ssoDomains).values(c.domains.map((domain) => ({ domain, organizationId: c.organizationId })));
    return { domains: c.domains };
  });
}

export async function getSsoConfig(organizationId: string) {
  const [c] = await db.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, organizationId));
  if (!c) return null;
  const domains = (await db.select().from(ssoDomains).where(eq(ssoDomains.organizationId, organizationId))).map((d) => d.domain);
  // The secret never leaves the server: only whether one is set.
  return { issuer: c.issuer, clientId: c.clientId, hasSecret: !!c.clientSecretEnc, domains, newMemberRole: c.newMemberRole, passwordsAllowed: c.passwordsAllowed };
}

export async function ssoForEmail(email: string) {
  const domain = email.trim().toLowerCase().split('@')[1] ?? '';
  const [row] = await db.select({ cfg: ssoConfigs, name: organizations.name }).from(ssoDomains)
    .innerJoin(ssoConfigs, eq(ssoConfigs.organizationId, ssoDomains.organizationId)).innerJoin(organizations, eq(organizations.id, ssoDomains.organizationId))
    .where(eq(ssoDomains.domain, domain));
  return row ? { ...row.cfg, organizationName: row.name } : null;
}

async function fetchJson(url: string, init?: RequestInit) {
  let r: Response;
  try { r = await fetch(url, { ...init, signal: AbortSignal.timeout(SSO_TIMEOUT_MS) }); }
  catch (e) {
    const timeout = (e as Error).name === 'TimeoutError';
    throw new AppError('unsupported', timeout ? 'Your company\'s sign-in service did not answer in time. Try again later, or use your password if your organization allows it.' : 'Your company\'s sign-in service cannot be reached. Try again later, or use your password if your organization allows it.');
  }
  if (!r.ok) throw new AppError('invalid', `The company sign-in service answered ${r.status}; sign-in could not be completed.`);
  return r.json();
}

interface Discovery { issuer: string; authorization_endpoint: string; token_endpoint: string; userinfo_endpoint?: string; jwks_uri: string }
const discoveries = new Map<string, { at: number; d: Discovery }>();
export async function discover(issuer: string): Promise<Discovery> {
  const hit = discoveries.get(issuer);
  if (hit && Date.now() - hit.at < 300_000) return hit.d;
  const d = (await fetchJson(`${issuer}/.well-known/openid-configuration`)) as Discovery;
  if (d.issuer !== issuer) throw new AppError('invalid', 'The company sign-in service describes a different issuer than configured.');
  discoveries.set(issuer, { at: Date.now(), d });
  return d;
}

const jwksCache = new Map<string, JWTVerifyGetKey>();
const jwksFor = (uri: string) => { let j = jwksCache.get(uri); if (!j) { j = createRemoteJWKSet(new URL(uri), { timeoutDuration: SSO_TIMEOUT_MS }); jwksCache.set(uri, j); } return j; };

/** Verifies an ID token: signature against the issuer's keys, issuer, audience, expiry and nonce. */
export async function verifyIdToken(o: { idToken: string; keys: JWTVerifyGetKey; issuer: string; audience: string; nonce: string }): Promise<JWTPayload> {
  let payload: JWTPayload;
  try { ({ payload } = await jwtVerify(o.idToken, o.keys, { issuer: o.issuer, audience: o.audience, clockTolerance: 5 })); }
  catch (e) {
    const code = (e as { code?: string }).code ?? '';
    const why = code === 'ERR_JWT_EXPIRED' ? 'it has expired' : code === 'ERR_JWT_CLAIM_VALIDATION_FAILED' ? `its ${(e as { claim?: string }).claim ?? 'claims'} does not match` : 'its signature is not valid';
    throw new AppError('invalid', `The company sign-in was refused: the identity token is not acceptable (${why}).`);
  }
  if (payload.nonce !== o.nonce) throw new AppError('invalid', 'The company sign-in was refused: the identity token does not belong to this sign-in (nonce).');
  return payload;
}

export interface SsoStart { url: string; state: string; codeVerifier: string; nonce: string; organizationId: string }

export async function beginSso({ email }: { email: string }): Promise<SsoStart> {
  const cfg = await ssoForEmail(email);
  if (!cfg) throw new AppError('invalid', `No company sign-in is set up for ${email.split('@')[1] ?? 'this address'}. Sign in with your password.`);
  const d = await discover(cfg.issuer);
  const state = generateState(), codeVerifier = generateCodeVerifier(), nonce = generateState();
  const client = new OAuth2Client(cfg.clientId, null, callbackUrl());
  const url = client.createAuthorizationURLWithPKCE(d.authorization_endpoint, state, CodeChallengeMethod.S256, codeVerifier, ['openid', 'email', 'profile']);
  url.searchParams.set('nonce', nonce);
  url.searchParams.set('login_hint', email);
  return { url: url.toString(), state, codeVerifier, nonce, organizationId: cfg.organizationId };
}

export type SsoOutcome =
  | { kind: 'signed-in'; userId: string; session: Session }
  | { kind: 'pending'; organizationName: string }
  | { kind: 'link-required'; linkToken: string; email: string };

/** The callback: checks state, exchanges the code, validates the ID token, then finds, links or creates the person. */
export async function completeSso(o: { code: string | null; state: string | null; expected: { state: string; codeVerifier: string; nonce: string; organizationId: string } | null }): Promise<SsoOutcome> {
  if (!o.expected || !o.state || o.state !== o.expected.state) throw new AppError('invalid', 'This sign-in link is not valid any more (state mismatch). Start the company sign-in again.');
  if (!o.code) throw new AppError('invalid', 'The company sign-in did not return an authorization code. Start again.');
  const [cfg] = await db.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, o.expected.organizationId));
  if (!cfg) throw new AppError('invalid', 'Company sign-in is no longer set up for this organization.');
  const d = await discover(cfg.issuer);
  const client = new OAuth2Client(cfg.clientId, openSecret(cfg.clientSecretEnc), callbackUrl());
  let tokens;
  try {
    tokens = await Promise.race([
      client.validateAuthorizationCode(d.token_endpoint, o.code, o.expected.codeVerifier),
      new Promise<never>((_, rej) => setTimeout(() => rej(new Error('timeout')), SSO_TIMEOUT_MS)),
    ]);
  } catch (e) {
    if ((e as Error).message === 'timeout') throw new AppError('unsupported', 'Your company\'s sign-in service did not answer in time. Try again later.');
    throw new AppError('invalid', 'The company sign-in could not be completed: the authorization code was refused (used already, expired or not ours). Start again.');
  }
  const claims = await verifyIdToken({ idToken: tokens.idToken(), keys: jwksFor(d.jwks_uri), issuer: cfg.issuer, audience: cfg.clientId, nonce: o.expected.nonce });
  const info = d.userinfo_endpoint ? ((await fetchJson(d.userinfo_endpoint, { headers: { authorization: `Bearer ${tokens.accessToken()}` } })) as { sub?: string; email?: string; email_verified?: boolean; name?: string }) : {};
  if (info.sub && info.sub !== claims.sub) throw new AppError('invalid', 'The company sign-in was refused: the user information does not match the identity token.');
  const email = String(info.email ?? claims.email ?? '').toLowerCase();
  if (!email || info.email_verified === false) throw new AppError('invalid', 'The company account has no verified e-mail address.');
  const domain = email.split('@')[1];
  const [owns] = await db.select().from(ssoDomains).where(and(eq(ssoDomains.domain, domain), eq(ssoDomains.organizationId, cfg.organizationId)));
  if (!owns) throw new AppError('forbidden', `${email} is not in a domain this organization signs in with.`);
  const subject = String(claims.sub);
  const [org] = await db.select().from(organizations).where(eq(organizations.id, cfg.organizationId));

  const [identity] = await db.select().from(userIdentities).where(and(eq(userIdentities.issuer, cfg.issuer), eq(userIdentities.subject, subject)));
  let userId = identity?.userId;
  if (!userId) {
    const [existing] = await db.select().from(users).where(sql`lower(${users.email}) = ${email}`);
    if (existing?.passwordHash) {
      // No silent takeover by e-mail match: link only after the person signs in with the password once.
      const { token, hash } = newToken();
      await db.insert(pendingLinks).values({ tokenHash: hash, issuer: cfg.issuer, subject, email, organizationId: cfg.organizationId, expiresAt: new Date(Date.now() + 15 * 60_000) });
      return { kind: 'link-required', linkToken: token, email };
    }
    userId = await db.transaction(async (tx) => {
      const id = existing?.id ?? generateIdFromEntropySize(10);
      if (!existing) await tx.insert(users).values({ id, email, name: String(info.name ?? claims.name ?? email), passwordHash: null });
      await tx.insert(userIdentities).values({ issuer: cfg.issuer, subject, userId: id });
      return id;
    });
  }
  const [member] = await db.select().from(memberships).where(and(eq(memberships.organizationId, cfg.organizationId), eq(memberships.userId, userId)));
  if (!member) {
    if (cfg.newMemberRole) await db.insert(memberships).values({ organizationId: cfg.organizationId, userId, role: cfg.newMemberRole }).onConflictDoNothing();
    else {
      await db.insert(membershipRequests).values({ organizationId: cfg.organizationId, userId }).onConflictDoNothing();
      return { kind: 'pending', organizationName: org.name };
    }
  }
  return { kind: 'signed-in', userId, session: await lucia.createSession(userId, {}) };
}

/** After a password sign-in: link the waiting company identity when it is this person's. */
export async function linkPendingIdentity({ userId, linkToken }: { userId: string; linkToken: string }) {
  const [p] = await db.select().from(pendingLinks).where(eq(pendingLinks.tokenHash, hashToken(linkToken)));
  if (!p || p.expiresAt.getTime() < Date.now()) return { linked: false as const };
  const [u] = await db.select().from(users).where(eq(users.id, userId));
  await db.delete(pendingLinks).where(eq(pendingLinks.tokenHash, p.tokenHash));
  if (!u || u.email.toLowerCase() !== p.email) return { linked: false as const };
  await db.insert(userIdentities).values({ issuer: p.issuer, subject: p.subject, userId }).onConflictDoNothing();
  return { linked: true as const };
}

/** Whether this person may sign in with a password (false when an organization of theirs requires company sign-in). */
export async function passwordAllowedFor(userId: string): Promise<boolean> {
  const r = await db.select({ allowed: ssoConfigs.passwordsAllowed }).from(memberships).innerJoin(ssoConfigs, eq(ssoConfigs.organizationId, memberships.organizationId)).where(eq(memberships.userId, userId));
  return r.every((x) => x.allowed);
}

export async function listMembershipRequests({ organizationId }: { organizationId: string }) {
  return db.select({ userId: users.id, name: users.name, email: users.email, since: membershipRequests.createdAt }).from(membershipRequests)
    .innerJoin(users, eq(users.id, membershipRequests.userId)).where(eq(membershipRequests.organizationId, organizationId));
}

export async function approveMembershipRequest({ organizationId, userId, role }: { organizationId: string; userId: string; role: Role }) {
  await db.transaction(async (tx) => {
    const [r] = await tx.delete(membershipRequests).where(and(eq(membershipRequests.organizationId, organizationId), eq(membershipRequests.userId, userId))).returning();
    if (!r) throw new AppError('not_found', 'No such request.');
    await tx.insert(memberships).values({ organizationId, userId, role }).onConflictDoNothing();
  });
}
