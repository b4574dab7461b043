'use client';
import { useEffect, useRef } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import type { JobView } from '@/lib/jobs/store';
import { JOB_KIND_LABEL as KIND } from '@/lib/jobs/queues';

type Wire = Omit<JobView, 'createdAt' | 'startedAt' | 'finishedAt'> & {
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
};
const active = (j: Wire | undefined) => !!j && (j.state === 'queued' || j.state === 'running');

/** Polls one job until it is done or failed. */
export function useJob(projectId: string, jobId: string | null) {
  return useQuery({
    queryKey: ['jobs', projectId, jobId],
    queryFn: async (): Promise<Wire> => {
      const r = await fetch(`/api/v1/projects/${projectId}/jobs/${jobId}`);
      if (!r.ok) throw new Error((await r.json()).error?.message ?? 'The job could not be read.');
      return (await r.json()).job;
    },
    enabled: !!jobId,
    refetchInterval: (q) => (active(q.state.data) || !q.state.data ? 700 : false),
  });
}

/**
 * Follows one job and calls `onDone` with its result or `onFailed` with its sentence, once per job,
 * when it finishes. The callbacks are read at that moment (latest render), so they may use state.
 */
export function useJobOutcome(
  projectId: string,
  jobId: string | null,
  on: { onDone: (result: Record<string, unknown>) => void; onFailed: (error: string) => void },
) {
  const job = useJob(projectId, jobId);
  const handlers = useRef(on);
  handlers.current = on;
  const handled = useRef<string | null>(null);
  useEffect(() => {
    const j = job.data;
    if (!j || j.id !== jobId || handled.current === j.id) return;
    if (j.state === 'done') {
      handled.current = j.id;
      handlers.current.onDone(j.result ?? {});
    } else if (j.state === 'failed') {
      handled.current = j.id;
      handlers.current.onFailed(j.error ?? 'The job stopped; nothing was changed. Try again.');
    }
  }, [job.data, jobId]);
  useEffect(() => {
    if (job.error && jobId && handled.current !== jobId) {
      handled.current = jobId;
      handlers.current.onFailed(job.error.message);
    }
  }, [job.error, jobId]);
  return job;
}

/** Seconds left at the rate so far, once there is a rate to go by. */
function remaining(j: Wire): string {
  if (!j.startedAt || !j.total || !j.done || j.done >= j.total) return '';
  const s = (((Date.now() - Date.parse(j.startedAt)) / j.done) * (j.total - j.done)) / 1000;
  return ` · about ${s < 60 ? `${Math.max(1, Math.round(s))} s` : `${Math.round(s / 60)} min`} left`;
}

export function JobProgressBar({ job }: { job: Wire }) {
  const label = `${KIND[job.kind]} progress`;
  const text =
    job.state === 'queued'
      ? 'Waiting for a worker…'
      : job.kind === 'read-upload'
        ? 'Reading the file…'
        : job.kind === 'check-import'
          ? 'Checking every row against the mapping…'
          : job.kind === 'what-if'
            ? 'Summing the totals…'
            : job.kind === 'sheets-batch'
              ? `Producing the sheets of ${job.total.toLocaleString('en')} lines…`
              : job.total
                ? `Solving: ${job.done.toLocaleString('en')} of ${job.total.toLocaleString('en')} lines${remaining(job)}`
                : job.kind === 'issue-bill'
                  ? 'Counting the quantities of every decided line…'
                  : 'Reading and importing…';
  return (
    <div className="mb-3" aria-live="polite">
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={job.total || 1}
        aria-valuenow={job.done}
        aria-valuetext={text}
        className="h-2 w-full overflow-hidden rounded bg-ink-100"
      >
        <div
          className="h-full bg-mineral-500 transition-all"
          style={{ width: `${job.total ? Math.round((100 * job.done) / job.total) : 3}%` }}
        />
      </div>
      <p className="mt-1 text-xs text-ink-600">
        {KIND[job.kind]}: {text}
        {job.attempts > 1 ? ` (attempt ${job.attempts})` : ''}
      </p>
    </div>
  );
}

/**
 * The project's recent jobs: a progress bar while one runs (also after leaving the page and coming
 * back), and the last few with their outcome. Refreshes the line table when a job finishes.
 */
export function RecentJobs({ projectId, renderedAt }: { projectId: string; renderedAt: string }) {
  const qc = useQueryClient();
  const router = useRouter();
  const q = useQuery({
    queryKey: ['jobs', projectId, 'recent'],
    queryFn: async (): Promise<Wire[]> => {
      const r = await fetch(`/api/v1/projects/${projectId}/jobs`);
      if (!r.ok) throw new Error((await r.json()).error?.message ?? 'The jobs could not be read.');
      return (await r.json()).jobs;
    },
    refetchInterval: (s) => (s.state.data?.some(active) ? 1000 : 5000),
  });
  const running = q.data?.find(active);
  const was = useRef<string | null>(null);
  useEffect(() => {
    if (was.current && !running) qc.invalidateQueries({ queryKey: ['lines', projectId] });
    was.current = running?.id ?? null;
  }, [running, projectId, qc]);
  // A job that finished between the server's render of this page and the first poll (an import
  // finishing while the user came back to the page) is never seen running: refresh for it too.
  const checked = useRef(false);
  useEffect(() => {
    if (!q.data || checked.current) return;
    checked.current = true;
    if (q.data.some((j) => j.finishedAt !== null && j.finishedAt > renderedAt)) {
      qc.invalidateQueries({ queryKey: ['lines', projectId] });
      router.refresh();
    }
  }, [q.data, renderedAt, projectId, qc, router]);
  if (!q.data?.length) return null;
  return (
    <section aria-label="Jobs" className="mb-4">
      {running ? <JobProgressBar job={running} /> : null}
      <details className="text-xs text-ink-600">
        <summary>Recent jobs</summary>
        <ul className="mt-1 space-y-0.5" aria-label="Recent jobs">
          {q.data.map((j) => (
            <li key={j.id}>
              {j.createdAt.slice(0, 16).replace('T', ' ')} · {KIND[j.kind]} · {j.state}
              {j.state === 'done' && j.result && 'solved' in j.result
                ? ` · ${String(j.result.solved)} ${j.result.solved === 1 ? 'line' : 'lines'} solved`
                : ''}
              {j.state === 'done' && j.kind === 'sheets-batch' && j.result ? (
                <>
                  {' · '}
                  <a href={`/api/v1/projects/${projectId}/sheets/${j.id}`} download>
                    Download the {String(j.result.sheets)} sheets (zip, one PDF per line)
                  </a>
                </>
              ) : null}
              {j.error && j.state === 'failed' ? ` · ${j.error}` : ''}
            </li>
          ))}
        </ul>
      </details>
    </section>
  );
}
