import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { SignJWT, generateKeyPair, createLocalJWKSet, exportJWK } from 'jose';
import { db, getPool } from '@/db/client';
import {
  membershipBlocks,
  memberships,
  membershipRequests,
  pendingLinks,
  ssoConfigs,
  ssoDomains,
  userIdentities,
  users,
} from '@/db/schema';
import * as auth from '@/lib/auth/service';
import * as sso from '@/lib/auth/sso';
import { lucia } from '@/lib/auth/lucia';
import { openSecret } from '@/lib/auth/secret-box';
import { hashPassword } from '@/lib/auth/password';
import { expectAppError } from '../support/errors';
import { addIdpAccount, hostileDiscovery, loginAtIdp, proveDomain } from '../support/idp';
import { linkIn, waitForMail } from '../support/mail';
import { hostname } from 'node:os';
import { parseWithZod } from '@conform-to/zod/v4';
import { lookup } from 'node:dns/promises';
import { OUTBOUND_ERROR, isForbiddenAddress, outboundJson, urlRefusal } from '@/lib/auth/outbound';

// The local identity provider the test script starts (lib/auth/dev-idp.mjs) and its demo accounts.
const ISSUER = process.env.OIDC_DEV_ISSUER ?? 'http://127.0.0.1:4020';
const CLIENT_ID = 'lagwise-local',
  CLIENT_SECRET = 'local-development-client-secret';
let orgId = '';

/** The whole browser round trip: begin with an address, log in at the provider (as `login` when given), come back with code and state. */
async function roundTrip(email: string, password: string, login = email) {
  const start = await sso.beginSso({ email });
  const back = await loginAtIdp(start.url, login, password, sso.callbackUrl());
  return { start, code: back.searchParams.get('code'), state: back.searchParams.get('state') };
}
/** A flow begun for the demo newcomer's domain, finished at the provider as someone else (the login decides the identity). */
async function roundTripAs(login: string, password: string) {
  const start = await sso.beginSso({ email: 'newcomer@korvane.example' });
  const back = await loginAtIdp(start.url, login, password, sso.callbackUrl());
  return { start, code: back.searchParams.get('code'), state: back.searchParams.get('state') };
}
const complete = async (t: Awaited<ReturnType<typeof roundTrip>>) =>
  sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
const expected = (s: sso.SsoStart) => ({
  state: s.state,
  codeVerifier: s.codeVerifier,
  nonce: s.nonce,
  organizationId: s.organizationId,
});

beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Sso Owner',
    email: `sso.owner.${randomUUID().slice(0, 6)}@example.com`,
    password: 'brine-header-valve',
    organizationName: 'Korvane test org',
  });
  orgId = owner.organizationId;
  await sso.saveSsoConfig({
    organizationId: orgId,
    issuer: ISSUER,
    clientId: CLIENT_ID,
    clientSecret: CLIENT_SECRET,
    domains: 'korvane.example',
    newMemberRole: '',
    passwordsAllowed: true,
  });
  await proveDomain(orgId, 'korvane.example');
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
    expect(shown).toMatchObject({
      issuer: ISSUER,
      clientId: CLIENT_ID,
      hasSecret: true,
      domains: ['korvane.example'],
      domainStatus: [{ domain: 'korvane.example', verified: true, verifiedVia: 'admin@korvane.example' }],
    });
  });

  it('a second organization cannot claim a domain another has proven', async () => {
    const other = await auth.signUp({
      name: 'Other',
      email: `sso.other.${randomUUID().slice(0, 6)}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Claimant',
    });
    await expectAppError(
      sso.saveSsoConfig({
        organizationId: other.organizationId,
        issuer: ISSUER,
        clientId: 'x',
        clientSecret: 'y',
        domains: 'korvane.example',
        newMemberRole: '',
        passwordsAllowed: true,
      }),
      'conflict',
      /already belongs to another organization/,
    );
    expect(
      await db.select().from(ssoConfigs).where(eq(ssoConfigs.organizationId, other.organizationId)),
    ).toHaveLength(0);
  });

  it('first sign-in creates a member waiting for approval; once approved the same flow gives a session with that role', async () => {
    const t = await roundTrip('newcomer@korvane.example', 'korvane-sso-newcomer');
    const out = await sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
    expect(out).toEqual({ kind: 'pending', organizationName: 'Korvane test org' });
    const [u] = await db.select().from(users).where(eq(users.email, 'newcomer@korvane.example'));
    expect(u.passwordHash).toBeNull();
    expect(
      await db
        .select()
        .from(membershipRequests)
        .where(and(eq(membershipRequests.organizationId, orgId), eq(membershipRequests.userId, u.id))),
    ).toHaveLength(1);
    await sso.approveMembershipRequest({ organizationId: orgId, userId: u.id, role: 'reviewer' });
    const t2 = await roundTrip('newcomer@korvane.example', 'korvane-sso-newcomer');
    const out2 = await sso.completeSso({ code: t2.code, state: t2.state, expected: expected(t2.start) });
    expect(out2.kind).toBe('signed-in');
    if (out2.kind !== 'signed-in') return;
    expect((await lucia.validateSession(out2.session.id)).user?.email).toBe('newcomer@korvane.example');
    const [m] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, orgId), eq(memberships.userId, u.id)));
    expect(m.role).toBe('reviewer');
    // Removing the member ends the session at once, whatever the provider says.
    await auth.removeMember({ organizationId: orgId, userId: u.id });
    expect((await lucia.validateSession(out2.session.id)).session).toBeNull();
  });

  it('an existing password account is linked only after one password sign-in in the browser holding the linking cookie', async () => {
    await db.insert(users).values({
      id: `pw-${randomUUID().slice(0, 8)}`,
      email: 'approved@korvane.example',
      name: 'Arun Pillai',
      passwordHash: await hashPassword('approved-password-1'),
    });
    const [u] = await db.select().from(users).where(eq(users.email, 'approved@korvane.example'));
    await db.insert(memberships).values({ organizationId: orgId, userId: u.id, role: 'engineer' });
    const t = await roundTrip('approved@korvane.example', 'korvane-sso-approved');
    const out = await sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
    expect(out).toMatchObject({
      kind: 'link-required',
      email: 'approved@korvane.example',
      hasPassword: true,
    });
    expect(await db.select().from(userIdentities).where(eq(userIdentities.userId, u.id))).toHaveLength(0);
    if (out.kind !== 'link-required') return;
    // The linking cookie is only good for the account it was made for.
    const other = await auth.signUp({
      name: 'Someone Else',
      email: `else.${randomUUID().slice(0, 6)}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Else Org',
    });
    expect(await sso.linkPendingIdentity({ userId: other.userId, linkToken: out.linkToken })).toEqual({
      linked: false,
    });
    expect(
      await db.select().from(userIdentities).where(eq(userIdentities.userId, other.userId)),
    ).toHaveLength(0);
    const signed = await auth.signIn({
      email: 'approved@korvane.example',
      password: 'approved-password-1',
      ip: '10.9.0.1',
    });
    expect(await sso.linkPendingIdentity({ userId: signed.userId, linkToken: out.linkToken })).toEqual({
      linked: true,
    });
    const t2 = await roundTrip('approved@korvane.example', 'korvane-sso-approved');
    const out2 = await sso.completeSso({ code: t2.code, state: t2.state, expected: expected(t2.start) });
    expect(out2.kind).toBe('signed-in');
    // The link token is single-use.
    expect(await sso.linkPendingIdentity({ userId: signed.userId, linkToken: out.linkToken })).toEqual({
      linked: false,
    });
  });

  it('refuses a wrong state, a replayed code, a domain not allowed, and a provider that is down — creating nothing', async () => {
    const t = await roundTrip('newcomer@korvane.example', 'korvane-sso-newcomer');
    await expectAppError(
      sso.completeSso({ code: t.code, state: 'forged', expected: expected(t.start) }),
      'invalid',
      /state mismatch/,
    );
    await expectAppError(
      sso.completeSso({ code: t.code, state: t.state, expected: null }),
      'invalid',
      /state mismatch/,
    );
    await sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) });
    await expectAppError(
      sso.completeSso({ code: t.code, state: t.state, expected: expected(t.start) }),
      'invalid',
      /authorization code was refused/,
    );

    // An account of another domain at the same provider.
    const s = await sso.beginSso({ email: 'newcomer@korvane.example' });
    const back = await loginAtIdp(
      s.url,
      'outsider@elsewhere.example',
      'elsewhere-sso-outsider',
      sso.callbackUrl(),
    );
    await expectAppError(
      sso.completeSso({
        code: back.searchParams.get('code'),
        state: back.searchParams.get('state'),
        expected: expected(s),
      }),
      'forbidden',
      /outsider@elsewhere.example is not in a domain/,
    );
    expect(await db.select().from(users).where(eq(users.email, 'outsider@elsewhere.example'))).toHaveLength(
      0,
    );

    // A provider that is down: the same one generic message as every other outbound failure.
    const down = await auth.signUp({
      name: 'Down',
      email: `sso.down.${randomUUID().slice(0, 6)}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Down Org',
    });
    await sso.saveSsoConfig({
      organizationId: down.organizationId,
      issuer: `${ISSUER}/hostile/down`,
      clientId: 'x',
      clientSecret: 'y',
      domains: 'down.example',
      newMemberRole: '',
      passwordsAllowed: true,
    });
    await proveDomain(down.organizationId, 'down.example');
    await expect(sso.beginSso({ email: 'someone@down.example' })).rejects.toThrow(sso.OUTBOUND_ERROR);
    await expectAppError(
      sso.beginSso({ email: 'someone@nowhere.example' }),
      'invalid',
      /No company sign-in is set up for nowhere.example/,
    );
    await db.delete(ssoDomains).where(eq(ssoDomains.organizationId, down.organizationId));
  });

  it('passwords can be switched off for an organization', async () => {
    const o = await auth.signUp({
      name: 'Strict',
      email: `strict.${randomUUID().slice(0, 6)}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Strict Org',
    });
    await sso.saveSsoConfig({
      organizationId: o.organizationId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      clientSecret: CLIENT_SECRET,
      domains: 'strict.example',
      newMemberRole: 'engineer',
      passwordsAllowed: false,
    });
    expect((await sso.getSsoConfig(o.organizationId))?.newMemberRole).toBe('engineer');
    const [u] = await db.select().from(users).where(eq(users.id, o.userId));
    await expectAppError(
      auth.signIn({ email: u.email, password: 'brine-header-valve', ip: '10.9.0.2' }),
      'forbidden',
      /signs in with the company account/,
    );
    await db.delete(ssoDomains).where(eq(ssoDomains.organizationId, o.organizationId));
  });
});

