/**
 * Account flows, free of Next.js: callers pass the request facts (IP) and get back results.
 * Server actions wrap these; integration tests call them directly against PostgreSQL.
 */
import { and, eq, gt, isNull, ne, sql, count } from 'drizzle-orm';
import { generateIdFromEntropySize, type Session } from 'lucia';
import { db } from '@/db/client';
import {
  invitations,
  membershipBlocks,
  memberships,
  sessions,
  organizations,
  passwordResets,
  signupRequests,
  users,
  type Role,
} from '@/db/schema';
import { clearAccountThrottle, releaseSignInAttempt, reserveSignInAttempt } from './throttle';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { composeMail, enqueueMail, sendMail } from '@/lib/mail';
import { lucia } from './lucia';
import { hashPassword, passwordWeakness, verifyPassword } from './password';
import { hashToken, newToken } from './tokens';
import { ROLE_LABEL } from './permissions';
import { passwordAllowedFor } from './sso';

export { THROTTLE } from './throttle';
export const RESET_TTL_MINUTES = 60;
export const INVITE_TTL_DAYS = 7;

export const normalizeEmail = (e: string) => e.trim().toLowerCase();

async function findUserByEmail(email: string) {
  const [u] = await db
    .select()
    .from(users)
    .where(sql`lower(${users.email}) = ${normalizeEmail(email)}`)
    .limit(1);
  return u ?? null;
}

function weakPassword(password: string, email: string) {
  const reason = passwordWeakness(password, email);
  if (reason) throw new AppError('invalid', reason, { password: [reason] });
}

export async function signUp(input: {
  name: string;
  email: string;
  password: string;
  organizationName: string;
}): Promise<{ userId: string; organizationId: string; session: Session }> {
  const email = normalizeEmail(input.email);
  weakPassword(input.password, email);
  if (await findUserByEmail(email)) {
    throw new AppError(
      'conflict',
      'An account with this e-mail already exists. Sign in, or reset the password.',
      { email: ['An account with this e-mail already exists.'] },
    );
  }
  const passwordHash = await hashPassword(input.password);
  const userId = generateIdFromEntropySize(10);
  const organizationId = await db
    .transaction(async (tx) => {
      await tx.insert(users).values({ id: userId, email, name: input.name.trim(), passwordHash });
      const [org] = await tx
        .insert(organizations)
        .values({ name: input.organizationName.trim() })
        .returning();
      await tx.insert(memberships).values({ organizationId: org.id, userId, role: 'owner' });
      return org.id;
    })
    .catch((e) => {
      if (String(e?.cause?.code ?? e?.code) === '23505')
        throw new AppError('conflict', 'An account with this e-mail already exists.', {
          email: ['An account with this e-mail already exists.'],
        });
      throw e;
    });
  const session = await lucia.createSession(userId, {});
  return { userId, organizationId, session };
}

export const GENERIC_SIGN_IN_ERROR = 'E-mail or password is not right.';

/**
 * Same message whether the e-mail exists or not. Throttled per account, per account at an
 * address and per address (lib/auth/throttle.ts); the attempt is counted before the password
 * is checked. `ip` is the client address as lib/server/client-address.ts trusts it.
 */
export async function signIn(input: {
  email: string;
  password: string;
  ip: string;
}): Promise<{ userId: string; session: Session }> {
  const email = normalizeEmail(input.email);
  const keys = await reserveSignInAttempt(email, input.ip);
  const user = await findUserByEmail(email);
  // Verify against a dummy hash when the user is missing so timing does not reveal the account.
  const ok = user?.passwordHash
    ? await verifyPassword(user.passwordHash, input.password)
    : await verifyDummy(input.password);
  if (!user || !ok) throw new AppError('invalid', GENERIC_SIGN_IN_ERROR);
  await releaseSignInAttempt(keys);
  if (!(await passwordAllowedFor(user.id)))
    throw new AppError(
      'forbidden',
      'Your organization signs in with the company account. Use "Sign in with your company account".',
    );
  const session = await lucia.createSession(user.id, {});
  return { userId: user.id, session };
}
const DUMMY_HASH =
  '$argon2id$v=19$m=19456,t=2,p=1$DN8ZQWr0qgAEHEnXRnl6Hg$gAPp3//QS6kOcgBtUOMsCxwIqnFf2ON/Vp0xnsRHuq0';

