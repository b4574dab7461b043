'use client';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { issueBillAction } from './actions';

/**
 * Issues the next revision. When nothing changed since the last issue the page says so first, and
 * the button asks for a second, explicit confirmation.
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
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const issue = (evenIfUnchanged: boolean) =>
    start(async () => {
      const r = await issueBillAction(projectId, { evenIfUnchanged });
      setConfirming(false);
      setMsg(
        r.ok
          ? {
              ok: true,
              text: `Issue ${r.data.number} issued: ${r.data.counted} lines counted, ${r.data.pending} pending.`,
            }
          : { ok: false, text: r.error },
      );
      router.refresh();
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
          <button type="button" className="btn-primary" disabled={pending} onClick={() => issue(true)}>
            Issue identical revision {next}
          </button>
          <button type="button" className="btn-quiet" disabled={pending} onClick={() => setConfirming(false)}>
            Cancel
          </button>
        </div>
      ) : (
        <button
          type="button"
          className="btn-primary"
          disabled={pending}
          onClick={() => (unchangedSince !== null ? setConfirming(true) : issue(false))}
        >
          Issue revision {next}
        </button>
      )}
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
