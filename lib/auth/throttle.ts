/**
 * Sign-in throttling by account, by account at an address, and by address.
 *
 * - Each attempt is counted *before* the password is checked, under row locks, so parallel tries
 *   cannot get more password checks than the limit (a success takes its count back).
 * - Past a key's free failures it is refused for an exponentially growing delay
 *   (30 s, 1 min, 2 min … up to 15 min) rather than one long lock, and only that key is refused:
 *   one account under attack never locks anyone else out.
 * - The address comes from lib/server/client-address.ts: believed only behind proxies declared
 *   with TRUST_PROXY. Without one the address is unknown, and an account is throttled as a whole.
 * - A key is forgotten after 15 quiet minutes (no failure and no delay running).
 */
import { inArray, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { signInThrottle } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { UNKNOWN_ADDRESS } from '@/lib/server/client-address';

export const THROTTLE = {
  /** Failures of one account from one address before delays start. */
  accountAtAddress: 5,
  /** Failures of one account from all addresses before delays start. */
  account: 10,
  /** Failures from one address across accounts (password spraying) before delays start. */
  address: 30,
  baseDelaySeconds: 30,
  maxDelaySeconds: 15 * 60,
  quietMinutes: 15,
} as const;

type Key = { key: string; free: number };

export function throttleKeys(email: string, address: string): Key[] {
  const keys: Key[] = [
    { key: `account:${email}`, free: THROTTLE.account },
    { key: `account-address:${email}|${address}`, free: THROTTLE.accountAtAddress },
  ];
  if (address !== UNKNOWN_ADDRESS) keys.push({ key: `address:${address}`, free: THROTTLE.address });
  return keys.sort((a, b) => (a.key < b.key ? -1 : 1)); // one lock order, no deadlocks
}

export const delaySeconds = (failures: number, free: number) =>
  failures < free
    ? 0
    : Math.min(THROTTLE.maxDelaySeconds, THROTTLE.baseDelaySeconds * 2 ** (failures - free));

function waitText(seconds: number) {
  if (seconds <= 60) return `${Math.max(1, Math.ceil(seconds))} seconds`;
  const m = Math.ceil(seconds / 60);
  return `${m} minute${m === 1 ? '' : 's'}`;
}

/**
 * Counts one attempt on every key, or refuses (throttled) without counting when a key is in its
 * delay. Returns the keys so the caller can give the count back on success.
 */
export async function reserveSignInAttempt(email: string, address: string): Promise<Key[]> {
  const keys = throttleKeys(email, address);
  const names = keys.map((k) => k.key);
  return db.transaction(async (tx) => {
    await tx
      .insert(signInThrottle)
      .values(names.map((key) => ({ key })))
      .onConflictDoNothing();
    const rows = await tx
      .select({
        key: signInThrottle.key,
        failures: signInThrottle.failures,
        quiet: sql<boolean>`greatest(${signInThrottle.lastFailureAt}, coalesce(${signInThrottle.blockedUntil}, '-infinity')) < now() - make_interval(mins => ${THROTTLE.quietMinutes})`,
        waitS: sql<number>`greatest(0, extract(epoch from (${signInThrottle.blockedUntil} - now())))::float8`,
      })
      .from(signInThrottle)
      .where(inArray(signInThrottle.key, names))
      .orderBy(signInThrottle.key)
      .for('update');
    const wait = Math.max(0, ...rows.filter((r) => !r.quiet).map((r) => Number(r.waitS) || 0));
    if (wait > 0) {
      throw new AppError(
        'throttled',
        `Too many failed sign-ins. Wait ${waitText(wait)} and try again, or reset the password.`,
      );
    }
    for (const k of keys) {
      const row = rows.find((r) => r.key === k.key)!;
      const failures = (row.quiet ? 0 : row.failures) + 1;
      const delay = delaySeconds(failures, k.free);
      await tx
        .update(signInThrottle)
        .set({
          failures,
          lastFailureAt: sql`now()`,
          blockedUntil: delay > 0 ? sql`now() + make_interval(secs => ${delay})` : null,
        })
        .where(sql`${signInThrottle.key} = ${k.key}`);
    }
    return keys;
  });
}

/** A successful sign-in clears the account's keys and takes its attempt back from the address. */
export async function releaseSignInAttempt(keys: Key[]) {
  const account = keys.filter((k) => !k.key.startsWith('address:')).map((k) => k.key);
  const address = keys.filter((k) => k.key.startsWith('address:')).map((k) => k.key);
  await db.transaction(async (tx) => {
    if (account.length) await tx.delete(signInThrottle).where(inArray(signInThrottle.key, account));
    if (address.length) {
      await tx
        .update(signInThrottle)
        .set({ failures: sql`greatest(0, ${signInThrottle.failures} - 1)` })
        .where(inArray(signInThrottle.key, address));
    }
  });
}

/** After a password reset the account starts afresh. */
export async function clearAccountThrottle(email: string, tx: Pick<typeof db, 'delete'> = db) {
  await tx
    .delete(signInThrottle)
    .where(
      sql`${signInThrottle.key} = ${`account:${email}`} or ${signInThrottle.key} like ${`account-address:${email.replace(/[\\%_]/g, '\\$&')}|%`}`,
    );
}