/** Spends the time of a real password check and fails: the answer must not reveal a missing account. */
async function verifyDummy(password: string): Promise<false> {
  await verifyPassword(DUMMY_HASH, password);
  return false;
}

export async function signOut(sessionId: string) {
  await lucia.invalidateSession(sessionId);
}

/**
 * Always answers the same; both ways look the account up, make a token, run one short transaction
 * and enqueue at most one message without waiting for SMTP, so timing does not tell the cases apart.
 * A new link replaces every earlier one of the account (one live reset link).
 */
export async function requestPasswordReset(input: { email: string }): Promise<void> {
  const user = await findUserByEmail(input.email);
  const { token, hash } = newToken();
  await db.transaction(async (tx) => {
    // Without this, only the known-address commit waits for its WAL flush — on a busy disk a tell of
    // tens of milliseconds. A reset row lost in a crash just means asking again.
    await tx.execute(sql`set local synchronous_commit to off`);
    if (!user) {
      await tx.select({ n: count() }).from(passwordResets).where(eq(passwordResets.tokenHash, hash));
      return;
    }
    await tx
      .delete(passwordResets)
      .where(and(eq(passwordResets.userId, user.id), isNull(passwordResets.usedAt)));
    await tx.insert(passwordResets).values({
      tokenHash: hash,
      userId: user.id,
      expiresAt: new Date(Date.now() + RESET_TTL_MINUTES * 60_000),
    });
  });
  if (!user) return;
  enqueueMail(
    composeMail({
      to: user.email,
      subject: 'Reset your Lagwise password',
      lines: [
        `Hello ${user.name},`,
        `Someone asked to reset the password of your Lagwise account. The link works once and expires in ${RESET_TTL_MINUTES} minutes; any earlier reset link no longer works.`,
      ],
      link: { label: 'Choose a new password', url: `${env.appUrl()}/reset-password/${token}` },
      footer: 'If you did not ask for this, ignore this message; your password stays as it is.',
    }),
  );
}

export async function resetPassword(input: { token: string; password: string }): Promise<{ userId: string }> {
  const tokenHash = hashToken(input.token);
  return db
    .transaction(async (tx) => {
      const [row] = await tx
        .select()
        .from(passwordResets)
        .where(eq(passwordResets.tokenHash, tokenHash))
        .for('update');
      if (!row || row.usedAt)
        throw new AppError(
          'invalid',
          'This reset link has already been used or is not valid. Ask for a new one.',
        );
      if (row.expiresAt.getTime() < Date.now())
        throw new AppError('invalid', 'This reset link has expired. Ask for a new one.');
      const [user] = await tx.select().from(users).where(eq(users.id, row.userId));
      weakPassword(input.password, user.email);
      await tx
        .update(users)
        .set({ passwordHash: await hashPassword(input.password) })
        .where(eq(users.id, user.id));
      // Every reset link of the account ends with this one.
      await tx
        .update(passwordResets)
        .set({ usedAt: new Date() })
        .where(and(eq(passwordResets.userId, user.id), isNull(passwordResets.usedAt)));
      await clearAccountThrottle(normalizeEmail(user.email), tx);
      return { userId: user.id };
    })
    .then(async (r) => {
      await lucia.invalidateUserSessions(r.userId);
      return r;
    });
}

export async function inviteMember(input: {
  actorId: string;
  organizationId: string;
  email: string;
  role: Role;
}): Promise<{ invitationId: string }> {
  const email = normalizeEmail(input.email);
  const [org] = await db.select().from(organizations).where(eq(organizations.id, input.organizationId));
  if (!org) throw new AppError('not_found');
  const existing = await findUserByEmail(email);
  if (existing) {
    const [m] = await db
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, org.id), eq(memberships.userId, existing.id)));
    if (m)
      throw new AppError('conflict', 'This person is already a member.', {
        email: ['Already a member of this organization.'],
      });
  }
  const [actor] = await db.select().from(users).where(eq(users.id, input.actorId));
  const { token, hash } = newToken();
  const [inv] = await db
    .insert(invitations)
    .values({
      organizationId: org.id,
      email,
      role: input.role,
      tokenHash: hash,
      invitedBy: input.actorId,
      expiresAt: new Date(Date.now() + INVITE_TTL_DAYS * 86_400_000),
    })
    .returning();
  await sendMail(
    composeMail({
      to: email,
      subject: `${actor?.name ?? 'A colleague'} invited you to ${org.name} on Lagwise`,
      lines: [
        `${actor?.name ?? 'A colleague'} invited you to join ${org.name} on Lagwise as ${ROLE_LABEL[input.role]}.`,
        `The link works once and expires in ${INVITE_TTL_DAYS} days.`,
      ],
      link: { label: 'Accept the invitation', url: `${env.appUrl()}/invite/${token}` },
    }),
  );
  return { invitationId: inv.id };
}

