'use client';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { JobProgressBar, useJobOutcome } from '../lines/job-progress';
import { issueBillAction } from './actions';

/**
 * Issues the next revision as a background job and follows it: a progress line while the
 * quantities are counted and the workbook is kept, then the outcome (the page reloads its list of
 * issues). When nothing changed since the last issue the page says so first, and the button asks
 * for a second, explicit confirmation.
 */
export function IssueButton({
  projectId,
  next,
  unchangedSince,
}: {
  projectId: string;
  next: number;
  unchangedSince: number | null;
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [confirming, setConfirming] = useState(false);
  const [jobId, setJobId] = useState<string | null>(null);
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const job = useJobOutcome(projectId, jobId, {
    onFailed: (text) => {
      setJobId(null);
      setMsg({ ok: false, text });
    },
    onDone: (result) => {
      setJobId(null);
      const r = result as { number?: number; counted?: number; pending?: number };
      setMsg({
        ok: true,
        text: `Issue ${r.number} issued: ${r.counted} lines counted, ${r.pending} pending.`,
      });
      router.refresh();
    },
  });
  const j = job.data;
  const busy = pending || jobId !== null;
  const issue = (evenIfUnchanged: boolean) =>
    start(async () => {
      setMsg(null);
      const r = await issueBillAction(projectId, { evenIfUnchanged });
      setConfirming(false);
      if (r.ok) setJobId(r.data.jobId);
      else setMsg({ ok: false, text: r.error });
    });
  return (
    <div>
      {unchangedSince !== null ? (
        <p
          role="note"
          className="mb-2 rounded border border-ink-300 bg-ink-50 px-3 py-2 text-sm text-ink-800"
        >
          Nothing changed since issue {unchangedSince}: issuing now gives the contractor an identical bill.
        </p>
      ) : null}
      {confirming ? (
        <div className="flex gap-2">
          <button type="button" className="btn-primary" disabled={busy} onClick={() => issue(true)}>
            Issue identical revision {next}
          </button>
          <button type="button" className="btn-quiet" disabled={busy} onClick={() => setConfirming(false)}>
            Cancel
          </button>
        </div>
      ) : (
        <button
          type="button"
          className="btn-primary"
          disabled={busy}
          onClick={() => (unchangedSince !== null ? setConfirming(true) : issue(false))}
        >
          Issue revision {next}
        </button>
      )}
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
