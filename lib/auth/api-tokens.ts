/**
 * Personal access tokens for scripts: `Authorization: Bearer lgw_…` on the API.
 *
 * A token is 32 random bytes (256 bits) from the operating system's CSPRNG, written base64url
 * after the prefix `lgw_`. Only its SHA-256 is stored. A slow password hash (argon2id, as for
 * passwords) protects low-entropy secrets a person chose; a 256-bit random value cannot be guessed
 * or brute-forced from its hash whatever the hash costs, and a plain digest lets every request find
 * its token with one indexed equality look-up instead of ~50 ms of argon2 per call. The token is
 * shown once, when made; nobody (the database included) can show it again.
 *
 * Every use — answered or refused because the token expired, was revoked or lacks the scope —
 * appends a row to `api_token_events` (append-only for the application's role), and sets the
 * token's `last_used_at`.
 */
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import { randomBytes } from 'node:crypto';
import type { User } from 'lucia';
import { db } from '@/db/client';
import { apiTokenEvents, apiTokens, memberships, organizations, users, type Role } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { can, SCOPE_ACTION, scopesForRole, TOKEN_SCOPES, type TokenScope } from './permissions';
import { hashToken } from './tokens';

export const TOKEN_PREFIX = 'lgw_';
/** Longest life a token may be given, days. */
export const MAX_TOKEN_DAYS = 366;
export const TOKEN_EXPIRY_CHOICES = [7, 30, 90, 365] as const;

export interface TokenAuth {
  tokenId: string;
  organizationId: string;
  scopes: TokenScope[];
  role: Role;
  name: string;
}

/** A new token and the hash that is stored. */
export function newApiToken(): { token: string; hash: string; prefix: string } {
  const token = TOKEN_PREFIX + randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token), prefix: token.slice(0, TOKEN_PREFIX.length + 6) };
}

async function nameOf(userId: string) {
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId));
  return u?.name ?? 'unknown';
}

/**
 * Makes a token for `userId` in `organizationId`. The role there must allow making tokens and every
 * scope asked for; the plain token is returned once and never stored.
 */
export async function createApiToken(o: {
  userId: string;
  organizationId: string;
  name: string;
  scopes: string[];
  days: number;
  now?: Date;
}) {
  const [m] = await db
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, o.userId), eq(memberships.organizationId, o.organizationId)));
  if (!m) throw new AppError('not_found');
  if (!can(m.role, 'tokens.create'))
    throw new AppError('forbidden', 'Your role in this organization does not allow making API tokens.');
  const name = o.name.trim();
  if (!name || name.length > 80)
    throw new AppError('invalid', 'Give the token a name of 1 to 80 characters.', {
      name: ['Give the token a name of 1 to 80 characters.'],
    });
  const allowed = scopesForRole(m.role);
  const scopes = [...new Set(o.scopes)];
  if (!scopes.length)
    throw new AppError('invalid', 'Choose at least one scope.', { scopes: ['Choose at least one scope.'] });
  const unknown = scopes.filter((s) => !(TOKEN_SCOPES as readonly string[]).includes(s));
  if (unknown.length)
    throw new AppError('invalid', `Unknown scope ${unknown.map((s) => `"${s}"`).join(', ')}.`, {
      scopes: ['Choose scopes from the list.'],
    });
  const denied = scopes.filter((s) => !allowed.includes(s as TokenScope));
  if (denied.length)
    throw new AppError('forbidden', `Your role does not allow the scope ${denied.join(', ')}.`);
  if (!Number.isInteger(o.days) || o.days < 1 || o.days > MAX_TOKEN_DAYS) {
    throw new AppError('invalid', `The expiry must be between 1 and ${MAX_TOKEN_DAYS} days.`, {
      days: [`Choose between 1 and ${MAX_TOKEN_DAYS} days.`],
    });
  }
  const now = o.now ?? new Date();
  const expiresAt = new Date(now.getTime() + o.days * 86_400_000);
  const { token, hash, prefix } = newApiToken();
  const actorName = await nameOf(o.userId);
  const ordered = TOKEN_SCOPES.filter((s) => scopes.includes(s));
  const row = await db.transaction(async (tx) => {
    const [t] = await tx
      .insert(apiTokens)
      .values({
        userId: o.userId,
        organizationId: o.organizationId,
        name,
        prefix,
        tokenHash: hash,
        scopes: ordered,
        expiresAt,
      })
      .returning();
    await tx.insert(apiTokenEvents).values({
      tokenId: t.id,
      organizationId: o.organizationId,
      userId: o.userId,
      actorName,
      action: 'created',
      detail: { name, scopes: ordered, expiresAt: expiresAt.toISOString() },
    });
    return t;
  });
  return { id: row.id, token, prefix, name, scopes: ordered, expiresAt };
}

/** The person's tokens in the organization, newest first (never the token itself). */
export async function listApiTokens({ userId, organizationId }: { userId: string; organizationId: string }) {
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      scopes: apiTokens.scopes,
      expiresAt: apiTokens.expiresAt,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .where(and(eq(apiTokens.userId, userId), eq(apiTokens.organizationId, organizationId)))
    .orderBy(desc(apiTokens.createdAt));
}