export async function getInvitation(token: string) {
  const [row] = await db
    .select({ inv: invitations, orgName: organizations.name })
    .from(invitations)
    .innerJoin(organizations, eq(organizations.id, invitations.organizationId))
    .where(eq(invitations.tokenHash, hashToken(token)));
  if (!row || row.inv.acceptedAt || row.inv.revokedAt) return { status: 'used' as const };
  if (row.inv.expiresAt.getTime() < Date.now()) return { status: 'expired' as const };
  // Whether the address has an account is not part of the answer (the page offers both ways).
  return { status: 'open' as const, email: row.inv.email, role: row.inv.role, organizationName: row.orgName };
}

/**
 * Accept an invitation. A signed-in user whose e-mail matches joins directly; a new person
 * creates an account (name + password) in the same transaction.
 */
export async function acceptInvitation(input: {
  token: string;
  userId?: string;
  name?: string;
  password?: string;
}): Promise<{ userId: string; organizationId: string; session?: Session }> {
  const tokenHash = hashToken(input.token);
  let createdUser = false;
  const result = await db.transaction(async (tx) => {
    const [inv] = await tx
      .select()
      .from(invitations)
      .where(eq(invitations.tokenHash, tokenHash))
      .for('update');
    if (!inv || inv.acceptedAt || inv.revokedAt)
      throw new AppError('invalid', 'This invitation has already been used or is not valid.');
    if (inv.expiresAt.getTime() < Date.now())
      throw new AppError('invalid', 'This invitation has expired. Ask the owner for a new one.');
    let userId = input.userId;
    if (userId) {
      const [u] = await tx.select().from(users).where(eq(users.id, userId));
      if (!u || normalizeEmail(u.email) !== inv.email)
        throw new AppError('forbidden', `This invitation is for ${inv.email}. Sign in with that address.`);
    } else {
      const [existing] = await tx.select().from(users).where(sql`lower(${users.email}) = ${inv.email}`);
      if (existing)
        throw new AppError(
          'invalid',
          'An account with this e-mail exists. Sign in first, then open the link again.',
        );
      if (!input.name?.trim())
        throw new AppError('invalid', 'Enter your name.', { name: ['Enter your name.'] });
      weakPassword(input.password ?? '', inv.email);
      userId = generateIdFromEntropySize(10);
      await tx.insert(users).values({
        id: userId,
        email: inv.email,
        name: input.name.trim(),
        passwordHash: await hashPassword(input.password!),
      });
      createdUser = true;
    }
    await tx
      .insert(memberships)
      .values({ organizationId: inv.organizationId, userId, role: inv.role })
      .onConflictDoNothing();
    // An invitation is an owner re-admitting the person: an earlier removal or refusal is lifted.
    await tx
      .delete(membershipBlocks)
      .where(
        and(eq(membershipBlocks.organizationId, inv.organizationId), eq(membershipBlocks.userId, userId)),
      );
    await tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, inv.id));
    return { userId, organizationId: inv.organizationId };
  });
  const session = createdUser ? await lucia.createSession(result.userId, {}) : undefined;
  return { ...result, session };
}

async function ownerCount(organizationId: string) {
  const [r] = await db
    .select({ n: count() })
    .from(memberships)
    .where(and(eq(memberships.organizationId, organizationId), eq(memberships.role, 'owner')));
  return r.n;
}

