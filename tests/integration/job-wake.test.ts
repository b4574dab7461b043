/**
 * Workers are woken when a job is queued (lib/jobs/wake.ts): a listener hears the queue's name from
 * another connection's NOTIFY, only after that transaction commits, and stops hearing once stopped.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { JOB_WAKE_CHANNEL, listenForJobs, wakeWorkers } from '@/lib/jobs/wake';

afterAll(async () => {
  await getPool().end();
});

async function until(ok: () => boolean, ms = 5_000) {
  const end = Date.now() + ms;
  while (!ok() && Date.now() < end) await new Promise((r) => setTimeout(r, 20));
  return ok();
}

describe('waking the workers', () => {
  it('a listener hears the queue of each job sent, after its transaction commits, and not once stopped', async () => {
    const heard: string[] = [];
    const stop = listenForJobs((q) => heard.push(q));
    // The listener connects in the background: send until it hears the first.
    const end = Date.now() + 5_000;
    while (!heard.length && Date.now() < end) {
      await wakeWorkers('what-if');
      await until(() => heard.length > 0, 200);
    }
    expect(heard[0]).toBe('what-if');
    heard.length = 0;

    // Inside a transaction, nothing is heard until it commits.
    let committed = false;
    await db.transaction(async (tx) => {
      await tx.execute(sql`select pg_notify(${JOB_WAKE_CHANNEL}, 'import-solve')`);
      await new Promise((r) => setTimeout(r, 300));
      expect(heard).toEqual([]);
      committed = true;
    });
    expect(committed).toBe(true);
    expect(await until(() => heard.includes('import-solve'))).toBe(true);

    await stop();
    heard.length = 0;
    await wakeWorkers('solve-all');
    await new Promise((r) => setTimeout(r, 300));
    expect(heard).toEqual([]);
  });
});
