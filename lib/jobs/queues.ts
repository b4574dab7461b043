/**
 * The job queues and their pg-boss settings, shared by db/migrate.ts (which creates them as the
 * owner), the web process (which only sends) and the worker (which works them).
 */
export const BOSS_SCHEMA = 'pgboss';

export const QUEUES = {
  'import-solve': { retryLimit: 2, retryDelay: 2 },
  'solve-all': { retryLimit: 2, retryDelay: 2 },
  'issue-bill': { retryLimit: 2, retryDelay: 2 },
  'sheets-batch': { retryLimit: 1, retryDelay: 2 },
  // Steps of a screen the user is waiting on (the mapping step, the budget's what-if): read-only
  // or draft-only, so they never wait for the project's other jobs and are not listed among them.
  'read-upload': { retryLimit: 1, retryDelay: 1 },
  'check-import': { retryLimit: 1, retryDelay: 1 },
  'what-if': { retryLimit: 1, retryDelay: 1 },
} as const;
export type QueueName = keyof typeof QUEUES;

/**
 * A job still active this long after a worker took it is taken to have lost its worker (killed,
 * machine gone) and is retried. Tests shorten it through JOB_EXPIRE_SECONDS.
 */
export const jobExpireSeconds = () => Number(process.env.JOB_EXPIRE_SECONDS ?? 15 * 60);

/** How the user reads each kind of job (progress bar, recent jobs, failure messages). */
export const JOB_KIND_LABEL: Record<QueueName, string> = {
  'import-solve': 'Import and solve',
  'solve-all': 'Solve',
  'issue-bill': 'Bill issue',
  'sheets-batch': 'Calculation sheets',
  'read-upload': 'Reading the upload',
  'check-import': 'Checking the mapping',
  'what-if': 'What-if totals',
};

/** Jobs that are steps of one screen: they wait for no other job and are not listed as the project's work. */
export const SCREEN_STEP_KINDS: readonly QueueName[] = ['read-upload', 'check-import', 'what-if'];
