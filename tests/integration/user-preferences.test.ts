import { afterAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { userPreferences, users } from '@/db/schema';
import { getLineTableView, saveLineTableView } from '@/db/queries/preferences';

afterAll(async () => {
  await getPool().end();
});

async function person() {
  const id = `pref-${randomUUID().slice(0, 8)}`;
  await db.insert(users).values({ id, email: `${id}@example.com`, name: id });
  return id;
}

describe('user preferences: the line-table view per user', () => {
  it('is the default until saved, then what was saved, for that user only; a second save replaces it', async () => {
    const a = await person();
    const b = await person();
    expect(await getLineTableView({ userId: a })).toEqual({ hiddenColumns: [], density: 'compact' });
    await saveLineTableView({
      userId: a,
      view: { hiddenColumns: ['service', 'area'], density: 'comfortable' },
    });
    expect(await getLineTableView({ userId: a })).toEqual({
      hiddenColumns: ['service', 'area'],
      density: 'comfortable',
    });
    expect(await getLineTableView({ userId: b })).toEqual({ hiddenColumns: [], density: 'compact' });
    await saveLineTableView({ userId: a, view: { hiddenColumns: [], density: 'compact' } });
    expect(await getLineTableView({ userId: a })).toEqual({ hiddenColumns: [], density: 'compact' });
    expect(await db.select().from(userPreferences).where(eq(userPreferences.userId, a))).toHaveLength(1);
  });

  it('goes with the user when the account is deleted', async () => {
    const a = await person();
    await saveLineTableView({ userId: a, view: { hiddenColumns: ['margin'], density: 'compact' } });
    await db.delete(users).where(eq(users.id, a));
    expect(await db.select().from(userPreferences).where(eq(userPreferences.userId, a))).toHaveLength(0);
  });
});
