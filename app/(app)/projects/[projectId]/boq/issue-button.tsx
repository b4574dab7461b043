'use client';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { issueBillAction } from './actions';

export function IssueButton({ projectId, next }: { projectId: string; next: number }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  return (
    <div>
      <button
        type="button"
        className="btn-primary"
        disabled={pending}
        onClick={() =>
          start(async () => {
            const r = await issueBillAction(projectId, {});
            setMsg(
              r.ok
                ? {
                    ok: true,
                    text: `Issue ${r.data.number} issued: ${r.data.counted} lines counted, ${r.data.pending} pending.`,
                  }
                : { ok: false, text: r.error },
            );
            router.refresh();
          })
        }
      >
        Issue revision {next}
      </button>
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
