import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { SignJWT, generateKeyPair, createLocalJWKSet, exportJWK } from 'jose';
import { db, getPool } from '@/db/client';
import { memberships, membershipRequests, ssoConfigs, ssoDomains, userIdentities, users } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import * as sso from '@/lib/auth/sso';
import { lucia } from '@/lib/auth/lucia';
import { openSecret } from '@/lib/auth/secret-box';
import { hashPassword } from '@/lib/auth/password';
import { expectAppError } from '../support/errors';
import { loginAtIdp } from '../support/idp';

// The local identity provider the test script starts (lib/auth/dev-idp.mjs) and its demo accounts.
const ISSUER = process.env.OIDC_DEV_ISSUER ?? 'http://127.0.0.1:4020';
const CLIENT_ID = 'lagwise-local', CLIENT_SECRET = 'local-development-client-secret';
let orgId = '';


/** The whole browser round trip: begin, log in at the provider, come back with code and state. */
async function roundTrip(email: string, password: string) {
  const start = await sso.beginSso({ email });
  const back = await loginAtIdp(start.url, email, password, sso.callbackUrl());
  return { start, code: back.searchParams.get('code'), state: back.searchParams.get('state') };
}
const expected = (s: sso.SsoStart) => ({ state: s.state, codeVerifier: s.codeVerifier, nonce: s.nonce, organizationId: s.organizationId });

beforeAll(async () => {
  const owner = await auth.signUp({ name: 'Sso Owner', email: `sso.owner.${randomUUID().slice(0, 6)}@example.com`, password: 'brine-header-valve', organizationName: 'Korvane test org' });
  orgId = owner.organizationId;
  await sso.saveSsoConfig({ organizationId: orgId, issuer: ISSUER, clientId: CLIENT_ID, clientSecret: CLIENT_SECRET, domains: 'korvane.example', newMemberRole: '', passwordsAllowed: true });
});
afterAll(async () => {
  // Free the domain for the demo seed that runs after these tests.
  await db.delete(ssoDomains).where(eq(ssoDomains.organizationId, orgId));
  await db.delete(ssoConfigs).where(eq(ssoConfigs.organizationId, orgId));
  await getPool().end();
});

