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
import { listenForJobs } from './wake';

async function main() {
  const pool = createSolvePool();
  const boss = await getBoss({ supervise: true });
  const workerIds = new Map<string, string>();
  for (const name of Object.keys(QUEUES)) {
    const id = await boss.work<{ jobId: string }>(
      name,
      { batchSize: 1, pollingIntervalSeconds: 0.5 },
      async ([job]) => runJob(job.data.jobId, { pool }),
    );
    workerIds.set(name, id);
  }
  // Fetch at once when the web process says a job was queued (lib/jobs/wake.ts); polling remains.
  const stopListening = listenForJobs((queue) => {
    const id = workerIds.get(queue);
    if (id) boss.notifyWorker(id);
  });
  const sweep = setInterval(() => {
    markAbandonedJobs().catch((e) => console.error('[worker] sweep:', e?.code ?? '', e?.message));
  }, 5_000);
  console.error(
    `[worker] working ${Object.keys(QUEUES).join(', ')} (pid ${process.pid}; ${pool ? `${pool.threads} solve threads` : 'solving in this thread'})`,
  );
  const stop = async () => {
    clearInterval(sweep);
    await stopListening();
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