describe('ID-token validation (tokens signed here with a local key)', () => {
  it('accepts a good token and refuses tampered, expired, wrong-audience, wrong-issuer and wrong-nonce tokens', async () => {
    const { privateKey, publicKey } = await generateKeyPair('RS256');
    const keys = createLocalJWKSet({ keys: [{ ...(await exportJWK(publicKey)), alg: 'RS256', kid: 'k1' }] });
    const sign = (
      claims: Record<string, unknown>,
      o: { exp?: string | number; aud?: string; iss?: string } = {},
    ) =>
      new SignJWT({ nonce: 'n1', email: 'a@korvane.example', ...claims })
        .setProtectedHeader({ alg: 'RS256', kid: 'k1' })
        .setSubject('a')
        .setIssuer(o.iss ?? ISSUER)
        .setAudience(o.aud ?? CLIENT_ID)
        .setIssuedAt()
        .setExpirationTime(o.exp ?? '5m')
        .sign(privateKey);
    const check = (idToken: string, nonce = 'n1') =>
      sso.verifyIdToken({ idToken, keys, issuer: ISSUER, audience: CLIENT_ID, nonce });
    expect((await check(await sign({}))).sub).toBe('a');
    const good = await sign({});
    const tampered = good.slice(0, -4) + (good.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    await expectAppError(check(tampered), 'invalid', /signature is not valid/);
    await expectAppError(
      check(await sign({}, { exp: Math.floor(Date.now() / 1000) - 3600 })),
      'invalid',
      /has expired/,
    );
    await expectAppError(check(await sign({}, { aud: 'someone-else' })), 'invalid', /aud does not match/);
    await expectAppError(
      check(await sign({}, { iss: 'http://evil.example' })),
      'invalid',
      /iss does not match/,
    );
    await expectAppError(check(await sign({}), 'other-nonce'), 'invalid', /nonce/);
  });
});

const uniq = () => randomUUID().slice(0, 8);
const identitiesOf = async (userId: string) =>
  db.select().from(userIdentities).where(eq(userIdentities.userId, userId));

describe('identities are bound to (issuer, subject)', () => {
  it('a second subject with the same e-mail never reaches an account made by company sign-in, and cannot link it from another browser', async () => {
    // The victim: an account without a password, created by company sign-in and bound to its subject.
    const victimEmail = `victim.${uniq()}@korvane.example`;
    await addIdpAccount({
      login: victimEmail,
      password: 'victim-sso-pass',
      sub: `victim-${uniq()}`,
      email: victimEmail,
    });
    await sso.saveSsoConfig({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: 'engineer',
      passwordsAllowed: true,
    });
    const first = await complete(await roundTrip(victimEmail, 'victim-sso-pass'));
    expect(first.kind).toBe('signed-in');
    const [victim] = await db.select().from(users).where(eq(users.email, victimEmail));
    expect(victim.passwordHash).toBeNull();
    expect(await identitiesOf(victim.id)).toHaveLength(1);

    // The attacker: another subject at the same provider claiming the same address.
    const attackerLogin = `attacker.${uniq()}@idp.local`;
    await addIdpAccount({
      login: attackerLogin,
      password: 'attacker-sso-pass',
      sub: `attacker-${uniq()}`,
      email: victimEmail,
    });
    const out = await complete(await roundTrip(victimEmail, 'attacker-sso-pass', attackerLogin));
    expect(out).toMatchObject({ kind: 'link-required', email: victimEmail, hasPassword: false });
    expect(await identitiesOf(victim.id)).toHaveLength(1);
    if (out.kind !== 'link-required') return;

    // The link is mailed to the account's own address; opened outside the attacker's browser it does nothing,
    // and the attacker's browser does not have the mailed secret.
    const asked = new Date(Date.now() - 1000);
    expect(await sso.sendLinkMail({ linkToken: out.linkToken })).toEqual({ sentTo: victimEmail });
    const mailToken = linkIn(
      (await waitForMail(victimEmail, { subject: /Link your company account/, after: asked })).text,
      '/link-company',
    );
    await expectAppError(
      sso.linkWithMail({ linkToken: undefined, mailToken }),
      'forbidden',
      /Open this link in the browser where you started/,
    );
    await expectAppError(
      sso.linkWithMail({ linkToken: 'a-cookie-of-another-browser-000000', mailToken }),
      'forbidden',
      /Open this link in the browser where you started/,
    );
    await expectAppError(
      sso.linkWithMail({ linkToken: out.linkToken, mailToken: 'guessed-mail-token-0000000000' }),
      'invalid',
      /not valid/,
    );
    expect(await identitiesOf(victim.id)).toHaveLength(1);

    // The victim's own subject still signs in as the victim; no session ever went to the attacker's subject.
    const again = await complete(await roundTrip(victimEmail, 'victim-sso-pass'));
    expect(again.kind === 'signed-in' && again.userId).toBe(victim.id);
    await sso.saveSsoConfig({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: '',
      passwordsAllowed: true,
    });
  });

  it('the mailed link, opened in the browser that asked, links a second identity of the same person once', async () => {
    const email = `twice.${uniq()}@korvane.example`;
    const uid = `pw-${uniq()}`;
    await db.insert(users).values({ id: uid, email, name: 'Tess Twice', passwordHash: null });
    await db.insert(memberships).values({ organizationId: orgId, userId: uid, role: 'reviewer' });
    await addIdpAccount({ login: email, password: 'twice-sso-pass', sub: `twice-${uniq()}`, email });
    const out = await complete(await roundTrip(email, 'twice-sso-pass'));
    expect(out).toMatchObject({ kind: 'link-required', hasPassword: false });
    if (out.kind !== 'link-required') return;
    const asked = new Date(Date.now() - 1000);
    await sso.sendLinkMail({ linkToken: out.linkToken });
    const mailToken = linkIn(
      (await waitForMail(email, { subject: /Link your company account/, after: asked })).text,
      '/link-company',
    );
    expect(await sso.linkWithMail({ linkToken: out.linkToken, mailToken })).toEqual({ linked: true, email });
    await expectAppError(
      sso.linkWithMail({ linkToken: out.linkToken, mailToken }),
      'invalid',
      /used, has expired/,
    );
    expect(await db.select().from(pendingLinks).where(eq(pendingLinks.email, email))).toHaveLength(0);
    const signed = await complete(await roundTrip(email, 'twice-sso-pass'));
    expect(signed.kind === 'signed-in' && signed.userId).toBe(uid);
  });

  it('an identity of another issuer (a domain that changed hands) does not reach the account, and its user is not redirected to the claimer', async () => {
    // Organization A signed this person in through its own provider; its domain is now proven by our test organization.
    const orgA = await auth.signUp({
      name: 'A Owner',
      email: `a.owner.${uniq()}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Org A',
    });
    const email = `moved.${uniq()}@korvane.example`;
    const uid = `a-${uniq()}`;
    await db.insert(users).values({ id: uid, email, name: 'Moe Moved', passwordHash: null });
    await db
      .insert(memberships)
      .values({ organizationId: orgA.organizationId, userId: uid, role: 'engineer' });
    await db
      .insert(userIdentities)
      .values({ issuer: 'https://login.org-a.example', subject: 'moe', userId: uid });
    // The claimer's provider is not offered to an account that belongs to other organizations only.
    expect(await sso.ssoForEmail(email)).toBeNull();
    await expectAppError(sso.beginSso({ email }), 'invalid', /No company sign-in is set up/);
    // Even when the claimer's flow is started with another address, its identity for this e-mail must be linked first.
    const bLogin = `b-side.${uniq()}@idp.local`;
    await addIdpAccount({ login: bLogin, password: 'b-side-pass', sub: `b-${uniq()}`, email });
    const t = await roundTripAs(bLogin, 'b-side-pass');
    const out = await complete(t);
    expect(out).toMatchObject({ kind: 'link-required', hasPassword: false });
    expect((await identitiesOf(uid)).map((i) => i.issuer)).toEqual(['https://login.org-a.example']);
    expect(
      await db
        .select()
        .from(memberships)
        .where(and(eq(memberships.organizationId, orgId), eq(memberships.userId, uid))),
    ).toHaveLength(0);
  });
});

describe('domain claims take effect only once proven', () => {
  it('refuses public mail providers outright, naming the field', async () => {
    const o = await auth.signUp({
      name: 'P',
      email: `p.${uniq()}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Public Claimer',
    });
    for (const domains of ['gmail.com', 'korvane.example, outlook.com', 'mail.yahoo.com']) {
      try {
        await sso.saveSsoConfig({
          organizationId: o.organizationId,
          issuer: ISSUER,
          clientId: 'x',
          clientSecret: 'y',
          domains,
          newMemberRole: '',
          passwordsAllowed: true,
        });
        throw new Error('saved');
      } catch (e) {
        expect((e as { code?: string }).code).toBe('invalid');
        expect((e as { fields?: Record<string, string[]> }).fields?.domains?.[0]).toMatch(
          /^Allowed e-mail domains: public mail providers/,
        );
      }
    }
    expect(
      await db.select().from(ssoDomains).where(eq(ssoDomains.organizationId, o.organizationId)),
    ).toHaveLength(0);
  });

  it('an unproven claim sends nobody anywhere and admits nobody; the mailed proof makes it count, once, for one organization', async () => {
    const domain = `claim-${uniq()}.example`;
    const a = await auth.signUp({
      name: 'A',
      email: `a.${uniq()}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Claimer A',
    });
    const b = await auth.signUp({
      name: 'B',
      email: `b.${uniq()}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Claimer B',
    });
    for (const o of [a, b])
      await sso.saveSsoConfig({
        organizationId: o.organizationId,
        issuer: ISSUER,
        clientId: CLIENT_ID,
        clientSecret: CLIENT_SECRET,
        domains: domain,
        newMemberRole: 'engineer',
        passwordsAllowed: true,
      });
    expect(await sso.ssoForEmail(`someone@${domain}`)).toBeNull();
    await expectAppError(
      sso.beginSso({ email: `someone@${domain}` }),
      'invalid',
      new RegExp(`No company sign-in is set up for ${domain}`),
    );

    // An identity of the unproven domain arriving through a proven flow is refused.
    const login = `unproven.${uniq()}@${domain}`;
    await addIdpAccount({ login, password: 'unproven-pass', sub: `u-${uniq()}`, email: login });
    await expectAppError(
      complete(await roundTrip('newcomer@korvane.example', 'unproven-pass', login)),
      'forbidden',
      /is not in a domain this organization signs in with/,
    );
    expect(await db.select().from(users).where(eq(users.email, login))).toHaveLength(0);

    // B asks too; A's proof arrives first and wins; B's link is then refused.
    const asked = new Date(Date.now() - 1000);
    await sso.requestDomainProof({
      organizationId: b.organizationId,
      domain,
      mailbox: 'hostmaster',
      actorId: b.userId,
    });
    const bToken = linkIn(
      (await waitForMail(`hostmaster@${domain}`, { after: asked })).text,
      '/verify-domain',
    );
    expect(await proveDomain(a.organizationId, domain)).toEqual({ domain, organizationId: a.organizationId });
    await expectAppError(
      sso.confirmDomainProof(bToken),
      'conflict',
      /already proven by another organization/,
    );
    const rows = await db.select().from(ssoDomains).where(eq(ssoDomains.domain, domain));
    expect(rows.filter((r) => r.verifiedAt).map((r) => r.organizationId)).toEqual([a.organizationId]);
    expect((await sso.ssoForEmail(`someone@${domain}`))?.organizationId).toBe(a.organizationId);
    // B may no longer even save it.
    await expectAppError(
      sso.saveSsoConfig({
        organizationId: b.organizationId,
        issuer: ISSUER,
        clientId: CLIENT_ID,
        domains: domain,
        newMemberRole: '',
        passwordsAllowed: true,
      }),
      'conflict',
      /already belongs to another organization/,
    );
    // B's link still opens (it is B's newest), but confirming it was refused above; a newer link of B ends it.
    await expect(sso.getDomainProof(bToken)).resolves.toEqual({
      status: 'open',
      domain,
      organizationName: 'Claimer B',
      sentTo: `hostmaster@${domain}`,
    });
    await sso.requestDomainProof({
      organizationId: b.organizationId,
      domain,
      mailbox: 'postmaster',
      actorId: b.userId,
    });
    await expect(sso.getDomainProof(bToken)).resolves.toEqual({ status: 'unusable' });
    await db.delete(ssoDomains).where(eq(ssoDomains.domain, domain));
  });

  it('an existing account of another organization is never sent to the claimer', async () => {
    const other = await auth.signUp({
      name: 'Kept',
      email: `kept.${uniq()}@korvane.example`,
      password: 'brine-header-valve',
      organizationName: 'Elsewhere Ltd',
    });
    const [u] = await db.select().from(users).where(eq(users.id, other.userId));
    expect(await sso.ssoForEmail(u.email)).toBeNull();
    await expectAppError(
      sso.beginSso({ email: u.email }),
      'invalid',
      /No company sign-in is set up for korvane.example/,
    );
  });
});

describe('verified e-mail required', () => {
  it('refuses email_verified false and a missing claim from a provider outside the domain', async () => {
    for (const flag of [false, null]) {
      const email = `unverified.${uniq()}@korvane.example`;
      await addIdpAccount({
        login: email,
        password: 'unverified-pass',
        sub: `uv-${uniq()}`,
        email,
        email_verified: flag,
      });
      await expectAppError(
        complete(await roundTrip(email, 'unverified-pass')),
        'invalid',
        /no verified e-mail address/,
      );
      expect(await db.select().from(users).where(eq(users.email, email))).toHaveLength(0);
    }
  });

  it('the documented rule: a silent provider is vouched for only by a proven domain with the issuer inside it', () => {
    const base = { domain: 'korvane.example', domainProven: true };
    expect(sso.emailVouched({ ...base, issuer: 'https://login.korvane.example', flags: [undefined] })).toBe(
      true,
    );
    expect(sso.emailVouched({ ...base, issuer: 'https://korvane.example/oidc', flags: [undefined] })).toBe(
      true,
    );
    expect(sso.emailVouched({ ...base, issuer: 'https://login.korvane.example', flags: [false] })).toBe(
      false,
    );
    expect(
      sso.emailVouched({ ...base, issuer: 'https://login.korvane.example', flags: [true, 'false'] }),
    ).toBe(false);
    expect(sso.emailVouched({ ...base, issuer: 'https://idp.example.net', flags: [undefined] })).toBe(false);
    expect(sso.emailVouched({ ...base, issuer: 'https://notkorvane.example', flags: [undefined] })).toBe(
      false,
    );
    expect(
      sso.emailVouched({
        ...base,
        domainProven: false,
        issuer: 'https://login.korvane.example',
        flags: [undefined],
      }),
    ).toBe(false);
    expect(
      sso.emailVouched({ ...base, domainProven: false, issuer: 'https://idp.example.net', flags: ['true'] }),
    ).toBe(true);
  });
});

describe('removals and refusals stick', () => {
  it('a removed member stays out though newcomers get a role automatically, until an owner invites them again', async () => {
    await sso.saveSsoConfig({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: 'engineer',
      passwordsAllowed: true,
    });
    const email = `removed.${uniq()}@korvane.example`;
    await addIdpAccount({ login: email, password: 'removed-pass', sub: `rm-${uniq()}`, email });
    const first = await complete(await roundTrip(email, 'removed-pass'));
    expect(first.kind).toBe('signed-in');
    if (first.kind !== 'signed-in') return;
    await auth.removeMember({ organizationId: orgId, userId: first.userId });
    expect(await complete(await roundTrip(email, 'removed-pass'))).toEqual({
      kind: 'blocked',
      organizationName: 'Korvane test org',
    });
    expect(
      await db
        .select()
        .from(memberships)
        .where(and(eq(memberships.organizationId, orgId), eq(memberships.userId, first.userId))),
    ).toHaveLength(0);
    expect(
      await db.select().from(membershipRequests).where(eq(membershipRequests.userId, first.userId)),
    ).toHaveLength(0);
    // Re-admitted by an invitation.
    const [owner] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, orgId), eq(memberships.role, 'owner')));
    const asked = new Date(Date.now() - 1000);
    await auth.inviteMember({ actorId: owner.userId, organizationId: orgId, email, role: 'reviewer' });
    await auth.acceptInvitation({
      token: linkIn((await waitForMail(email, { after: asked })).text, '/invite'),
      userId: first.userId,
    });
    expect(
      await db.select().from(membershipBlocks).where(eq(membershipBlocks.userId, first.userId)),
    ).toHaveLength(0);
    const back = await complete(await roundTrip(email, 'removed-pass'));
    expect(back.kind).toBe('signed-in');
    const [m] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, orgId), eq(memberships.userId, first.userId)));
    expect(m.role).toBe('reviewer');
    await sso.saveSsoConfig({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: '',
      passwordsAllowed: true,
    });
  });

  it('a refused request is not filed again by signing in again', async () => {
    const email = `refused.${uniq()}@korvane.example`;
    await addIdpAccount({ login: email, password: 'refused-pass', sub: `rf-${uniq()}`, email });
    expect((await complete(await roundTrip(email, 'refused-pass'))).kind).toBe('pending');
    const [u] = await db.select().from(users).where(eq(users.email, email));
    await sso.refuseMembershipRequest({ organizationId: orgId, userId: u.id });
    expect(await complete(await roundTrip(email, 'refused-pass'))).toEqual({
      kind: 'blocked',
      organizationName: 'Korvane test org',
    });
    expect(
      await db.select().from(membershipRequests).where(eq(membershipRequests.userId, u.id)),
    ).toHaveLength(0);
    expect(await db.select().from(memberships).where(eq(memberships.userId, u.id))).toHaveLength(0);
  });

  it('the settings switch back to "None until an owner approves" (the empty option)', async () => {
    await sso.saveSsoConfig({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: 'contractor',
      passwordsAllowed: true,
    });
    expect((await sso.getSsoConfig(orgId))?.newMemberRole).toBe('contractor');
    // conform hands an empty select over as undefined; both forms mean "none".
    expect(
      sso.ssoConfigSchema.parse({
        organizationId: orgId,
        issuer: ISSUER,
        clientId: CLIENT_ID,
        domains: 'korvane.example',
        newMemberRole: undefined,
      }).newMemberRole,
    ).toBeNull();
    await sso.saveSsoConfig({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: '',
      passwordsAllowed: true,
    });
    expect((await sso.getSsoConfig(orgId))?.newMemberRole).toBeNull();
    // Exactly as the settings form sends it, through conform's parser.
    const fd = new FormData();
    for (const [k, v] of Object.entries({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      clientSecret: '',
      domains: 'korvane.example',
      newMemberRole: '',
    }))
      fd.set(k, v);
    const viaForm = parseWithZod(fd, { schema: sso.ssoConfigSchema });
    expect(viaForm.status).toBe('success');
    expect(viaForm.status === 'success' && viaForm.value.newMemberRole).toBeNull();
    const bad = sso.ssoConfigSchema.safeParse({
      organizationId: orgId,
      issuer: ISSUER,
      clientId: CLIENT_ID,
      domains: 'korvane.example',
      newMemberRole: 'janitor',
    });
    expect(bad.success ? '' : bad.error.issues[0].message).toMatch(/^Role for people who arrive this way:/);
  });
});

