import { afterAll, describe, expect, it } from 'vitest';
import { eq, like, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '@/db/client';
import { memberships, sessions, signInThrottle } from '@/db/schema';
import { UNKNOWN_ADDRESS } from '@/lib/server/client-address';
import * as auth from '@/lib/auth/service';
import { lucia } from '@/lib/auth/lucia';
import { isAppError } from '@/lib/errors';
import { expectAppError } from '../support/errors';
import { linkIn, waitForMail } from '../support/mail';

const uniq = () => randomUUID().slice(0, 8);
const PASSWORD = 'tarnished-copper-valve';

afterAll(async () => {
  await getPool().end();
});

describe('sign-up, sign-in, sign-out (real PostgreSQL)', () => {
  it('creates a user, an organization and an owner membership in one go', async () => {
    const email = `Founder.${uniq()}@Example.com`;
    const r = await auth.signUp({
      name: 'Ada Founder',
      email,
      password: PASSWORD,
      organizationName: 'Fenwick Dairy',
    });
    const [m] = await db.select().from(memberships).where(eq(memberships.userId, r.userId));
    expect(m.role).toBe('owner');
    expect(m.organizationId).toBe(r.organizationId);
    const v = await lucia.validateSession(r.session.id);
    expect(v.user?.email).toBe(email.toLowerCase());
  });

  it('refuses a duplicate e-mail, whatever its case, and creates nothing', async () => {
    const email = `dup.${uniq()}@example.com`;
    await auth.signUp({ name: 'A', email, password: PASSWORD, organizationName: 'First Org' });
    const [{ before }] = await db
      .execute<{ before: number }>(sql`select count(*)::int as before from organizations`)
      .then((r) => r.rows);
    await expectAppError(
      auth.signUp({
        name: 'B',
        email: email.toUpperCase(),
        password: PASSWORD,
        organizationName: 'Second Org',
      }),
      'conflict',
      /already exists/,
    );
    const [{ after }] = await db
      .execute<{ after: number }>(sql`select count(*)::int as after from organizations`)
      .then((r) => r.rows);
    expect(after).toBe(before);
  });

  it('refuses weak passwords with a field message', async () => {
    try {
      await auth.signUp({
        name: 'W',
        email: `weak.${uniq()}@example.com`,
        password: 'password1234',
        organizationName: 'Weak Org',
      });
      throw new Error('accepted');
    } catch (e) {
      expect(isAppError(e) && e.fields?.password?.[0]).toMatch(/breached/);
    }
  });

  it('signs in with the right password and gives one generic message otherwise', async () => {
    const email = `signin.${uniq()}@example.com`;
    await auth.signUp({ name: 'S', email, password: PASSWORD, organizationName: 'S Org' });
    const ok = await auth.signIn({ email, password: PASSWORD, ip: '10.1.1.1' });
    expect((await lucia.validateSession(ok.session.id)).session?.id).toBe(ok.session.id);
    await expectAppError(
      auth.signIn({ email, password: 'wrong-password-xx', ip: '10.1.1.2' }),
      'invalid',
      new RegExp(auth.GENERIC_SIGN_IN_ERROR),
    );
    await expectAppError(
      auth.signIn({ email: `nobody.${uniq()}@example.com`, password: PASSWORD, ip: '10.1.1.3' }),
      'invalid',
      new RegExp(auth.GENERIC_SIGN_IN_ERROR),
    );
  });

  it('sign-out ends the session', async () => {
    const email = `signout.${uniq()}@example.com`;
    const { session } = await auth.signUp({
      name: 'O',
      email,
      password: PASSWORD,
      organizationName: 'O Org',
    });
    await auth.signOut(session.id);
    expect((await lucia.validateSession(session.id)).session).toBeNull();
    expect(await db.select().from(sessions).where(eq(sessions.id, session.id))).toHaveLength(0);
  });

  it('throttles an account after 5 failures (unknown address), even with the right password, and leaves other accounts alone', async () => {
    const email = `throttle.${uniq()}@example.com`;
    const bystander = `bystander.${uniq()}@example.com`;
    await auth.signUp({ name: 'T', email, password: PASSWORD, organizationName: 'T Org' });
    await auth.signUp({ name: 'B', email: bystander, password: PASSWORD, organizationName: 'B Org' });
    for (let i = 0; i < auth.THROTTLE.accountAtAddress; i++) {
      await expectAppError(
        auth.signIn({ email, password: 'not-the-password', ip: UNKNOWN_ADDRESS }),
        'invalid',
      );
    }
    await expectAppError(
      auth.signIn({ email, password: PASSWORD, ip: UNKNOWN_ADDRESS }),
      'throttled',
      /Wait 30 seconds/,
    );
    // Another account signs in at the same time from the same (unknown) address.
    expect(
      (await auth.signIn({ email: bystander, password: PASSWORD, ip: UNKNOWN_ADDRESS })).userId,
    ).toBeTruthy();
    // When the delay has run out, one more failure doubles it (exponential, not one fixed lock).
    await db
      .update(signInThrottle)
      .set({ blockedUntil: sql`now() - interval '1 second'` })
      .where(like(signInThrottle.key, `%${email}%`));
    await expectAppError(auth.signIn({ email, password: 'still-not-it', ip: UNKNOWN_ADDRESS }), 'invalid');
    const [row] = await db
      .select({ s: sql<number>`extract(epoch from (${signInThrottle.blockedUntil} - now()))::float8` })
      .from(signInThrottle)
      .where(eq(signInThrottle.key, `account-address:${email}|${UNKNOWN_ADDRESS}`));
    expect(row.s).toBeGreaterThan(55);
    expect(row.s).toBeLessThanOrEqual(60);
    // After the delay the right password works and clears the account's counters.
    await db
      .update(signInThrottle)
      .set({ blockedUntil: sql`now() - interval '1 second'` })
      .where(like(signInThrottle.key, `%${email}%`));
    expect((await auth.signIn({ email, password: PASSWORD, ip: UNKNOWN_ADDRESS })).userId).toBeTruthy();
    expect(
      await db
        .select()
        .from(signInThrottle)
        .where(like(signInThrottle.key, `%${email}%`)),
    ).toHaveLength(0);
  });

  it('rotating addresses does not get round the account limit', async () => {
    const email = `rotate.${uniq()}@example.com`;
    await auth.signUp({ name: 'R', email, password: PASSWORD, organizationName: 'R2 Org' });
    for (let i = 0; i < auth.THROTTLE.account; i++) {
      await expectAppError(
        auth.signIn({ email, password: 'not-the-password', ip: `10.9.${i}.1` }),
        'invalid',
      );
    }
    await expectAppError(auth.signIn({ email, password: PASSWORD, ip: '10.9.200.1' }), 'throttled');
  });

  it('20 parallel wrong tries get exactly 5 password checks', async () => {
    const email = `parallel.${uniq()}@example.com`;
    await auth.signUp({ name: 'P', email, password: PASSWORD, organizationName: 'P Org' });
    const results = await Promise.allSettled(
      Array.from({ length: 20 }, () =>
        auth.signIn({ email, password: 'not-the-password', ip: UNKNOWN_ADDRESS }),
      ),
    );
    const codes = results.map((r) =>
      r.status === 'rejected' && isAppError(r.reason) ? r.reason.code : 'other',
    );
    expect(codes.filter((c) => c === 'invalid')).toHaveLength(auth.THROTTLE.accountAtAddress);
    expect(codes.filter((c) => c === 'throttled')).toHaveLength(20 - auth.THROTTLE.accountAtAddress);
  });

  it('throttles one address spraying many accounts, not the same accounts from elsewhere', async () => {
    const ip = `10.3.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;
    for (let i = 0; i < auth.THROTTLE.address; i++) {
      await expectAppError(
        auth.signIn({ email: `spray${i}.${uniq()}@example.com`, password: 'whatever-pass', ip }),
        'invalid',
      );
    }
    const email = `sprayed.${uniq()}@example.com`;
    await auth.signUp({ name: 'V', email, password: PASSWORD, organizationName: 'V Org' });
    await expectAppError(auth.signIn({ email, password: PASSWORD, ip }), 'throttled');
    expect((await auth.signIn({ email, password: PASSWORD, ip: '10.250.0.1' })).userId).toBeTruthy();
  });
});

describe('password reset through the SMTP sink', () => {
  it('e-mails a single-use link that changes the password and ends old sessions', async () => {
    const email = `reset.${uniq()}@example.com`;
    const { session } = await auth.signUp({
      name: 'Rhea Reset',
      email,
      password: PASSWORD,
      organizationName: 'R Org',
    });
    const asked = new Date(Date.now() - 1000);
    await auth.requestPasswordReset({ email });
    const mail = await waitForMail(email, { subject: /Reset your Lagwise password/, after: asked });
    expect(mail.html).toContain('/reset-password/');
    const token = linkIn(mail.text, '/reset-password');
    await auth.resetPassword({ token, password: 'fresh-basalt-lagging' });
    expect((await lucia.validateSession(session.id)).session).toBeNull();
    await expectAppError(auth.signIn({ email, password: PASSWORD, ip: '10.4.0.1' }), 'invalid');
    expect(
      (await auth.signIn({ email, password: 'fresh-basalt-lagging', ip: '10.4.0.1' })).userId,
    ).toBeTruthy();
    await expectAppError(
      auth.resetPassword({ token, password: 'another-basalt-lagging' }),
      'invalid',
      /already been used/,
    );
  });

  it('refuses an expired link', async () => {
    const email = `expired.${uniq()}@example.com`;
    await auth.signUp({ name: 'E', email, password: PASSWORD, organizationName: 'E Org' });
    const asked = new Date(Date.now() - 1000);
    await auth.requestPasswordReset({ email });
    const token = linkIn((await waitForMail(email, { after: asked })).text, '/reset-password');
    await db.execute(
      sql`update password_resets set expires_at = now() - interval '1 minute' where used_at is null`,
    );
    await expectAppError(
      auth.resetPassword({ token, password: 'fresh-basalt-lagging' }),
      'invalid',
      /expired/,
    );
  });

  it('sends nothing for an unknown address and says nothing about it', async () => {
    await expect(
      auth.requestPasswordReset({ email: `ghost.${uniq()}@example.com` }),
    ).resolves.toBeUndefined();
  });
});

describe('invitations', () => {
  it('a new person accepts with the given role; the link is single-use', async () => {
    const owner = await auth.signUp({
      name: 'Owen Owner',
      email: `owner.${uniq()}@example.com`,
      password: PASSWORD,
      organizationName: 'Invite Org',
    });
    const invitee = `reviewer.${uniq()}@example.com`;
    const asked = new Date(Date.now() - 1000);
    await auth.inviteMember({
      actorId: owner.userId,
      organizationId: owner.organizationId,
      email: invitee,
      role: 'reviewer',
    });
    const mail = await waitForMail(invitee, { subject: /invited you to Invite Org/, after: asked });
    expect(mail.text).toContain('Safety reviewer');
    const token = linkIn(mail.text, '/invite');
    const info = await auth.getInvitation(token);
    expect(info).toMatchObject({
      status: 'open',
      email: invitee,
      role: 'reviewer',
      organizationName: 'Invite Org',
    });
    expect(info).not.toHaveProperty('hasAccount');
    const r = await auth.acceptInvitation({ token, name: 'Rita Reviewer', password: PASSWORD });
    const [m] = await db.select().from(memberships).where(eq(memberships.userId, r.userId));
    expect(m).toMatchObject({ organizationId: owner.organizationId, role: 'reviewer' });
    expect(r.session).toBeDefined();
    await expectAppError(
      auth.acceptInvitation({ token, name: 'Again', password: PASSWORD }),
      'invalid',
      /already been used/,
    );
    expect((await auth.getInvitation(token)).status).toBe('used');
  });

  it('an existing user joins a second organization; the wrong user is refused', async () => {
    const owner = await auth.signUp({
      name: 'O2',
      email: `owner2.${uniq()}@example.com`,
      password: PASSWORD,
      organizationName: 'Second Invite Org',
    });
    const existingEmail = `eng.${uniq()}@example.com`;
    const existing = await auth.signUp({
      name: 'Eve Engineer',
      email: existingEmail,
      password: PASSWORD,
      organizationName: 'Eve Own Org',
    });
    const stranger = await auth.signUp({
      name: 'Stan',
      email: `stan.${uniq()}@example.com`,
      password: PASSWORD,
      organizationName: 'Stan Org',
    });
    const asked = new Date(Date.now() - 1000);
    await auth.inviteMember({
      actorId: owner.userId,
      organizationId: owner.organizationId,
      email: existingEmail,
      role: 'engineer',
    });
    const token = linkIn((await waitForMail(existingEmail, { after: asked })).text, '/invite');
    await expectAppError(
      auth.acceptInvitation({ token, userId: stranger.userId }),
      'forbidden',
      /This invitation is for/,
    );
    await auth.acceptInvitation({ token, userId: existing.userId });
    const roles = await db.select().from(memberships).where(eq(memberships.userId, existing.userId));
    expect(roles.map((r) => r.role).sort()).toEqual(['engineer', 'owner']);
  });

  it('refuses an expired invitation and inviting an existing member', async () => {
    const owner = await auth.signUp({
      name: 'O3',
      email: `owner3.${uniq()}@example.com`,
      password: PASSWORD,
      organizationName: 'Third Invite Org',
    });
    const invitee = `late.${uniq()}@example.com`;
    const asked = new Date(Date.now() - 1000);
    await auth.inviteMember({
      actorId: owner.userId,
      organizationId: owner.organizationId,
      email: invitee,
      role: 'contractor',
    });
    const token = linkIn((await waitForMail(invitee, { after: asked })).text, '/invite');
    await db.execute(
      sql`update invitations set expires_at = now() - interval '1 hour' where email = ${invitee}`,
    );
    expect((await auth.getInvitation(token)).status).toBe('expired');
    await expectAppError(
      auth.acceptInvitation({ token, name: 'Late', password: PASSWORD }),
      'invalid',
      /expired/,
    );
    const ownerEmail = (await lucia.validateSession(owner.session.id)).user!.email;
    await expectAppError(
      auth.inviteMember({
        actorId: owner.userId,
        organizationId: owner.organizationId,
        email: ownerEmail,
        role: 'engineer',
      }),
      'conflict',
    );
  });
});

describe('members', () => {
  it('keeps at least one owner, changes roles and ends sessions on removal', async () => {
    const owner = await auth.signUp({
      name: 'Solo',
      email: `solo.${uniq()}@example.com`,
      password: PASSWORD,
      organizationName: 'Solo Org',
    });
    await expectAppError(
      auth.changeMemberRole({ organizationId: owner.organizationId, userId: owner.userId, role: 'engineer' }),
      'conflict',
      /at least one owner/,
    );
    const invitee = `member.${uniq()}@example.com`;
    const asked = new Date(Date.now() - 1000);
    await auth.inviteMember({
      actorId: owner.userId,
      organizationId: owner.organizationId,
      email: invitee,
      role: 'engineer',
    });
    const token = linkIn((await waitForMail(invitee, { after: asked })).text, '/invite');
    const m = await auth.acceptInvitation({ token, name: 'Member', password: PASSWORD });
    await auth.changeMemberRole({
      organizationId: owner.organizationId,
      userId: m.userId,
      role: 'contractor',
    });
    const [row] = await db.select().from(memberships).where(eq(memberships.userId, m.userId));
    expect(row.role).toBe('contractor');
    await auth.removeMember({ organizationId: owner.organizationId, userId: m.userId });
    expect((await lucia.validateSession(m.session!.id)).session).toBeNull();
    expect(await db.select().from(memberships).where(eq(memberships.userId, m.userId))).toHaveLength(0);
  });
});