export async function changeMemberRole(input: { organizationId: string; userId: string; role: Role }) {
  await db.transaction(async (tx) => {
    const [m] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, input.organizationId), eq(memberships.userId, input.userId)))
      .for('update');
    if (!m) throw new AppError('not_found', 'No such member.');
    if (m.role === 'owner' && input.role !== 'owner' && (await ownerCount(input.organizationId)) <= 1) {
      throw new AppError(
        'conflict',
        'An organization needs at least one owner. Make someone else owner first.',
      );
    }
    await tx
      .update(memberships)
      .set({ role: input.role })
      .where(and(eq(memberships.organizationId, input.organizationId), eq(memberships.userId, input.userId)));
  });
}

/**
 * Removing a member also ends every session the person has, at once, and sticks: company sign-in
 * does not bring the person back until an owner invites them again.
 */
export async function removeMember(input: { organizationId: string; userId: string }) {
  await db.transaction(async (tx) => {
    const [m] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.organizationId, input.organizationId), eq(memberships.userId, input.userId)))
      .for('update');
    if (!m) throw new AppError('not_found', 'No such member.');
    if (m.role === 'owner' && (await ownerCount(input.organizationId)) <= 1)
      throw new AppError('conflict', 'The last owner cannot be removed.');
    await tx
      .delete(memberships)
      .where(and(eq(memberships.organizationId, input.organizationId), eq(memberships.userId, input.userId)));
    await tx
      .insert(membershipBlocks)
      .values({ organizationId: input.organizationId, userId: input.userId, reason: 'removed' })
      .onConflictDoUpdate({
        target: [membershipBlocks.organizationId, membershipBlocks.userId],
        set: { reason: 'removed', createdAt: new Date() },
      });
  });
  await lucia.invalidateUserSessions(input.userId);
}

export async function pendingInvitations(organizationId: string) {
  return db
    .select()
    .from(invitations)
    .where(
      and(
        eq(invitations.organizationId, organizationId),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, sql`now()`),
      ),
    );
}

/**
 * Password change for a signed-in user: the current password is required, every session of the
 * account ends (this browser gets a fresh one back), and the address gets a notice.
 */
export async function changePassword(input: {
  userId: string;
  currentPassword: string;
  newPassword: string;
}): Promise<{ session: Session }> {
  const [user] = await db.select().from(users).where(eq(users.id, input.userId));
  if (!user) throw new AppError('unauthenticated', 'Your session has ended. Sign in again.');
  const ok = user.passwordHash
    ? await verifyPassword(user.passwordHash, input.currentPassword)
    : await verifyDummy(input.currentPassword);
  if (!ok)
    throw new AppError('invalid', 'Current password: this is not your current password.', {
      currentPassword: ['This is not your current password.'],
    });
  const reason = passwordWeakness(input.newPassword, user.email);
  if (reason) throw new AppError('invalid', `New password: ${reason}`, { newPassword: [reason] });
  if (input.newPassword === input.currentPassword)
    throw new AppError('invalid', 'New password: choose a password different from the current one.', {
      newPassword: ['Choose a password different from the current one.'],
    });
  await db.transaction(async (tx) => {
    await tx
      .update(users)
      .set({ passwordHash: await hashPassword(input.newPassword) })
      .where(eq(users.id, user.id));
    await tx
      .update(passwordResets)
      .set({ usedAt: new Date() })
      .where(and(eq(passwordResets.userId, user.id), isNull(passwordResets.usedAt)));
  });
  await lucia.invalidateUserSessions(user.id);
  const session = await lucia.createSession(user.id, {});
  enqueueMail(
    composeMail({
      to: user.email,
      subject: 'Your Lagwise password was changed',
      lines: [
        `Hello ${user.name},`,
        `The password of your Lagwise account was changed on ${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC, and every other session of the account was signed out.`,
        "If this was not you, reset your password now and tell your organization's owner.",
      ],
      link: { label: 'Reset the password', url: `${env.appUrl()}/forgot-password` },
    }),
  );
  return { session };
}

/** Ends every session of the account except the one given (the browser asking). */
export async function signOutOtherSessions(input: {
  userId: string;
  keepSessionId: string;
}): Promise<{ ended: number }> {
  const ended = await db
    .delete(sessions)
    .where(and(eq(sessions.userId, input.userId), ne(sessions.id, input.keepSessionId)))
    .returning({ id: sessions.id });
  return { ended: ended.length };
}