describe('outbound requests to the issuer cannot be aimed at internal addresses', () => {
  it('classifies addresses: loopback, private, link-local, CGNAT, unique-local, mapped and unspecified are forbidden', () => {
    for (const a of [
      '127.0.0.1',
      '127.8.9.10',
      '10.1.2.3',
      '172.16.0.1',
      '172.31.255.255',
      '192.168.1.1',
      '169.254.169.254',
      '100.64.0.1',
      '0.0.0.0',
      '::1',
      '::',
      'fe80::1',
      'fd00::1',
      'fc12::1',
      '::ffff:127.0.0.1',
      '::ffff:7f00:1',
      '::ffff:a9fe:a9fe',
      '224.0.0.1',
      'not-an-ip',
    ]) {
      expect([a, isForbiddenAddress(a)]).toEqual([a, true]);
    }
    for (const a of ['93.184.216.34', '8.8.8.8', '172.32.0.1', '2606:4700:4700::1111'])
      expect([a, isForbiddenAddress(a)]).toEqual([a, false]);
  });

  it('refuses http, private and local issuers when saved, naming the field', async () => {
    for (const issuer of [
      'http://login.example.com',
      'https://10.0.0.5',
      'https://169.254.169.254/latest',
      'https://[::1]:8443',
      'https://localhost:8443',
      'ftp://login.example.com',
      'https://user:pw@login.example.com',
      `${ISSUER.replace('127.0.0.1', 'localhost')}`,
    ]) {
      try {
        await sso.saveSsoConfig({
          organizationId: orgId,
          issuer,
          clientId: CLIENT_ID,
          domains: 'korvane.example',
          newMemberRole: '',
          passwordsAllowed: true,
        });
        throw new Error(`saved ${issuer}`);
      } catch (e) {
        expect([issuer, (e as { fields?: Record<string, string[]> }).fields?.issuer?.[0]]).toEqual([
          issuer,
          expect.stringMatching(/^Issuer URL:/),
        ]);
      }
    }
    expect(urlRefusal('https://login.example.com')).toBeNull();
    expect(urlRefusal(ISSUER)).toBeNull(); // the configured local provider, outside production only
    expect((await sso.getSsoConfig(orgId))?.issuer).toBe(ISSUER);
  });

  it('a hostile discovery document, a huge or slow answer, a redirect and a host name resolving to loopback all end in one generic message', async () => {
    const o = await auth.signUp({
      name: 'H',
      email: `h.${uniq()}@example.com`,
      password: 'brine-header-valve',
      organizationName: 'Hostile Org',
    });
    const messages = new Set<string>();
    const cases: [string, Parameters<typeof hostileDiscovery>[1]][] = [
      [
        'internal',
        {
          mode: 'json',
          document: {
            authorization_endpoint: `${ISSUER}/auth`,
            token_endpoint: `http://127.0.0.1:${process.env.LAGWISE_PG_PORT ?? 54329}/`,
            jwks_uri: 'http://169.254.169.254/latest/meta-data/',
            userinfo_endpoint: 'http://10.0.0.1/',
          },
        },
      ],
      [
        'mapped',
        {
          mode: 'json',
          document: {
            authorization_endpoint: `${ISSUER}/auth`,
            token_endpoint: 'https://[::ffff:127.0.0.1]/token',
            jwks_uri: 'https://[fd00::1]/jwks',
          },
        },
      ],
      ['huge', { mode: 'huge' }],
      ['redirect', { mode: 'redirect', location: 'http://169.254.169.254/latest/meta-data/' }],
      ['slow', { mode: 'slow' }],
    ];
    for (const [name, spec] of cases) {
      const issuer = await hostileDiscovery(name, spec);
      if (spec.mode === 'json') (spec.document as Record<string, string>).issuer = issuer;
      await hostileDiscovery(name, spec);
      const domain = `${name}-${uniq()}.example`;
      await sso.saveSsoConfig({
        organizationId: o.organizationId,
        issuer,
        clientId: 'x',
        clientSecret: 'y',
        domains: domain,
        newMemberRole: '',
        passwordsAllowed: true,
      });
      await proveDomain(o.organizationId, domain);
      const started = Date.now();
      try {
        await sso.beginSso({ email: `someone@${domain}` });
        throw new Error('began');
      } catch (e) {
        expect([name, (e as { code?: string }).code]).toEqual([name, 'unsupported']);
        messages.add((e as Error).message);
      }
      expect(Date.now() - started).toBeLessThan(6_000); // the time-out (4 s) bounds even the provider that never answers
    }
    // Direct requests: a host name that resolves to a loopback or private address is refused after resolution.
    const own = hostname();
    const resolved = (await lookup(own, { all: true })).map((a) => a.address);
    expect(resolved.some(isForbiddenAddress)).toBe(true);
    for (const url of [
      `https://${own}:1/.well-known/openid-configuration`,
      'https://127.0.0.1/',
      'http://example.com/',
      'https://[::1]/',
    ]) {
      try {
        await outboundJson(url);
        throw new Error('fetched');
      } catch (e) {
        messages.add((e as Error).message);
      }
    }
    expect([...messages]).toEqual([OUTBOUND_ERROR]);
    await db.delete(ssoDomains).where(eq(ssoDomains.organizationId, o.organizationId));
  }, 40_000);
});

describe('ID tokens with several audiences (OpenID Connect Core 3.1.3.7)', () => {
  it('refuses an extra audience without azp or with another azp, accepts azp = this client', async () => {
    for (const [azp, ok] of [
      [undefined, false],
      ['some-other-client', false],
      [CLIENT_ID, true],
    ] as const) {
      const email = `aud.${uniq()}@korvane.example`;
      await addIdpAccount({
        login: email,
        password: 'aud-pass',
        sub: `aud-${uniq()}`,
        email,
        extraAudience: 'some-other-client',
        ...(azp ? { azp } : {}),
      });
      const p = complete(await roundTrip(email, 'aud-pass'));
      if (ok) expect((await p).kind).toBe('pending');
      else await expectAppError(p, 'invalid', /issued to another party: azp/);
    }
  });
});
