'use client';
import { useRouter } from 'next/navigation';
import { useEffect, useState, useTransition } from 'react';
import { JobProgressBar, useJob } from '../lines/job-progress';
import { issueBillAction } from './actions';

/**
 * Issues the next bill revision as a background job and follows it: a progress line while the
 * quantities are counted, then the outcome (the page reloads its list of issues).
 */
export function IssueButton({ projectId, next }: { projectId: string; next: number }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [jobId, setJobId] = useState<string | null>(null);
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const job = useJob(projectId, jobId);
  const j = job.data;
  useEffect(() => {
    if (!j || j.state === 'queued' || j.state === 'running') return;
    setJobId(null);
    if (j.state === 'failed') setMsg({ ok: false, text: j.error ?? 'The bill was not issued.' });
    else {
      const r = (j.result ?? {}) as { number?: number; counted?: number; pending?: number };
      setMsg({
        ok: true,
        text: `Issue ${r.number} issued: ${r.counted} lines counted, ${r.pending} pending.`,
      });
      router.refresh();
    }
  }, [j, router]);
  const busy = pending || jobId !== null;
  return (
    <div>
      <button
        type="button"
        className="btn-primary"
        disabled={busy}
        onClick={() =>
          start(async () => {
            setMsg(null);
            const r = await issueBillAction(projectId, {});
            if (r.ok) setJobId(r.data.jobId);
            else setMsg({ ok: false, text: r.error });
          })
        }
      >
        Issue revision {next}
      </button>
      {jobId && j ? (
        <div className="mt-2">
          <JobProgressBar job={j} />
        </div>
      ) : null}
      {msg ? (
        <p
          role={msg.ok ? 'status' : 'alert'}
          className={`mt-2 text-sm ${msg.ok ? 'text-mineral-800' : 'text-alarm-700'}`}
        >
          {msg.text}
        </p>
      ) : null}
    </div>
  );
}