export const SIGNUP_TTL_HOURS = 24;

/** What sign-up answers, whether or not the address has an account. */
export const SIGNUP_SENT = (email: string) =>
  `Check your e-mail: we sent a message to ${email} to finish creating your account. The link works once and expires in ${SIGNUP_TTL_HOURS} hours.`;

/**
 * Sign-up that does not reveal whether an address has an account: both ways hash the password, make
 * a token and enqueue one message (a confirmation link for a new address, a "you already have an
 * account" notice for a known one); the account is created only from the confirmation link.
 */
export async function requestSignUp(input: {
  name: string;
  email: string;
  password: string;
  organizationName: string;
}): Promise<{ message: string }> {
  const email = normalizeEmail(input.email);
  weakPassword(input.password, email);
  const passwordHash = await hashPassword(input.password);
  const { token, hash } = newToken();
  const existing = await db.transaction(async (tx) => {
    // As in requestPasswordReset: the commit waits for no WAL flush either way, so the write of the
    // new-address case takes no longer than the read of the known one.
    await tx.execute(sql`set local synchronous_commit to off`);
    const [known] = await tx.select().from(users).where(sql`lower(${users.email}) = ${email}`).limit(1);
    if (!known)
      await tx.insert(signupRequests).values({
        tokenHash: hash,
        email,
        name: input.name.trim(),
        organizationName: input.organizationName.trim(),
        passwordHash,
        expiresAt: new Date(Date.now() + SIGNUP_TTL_HOURS * 3_600_000),
      });
    return known ?? null;
  });
  if (existing) {
    enqueueMail(
      composeMail({
        to: existing.email,
        subject: 'You already have a Lagwise account',
        lines: [
          `Hello ${existing.name},`,
          'Someone tried to create a Lagwise account with this address, which already has one. Nothing was changed.',
        ],
        link: { label: 'Sign in or reset your password', url: `${env.appUrl()}/forgot-password` },
        footer: 'If it was not you, ignore this message.',
      }),
    );
  } else {
    enqueueMail(
      composeMail({
        to: email,
        subject: 'Finish creating your Lagwise account',
        lines: [
          `Hello ${input.name.trim()},`,
          `Open the link to create your account and the organization ${input.organizationName.trim()}. It works once and expires in ${SIGNUP_TTL_HOURS} hours.`,
        ],
        link: { label: 'Create my account', url: `${env.appUrl()}/sign-up/confirm/${token}` },
        footer: 'If you did not ask for this, ignore this message; no account is created.',
      }),
    );
  }
  return { message: SIGNUP_SENT(email) };
}

export async function getSignUpRequest(token: string) {
  const [r] = await db
    .select()
    .from(signupRequests)
    .where(eq(signupRequests.tokenHash, hashToken(token)));
  if (!r || r.expiresAt.getTime() < Date.now()) return null;
  return { email: r.email, name: r.name, organizationName: r.organizationName };
}

/** The confirmation link, used: creates the user, the organization and the owner membership in one transaction. */
export async function confirmSignUp(input: {
  token: string;
}): Promise<{ userId: string; organizationId: string; session: Session }> {
  const userId = generateIdFromEntropySize(10);
  const organizationId = await db.transaction(async (tx) => {
    const [r] = await tx
      .delete(signupRequests)
      .where(eq(signupRequests.tokenHash, hashToken(input.token)))
      .returning();
    if (!r || r.expiresAt.getTime() < Date.now())
      throw new AppError('invalid', 'This link has been used, has expired or is not valid. Sign up again.');
    await tx.delete(signupRequests).where(eq(signupRequests.email, r.email));
    const [taken] = await tx.select().from(users).where(sql`lower(${users.email}) = ${r.email}`);
    if (taken)
      throw new AppError('conflict', 'This address has an account already. Sign in, or reset the password.');
    await tx.insert(users).values({ id: userId, email: r.email, name: r.name, passwordHash: r.passwordHash });
    const [org] = await tx.insert(organizations).values({ name: r.organizationName }).returning();
    await tx.insert(memberships).values({ organizationId: org.id, userId, role: 'owner' });
    return org.id;
  });
  return { userId, organizationId, session: await lucia.createSession(userId, {}) };
}