describe('company sign-in against the local identity provider', () => {
  it('stores the client secret encrypted and never returns it', async () => {
    const [row] = await db.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, orgId));
    expect(row.clientSecretEnc).not.toContain(CLIENT_SECRET);
    expect(openSecret(row.clientSecretEnc)).toBe(CLIENT_SECRET);
    const shown = await sso.getSsoConfig(orgId);
    expect(JSON.stringify(shown)).not.toContain(CLIENT_SECRET);
    expect(shown).toMatchObject({ issuer: ISSUER, clientId: CLIENT_ID, hasSecret: true, domains: ['korvane.example'] });
  });

  it('a second organization cannot claim the same domain', async () => {
    const other = await auth.signUp({ name: 'Other', email: `sso.other.${randomUUID().slice(0, 6)}@example.com`, password: 'brine-header-valve', organizationName: 'Claimant' });
    await expectAppError(sso.saveSsoConfig({ organizationId: other.organizationId, issuer: ISSUER, clientId: 'x', clientSecret: 'y', domains: 'korvane.example', newMemberRole: '', passwordsAllowed: true }), 'conflict', /already belongs to another organization/);
    expect(await db.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, other.organizationId))).toHaveLength(0);
  });

  it('first sign-in creates a member waiting for approval; once approved the same flow gives a session with that role', async () => {
    const t = await roundTrip('newcomer@korvane.example', 'korvane-sso-newcomer');
    const out = await sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
    expect(out).toEqual({ kind: 'pending', organizationName: 'Korvane test org' });
    const [u] = await db.select().from(users).where(eq(users.email, 'newcomer@korvane.example'));
    expect(u.passwordHash).toBeNull();
    expect(await db.select().from(membershipRequests).where(and(eq(membershipRequests.organizationId, orgId), eq(membershipRequests.userId, u.id)))).toHaveLength(1);
    await sso.approveMembershipRequest({ organizationId: orgId, userId: u.id, role: 'reviewer' });
    const t2 = await roundTrip('newcomer@korvane.example', 'korvane-sso-newcomer');
    const out2 = await sso.completeSso({ code: t2.code, state: t2.state, expected: expected(t2.start) });
    expect(out2.kind).toBe('signed-in');
    if (out2.kind !== 'signed-in') return;
    expect((await lucia.validateSession(out2.session.id)).user?.email).toBe('newcomer@korvane.example');
    const [m] = await db.select().from(memberships).where(and(eq(memberships.organizationId, orgId), eq(memberships.userId, u.id)));
    expect(m.role).toBe('reviewer');
    // Removing the member ends the session at once, whatever the provider says.
    await auth.removeMember({ organizationId: orgId, userId: u.id });
    expect((await lucia.validateSession(out2.session.id)).session).toBeNull();
  });

  it('an existing password account is linked only after one password sign-in', async () => {
    await db.insert(users).values({ id: `pw-${randomUUID().slice(0, 8)}`, email: 'approved@korvane.example', name: 'Arun Pillai', passwordHash: await hashPassword('approved-password-1') });
    const [u] = await db.select().from(users).where(eq(users.email, 'approved@korvane.example'));
    await db.insert(memberships).values({ organizationId: orgId, userId: u.id, role: 'engineer' });
    const t = await roundTrip('approved@korvane.example', 'korvane-sso-approved');
    const out = await sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
    expect(out.kind).toBe('link-required');
    expect(await db.select().from(userIdentities).where(eq(userIdentities.userId, u.id))).toHaveLength(0);
    if (out.kind !== 'link-required') return;
    const signed = await auth.signIn({ email: 'approved@korvane.example', password: 'approved-password-1', ip: '10.9.0.1' });
    expect(await sso.linkPendingIdentity({ userId: signed.userId, linkToken: out.linkToken })).toEqual({ linked: true });
    const t2 = await roundTrip('approved@korvane.example', 'korvane-sso-approved');
    const out2 = await sso.completeSso({ code: t2.code, state: t2.state, expected: expected(t2.start) });
    expect(out2.kind).toBe('signed-in');
    // The link token is single-use.
    expect(await sso.linkPendingIdentity({ userId: signed.userId, linkToken: out.linkToken })).toEqual({ linked: false });
  });

  it('refuses a wrong state, a replayed code, a domain not allowed, and a provider that is down — creating nothing', async () => {
    const t = await roundTrip('newcomer@korvane.example', 'korvane-sso-newcomer');
    await expectAppError(sso.completeSso({ code: t.code, state: 'forged', expected: expected(t.start) }), 'invalid', /state mismatch/);
    await expectAppError(sso.completeSso({ code: t.code, state: t.state, expected: null }), 'invalid', /state mismatch/);
    await sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
    await expectAppError(sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) }), 'invalid', /authorization code was refused/);

    // An account of another domain at the same provider.
    const s = await sso.beginSso({ email: 'newcomer@korvane.example' });
    const back = await loginAtIdp(s.url, 'outsider@elsewhere.example', 'elsewhere-sso-outsider', sso.callbackUrl());
    await expectAppError(sso.completeSso({ code: back.searchParams.get('code'), state: back.searchParams.get('state'), expected: expected(s) }), 'forbidden', /outsider@elsewhere.example is not in a domain/);
    expect(await db.select().from(users).where(eq(users.email, 'outsider@elsewhere.example'))).toHaveLength(0);

    const down = await auth.signUp({ name: 'Down', email: `sso.down.${randomUUID().slice(0, 6)}@example.com`, password: 'brine-header-valve', organizationName: 'Down Org' });
    await sso.saveSsoConfig({ organizationId: down.organizationId, issuer: 'http://127.0.0.1:9', clientId: 'x', clientSecret: 'y', domains: 'down.example', newMemberRole: '', passwordsAllowed: true });
    await expectAppError(sso.beginSso({ email: 'someone@down.example' }), 'unsupported', /cannot be reached|did not answer in time/);
    await expectAppError(sso.beginSso({ email: 'someone@nowhere.example' }), 'invalid', /No company sign-in is set up for nowhere.example/);
    await db.delete(ssoDomains).where(eq(ssoDomains.organizationId, down.organizationId));
  });

  it('passwords can be switched off for an organization', async () => {
    const o = await auth.signUp({ name: 'Strict', email: `strict.${randomUUID().slice(0, 6)}@example.com`, password: 'brine-header-valve', organizationName: 'Strict Org' });
    await sso.saveSsoConfig({ organizationId: o.organizationId, issuer: ISSUER, clientId: CLIENT_ID, clientSecret: CLIENT_SECRET, domains: 'strict.example', newMemberRole: 'engineer', passwordsAllowed: false });
    const [u] = await db.select().from(users).where(eq(users.id, o.userId));
    await expectAppError(auth.signIn({ email: u.email, password: 'brine-header-valve', ip: '10.9.0.2' }), 'forbidden', /signs in with the company account/);
    await db.delete(ssoDomains).where(eq(ssoDomains.organizationId, o.organizationId));
  });
});

describe('ID-token validation (tokens signed here with a local key)', () => {
  it('accepts a good token and refuses tampered, expired, wrong-audience, wrong-issuer and wrong-nonce tokens', async () => {
    const { privateKey, publicKey } = await generateKeyPair('RS256');
    const keys = createLocalJWKSet({ keys: [{ ...(await exportJWK(publicKey)), alg: 'RS256', kid: 'k1' }] });
    const sign = (claims: Record<string, unknown>, o: { exp?: string | number; aud?: string; iss?: string } = {}) =>
      new SignJWT({ nonce: 'n1', email: 'a@korvane.example', ...claims }).setProtectedHeader({ alg: 'RS256', kid: 'k1' }).setSubject('a').setIssuer(o.iss ?? ISSUER).setAudience(o.aud ?? CLIENT_ID).setIssuedAt().setExpirationTime(o.exp ?? '5m').sign(privateKey);
    const check = (idToken: string, nonce = 'n1') => sso.verifyIdToken({ idToken, keys, issuer: ISSUER, audience: CLIENT_ID, nonce });
    expect((await check(await sign({}))).sub).toBe('a');
    const good = await sign({});
    const tampered = good.slice(0, -4) + (good.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    await expectAppError(check(tampered), 'invalid', /signature is not valid/);
    await expectAppError(check(await sign({}, { exp: Math.floor(Date.now() / 1000) - 3600 })), 'invalid', /has expired/);
    await expectAppError(check(await sign({}, { aud: 'someone-else' })), 'invalid', /aud does not match/);
    await expectAppError(check(await sign({}, { iss: 'http://evil.example' })), 'invalid', /iss does not match/);
    await expectAppError(check(await sign({}), 'other-nonce'), 'invalid', /nonce/);
  });
});
