import 'server-only';
import { eq, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { userPreferences } from '@/db/schema';
import { readLineTableView, type LineTableView } from '@/lib/preferences/line-table-view';

/** The person's line-table view (hidden columns, density), or the default when they never changed it. */
export async function getLineTableView({ userId }: { userId: string }): Promise<LineTableView> {
  const [row] = await db
    .select({ lineTable: userPreferences.lineTable })
    .from(userPreferences)
    .where(eq(userPreferences.userId, userId));
  return readLineTableView(row?.lineTable);
}

/** Keeps the person's line-table view (already checked by `lineTableViewSchema`); one upsert. */
export async function saveLineTableView({ userId, view }: { userId: string; view: LineTableView }) {
  await db
    .insert(userPreferences)
    .values({ userId, lineTable: view })
    .onConflictDoUpdate({
      target: userPreferences.userId,
      set: { lineTable: view, updatedAt: sql`now()` },
    });
  return view;
}
