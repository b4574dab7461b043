/**
 * npm run worker — works the job queues (pg-boss on PostgreSQL). Any number of workers may run, on
 * any machines, against one database: pg-boss hands each job to one of them (SELECT … FOR UPDATE
 * SKIP LOCKED). One job at a time per worker process.
 */
import { setPriority } from 'node:os';
import { getPool } from '@/db/client';
import { getBoss, stopBoss } from './boss';
import { QUEUES } from './queues';
import { markAbandonedJobs, runJob } from './run';
import { createSolvePool } from '@/lib/lines/solve-pool';
import { listenForJobs } from './wake';

/**
 * Below the web server's CPU priority where both share a machine: a long solve then takes the time
 * the web requests leave, and other users' pages are not slowed by it (the kernel's nice 19; the
 * worker's own PostgreSQL sessions keep their priority). WORKER_NICE overrides it; 0 turns it off.
 */
function lowerPriority() {
  const nice = Number(process.env.WORKER_NICE ?? 19);
  if (!Number.isFinite(nice) || nice <= 0) return;
  try {
    setPriority(Math.min(19, Math.round(nice)));
  } catch {
    // Not allowed here (a container without the right): run at the normal priority.
  }
}

async function main() {
  lowerPriority();
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
