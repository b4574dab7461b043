import { eq } from 'drizzle-orm';
import { db, type Tx } from '@/db/client';
import { auditLog, users } from '@/db/schema';

/** Appends to the audit trail (the database refuses updates and deletes of these rows). */
export async function writeAudit(
  tx: Tx | typeof db,
  rows: {
    projectId: string;
    lineId?: string | null;
    tag?: string | null;
    actorId: string;
    actorName: string;
    action: string;
    before?: unknown;
    after?: unknown;
  }[],
) {
  for (let i = 0; i < rows.length; i += 1000) {
    await tx
      .insert(auditLog)
      .values(
        rows.slice(i, i + 1000).map((r) => ({ ...r, before: r.before ?? null, after: r.after ?? null })),
      );
  }
}

export async function actorName(userId: string) {
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId));
  return u?.name ?? 'unknown';
}