/** Revokes one of the person's own tokens (someone else's token is not found). Revoking twice is harmless. */
export async function revokeApiToken({ userId, tokenId }: { userId: string; tokenId: string }) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(tokenId))
    throw new AppError('not_found');
  const actorName = await nameOf(userId);
  return db.transaction(async (tx) => {
    const [t] = await tx
      .select()
      .from(apiTokens)
      .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId)))
      .for('update');
    if (!t) throw new AppError('not_found', 'That token is not yours or does not exist.');
    if (t.revokedAt) return { revokedAt: t.revokedAt };
    const [r] = await tx
      .update(apiTokens)
      .set({ revokedAt: new Date(), revokedBy: userId })
      .where(eq(apiTokens.id, t.id))
      .returning();
    await tx.insert(apiTokenEvents).values({
      tokenId: t.id,
      organizationId: t.organizationId,
      userId,
      actorName,
      action: 'revoked',
      detail: { name: t.name },
    });
    return { revokedAt: r.revokedAt! };
  });
}

/** The recent events of the person's tokens in the organization (the token page shows them). */
export async function listTokenEvents({
  userId,
  organizationId,
  limit = 50,
}: {
  userId: string;
  organizationId: string;
  limit?: number;
}) {
  const mine = db
    .select({ id: apiTokens.id })
    .from(apiTokens)
    .where(and(eq(apiTokens.userId, userId), eq(apiTokens.organizationId, organizationId)));
  return db
    .select({
      id: apiTokenEvents.id,
      at: apiTokenEvents.at,
      tokenId: apiTokenEvents.tokenId,
      action: apiTokenEvents.action,
      method: apiTokenEvents.method,
      path: apiTokenEvents.path,
      status: apiTokenEvents.status,
      detail: apiTokenEvents.detail,
    })
    .from(apiTokenEvents)
    .where(inArray(apiTokenEvents.tokenId, mine))
    .orderBy(desc(apiTokenEvents.at), desc(apiTokenEvents.id))
    .limit(limit);
}

const fmtDate = (d: Date) => `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;

/**
 * Appends one use (or refusal) of a token and notes its last use, in one statement (one round trip:
 * this runs on every API request). Callers catch its errors: a request is not failed by its audit row.
 */
export async function recordTokenUse(o: {
  tokenId: string;
  organizationId: string;
  userId: string;
  actorName?: string;
  action: 'used' | 'refused';
  method: string;
  path: string;
  status: number;
  detail?: Record<string, unknown>;
}) {
  const actorName = o.actorName ?? (await nameOf(o.userId));
  const detail = o.detail && Object.keys(o.detail).length ? JSON.stringify(o.detail) : null;
  await db.execute(sql`
    with appended as (
      insert into ${apiTokenEvents} (token_id, organization_id, user_id, actor_name, action, method, path, status, detail)
      values (${o.tokenId}, ${o.organizationId}, ${o.userId}, ${actorName}, ${o.action}, ${o.method}, ${o.path}, ${o.status}, ${detail}::jsonb)
      returning 1
    )
    update ${apiTokens} set last_used_at = now() where id = ${o.tokenId}`);
}

/**
 * Who a bearer token speaks for. Unknown: 401 with nothing recorded (there is no token to record
 * against). Expired, revoked, or its maker no longer in the organization: 401, and the refusal is
 * recorded. The scope and the role's current rights are checked by `requireScope`.
 */
export async function authenticateApiToken(
  raw: string,
  at: { method: string; path: string },
  now = new Date(),
): Promise<{ user: User; auth: TokenAuth }> {
  const token = raw.trim();
  if (!token.startsWith(TOKEN_PREFIX) || token.length > 200)
    throw new AppError(
      'unauthenticated',
      'This API token is not valid. Make a new one under Account → API tokens.',
    );
  const [row] = await db
    .select({
      t: apiTokens,
      email: users.email,
      userName: users.name,
      role: memberships.role,
      orgName: organizations.name,
    })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .innerJoin(organizations, eq(organizations.id, apiTokens.organizationId))
    .leftJoin(
      memberships,
      and(eq(memberships.userId, apiTokens.userId), eq(memberships.organizationId, apiTokens.organizationId)),
    )
    .where(eq(apiTokens.tokenHash, hashToken(token)));
  if (!row)
    throw new AppError(
      'unauthenticated',
      'This API token is not valid. Make a new one under Account → API tokens.',
    );
  const refuse = async (message: string, reason: string) => {
    await recordTokenUse({
      tokenId: row.t.id,
      organizationId: row.t.organizationId,
      userId: row.t.userId,
      actorName: row.userName,
      action: 'refused',
      method: at.method,
      path: at.path,
      status: 401,
      detail: { reason },
    }).catch(() => {});
    return new AppError('unauthenticated', message);
  };
  if (row.t.revokedAt)
    throw await refuse(
      `This API token ("${row.t.name}") was revoked on ${fmtDate(row.t.revokedAt)}.`,
      'revoked',
    );
  if (row.t.expiresAt.getTime() <= now.getTime())
    throw await refuse(
      `This API token ("${row.t.name}") expired on ${fmtDate(row.t.expiresAt)}. Make a new one under Account → API tokens.`,
      'expired',
    );
  if (!row.role)
    throw await refuse(
      `The maker of this API token ("${row.t.name}") is no longer a member of ${row.orgName}.`,
      'not a member',
    );
  return {
    user: { id: row.t.userId, email: row.email, name: row.userName } as User,
    auth: {
      tokenId: row.t.id,
      organizationId: row.t.organizationId,
      scopes: row.t.scopes as TokenScope[],
      role: row.role,
      name: row.t.name,
    },
  };
}

/** The token must carry `scope`, and its maker's current role must still allow what the scope stands for. */
export function scopeProblem(auth: TokenAuth, scope: TokenScope): string | null {
  if (!auth.scopes.includes(scope))
    return `This API token ("${auth.name}") does not have the "${scope}" scope; make a token with it under Account → API tokens.`;
  if (!can(auth.role, SCOPE_ACTION[scope]))
    return `Your role in this organization no longer allows the "${scope}" scope.`;
  return null;
}
