/**
 * Waking the workers the moment a job is queued, instead of at their next poll (pg-boss polls every
 * 0.5 s at the least, and a screen step such as reading an upload is three jobs in a row). The web
 * process NOTIFYs a channel after sending; each worker LISTENs on its own connection and asks pg-boss
 * to fetch now (`notifyWorker`). Polling stays: a worker whose listening connection is down, or a
 * notification lost, still gets the job within the polling interval.
 */
import { Client } from 'pg';
import { sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { env } from '@/lib/env';
import type { QueueName } from './queues';

export const JOB_WAKE_CHANNEL = 'lagwise_job_queued';

/** Tells every listening worker that a job is waiting on `queue`. */
export async function wakeWorkers(queue: QueueName): Promise<void> {
  await db.execute(sql`select pg_notify(${JOB_WAKE_CHANNEL}, ${queue})`);
}

/**
 * Listens for queued jobs and calls `onQueued(queue)` for each; reconnects after a lost connection.
 * Returns a function that stops listening.
 */
export function listenForJobs(onQueued: (queue: string) => void): () => Promise<void> {
  let client: Client | null = null;
  let stopped = false;
  let retry: NodeJS.Timeout | undefined;
  const retryLater = () => {
    if (!stopped) retry = setTimeout(() => void connect().catch(() => undefined), 5_000);
  };
  const connect = async () => {
    const c = new Client({ connectionString: env.databaseUrl() });
    c.on('notification', (m) => {
      if (m.channel === JOB_WAKE_CHANNEL && m.payload) onQueued(m.payload);
    });
    c.on('error', (e) => {
      console.error('[worker] job wake-up connection lost; polling until it is back:', (e as Error).message);
      client = null;
      c.end().catch(() => undefined);
      retryLater();
    });
    try {
      await c.connect();
      await c.query(`listen ${JOB_WAKE_CHANNEL}`);
      if (stopped) await c.end();
      else client = c;
    } catch (e) {
      c.end().catch(() => undefined);
      retryLater();
      throw e;
    }
  };
  connect().catch((e) => console.error('[worker] could not listen for jobs; polling only:', e?.message));
  return async () => {
    stopped = true;
    clearTimeout(retry);
    await client?.end().catch(() => undefined);
  };
}
