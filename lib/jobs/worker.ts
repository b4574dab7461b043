/**
 * npm run worker — works the job queues (pg-boss on PostgreSQL). Any number of workers may run, on
 * any machines, against one database: pg-boss hands each job to one of them (SELECT … FOR UPDATE
 * SKIP LOCKED). One job at a time per worker process.
 */
import { getPool } from '@/db/client';
import { getBoss, stopBoss } from './boss';
import { QUEUES } from './queues';
import { markAbandonedJobs, runJob } from './run';
import { createSolvePool } from '@/lib/lines/solve-pool';

async function main() {
  const pool = createSolvePool();
  const boss = await getBoss({ supervise: true });
  for (const name of Object.keys(QUEUES)) {
    await boss.work<{ jobId: string }>(name, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) =>
      runJob(job.data.jobId, { pool }),
    );
  }
  const sweep = setInterval(() => {
    markAbandonedJobs().catch((e) => console.error('[worker] sweep:', e?.code ?? '', e?.message));
  }, 5_000);
  console.error(
    `[worker] working ${Object.keys(QUEUES).join(', ')} (pid ${process.pid}; ${pool ? `${pool.threads} solve threads` : 'solving in this thread'})`,
  );
  const stop = async () => {
    clearInterval(sweep);
    await stopBoss().catch(() => undefined);
    await pool?.close().catch(() => undefined);
    await getPool()
      .end()
      .catch(() => undefined);
    process.exit(0);
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

main().catch((e) => {
  console.error('[worker] could not start:', e?.code ?? '', e?.message);
  process.exit(1);
});
