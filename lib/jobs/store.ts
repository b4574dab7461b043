import { and, desc, eq, inArray, notInArray, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { jobs, type Job } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { getBoss } from './boss';
import { wakeWorkers } from './wake';
import { jobExpireSeconds, type QueueName, SCREEN_STEP_KINDS } from './queues';

/** What the page shows of a job. */
export type JobView = Pick<
  Job,
  'id' | 'kind' | 'state' | 'done' | 'total' | 'error' | 'attempts' | 'createdAt' | 'startedAt' | 'finishedAt'
> & { result: Record<string, unknown> | null };

const VIEW = {
  id: jobs.id,
  kind: jobs.kind,
  state: jobs.state,
  done: jobs.done,
  total: jobs.total,
  error: jobs.error,
  attempts: jobs.attempts,
  createdAt: jobs.createdAt,
  startedAt: jobs.startedAt,
  finishedAt: jobs.finishedAt,
  result: jobs.result,
};

/**
 * Records the job and puts it on its queue; the web request returns at once. One job at a time per
 * project (an import, a solve or a bill issue): a second is refused while one is queued or running,
 * so a bill never counts lines that a solve is rewriting.
 */
export async function enqueueJob({
  projectId,
  userId,
  kind,
  input,
}: {
  projectId: string;
  userId: string;
  kind: QueueName;
  input: Record<string, unknown>;
}): Promise<JobView> {
  const [busy] = SCREEN_STEP_KINDS.includes(kind)
    ? []
    : await db
        .select({ id: jobs.id })
        .from(jobs)
        .where(
          and(
            eq(jobs.projectId, projectId),
            inArray(jobs.state, ['queued', 'running']),
            // A batch of calculation sheets waits only for another batch; imports and solves for each other.
            inArray(
              jobs.kind,
              kind === 'sheets-batch' ? ['sheets-batch'] : ['import-solve', 'solve-all', 'issue-bill'],
            ),
          ),
        )
        .limit(1);
  if (busy)
    throw new AppError(
      'conflict',
      kind === 'sheets-batch'
        ? 'A batch of calculation sheets of this project is still being produced; wait for it to finish (its progress is shown on the line list).'
        : 'An import, solve or bill issue of this project is still running; wait for it to finish (its progress is shown on the line list and the bill page).',
    );
  const [job] = await db.insert(jobs).values({ projectId, kind, createdBy: userId, input }).returning(VIEW);
  const boss = await getBoss();
  await boss.send(kind, { jobId: job.id }, { expireInSeconds: jobExpireSeconds(), singletonKey: job.id });
  await wakeWorkers(kind);
  return job as JobView;
}

export async function listJobs({
  projectId,
  limit = 5,
}: {
  projectId: string;
  limit?: number;
}): Promise<JobView[]> {
  return db
    .select(VIEW)
    .from(jobs)
    .where(and(eq(jobs.projectId, projectId), notInArray(jobs.kind, [...SCREEN_STEP_KINDS])))
    .orderBy(desc(jobs.createdAt))
    .limit(limit) as Promise<JobView[]>;
}

export async function getJob({ projectId, jobId }: { projectId: string; jobId: string }): Promise<JobView> {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(jobId))
    throw new AppError('not_found');
  const [j] = await db
    .select(VIEW)
    .from(jobs)
    .where(and(eq(jobs.id, jobId), eq(jobs.projectId, projectId)));
  if (!j) throw new AppError('not_found');
  return j as JobView;
}

export { sql };
