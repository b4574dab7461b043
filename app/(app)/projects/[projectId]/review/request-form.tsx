'use client';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { requestReviewAction } from './actions';

export function RequestReviewForm({
  projectId,
  areas,
  openRound,
}: {
  projectId: string;
  areas: string[];
  openRound: { id: string; number: number } | null;
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  // The message lives outside the form so it survives the refresh that swaps the form for the open round.
  const message = msg ? (
    <p
      role={msg.ok ? 'status' : 'alert'}
      className={`w-full text-sm ${msg.ok ? 'text-mineral-800' : 'text-alarm-700'}`}
    >
      {msg.text}
    </p>
  ) : null;
  if (openRound)
    return (
      <div className="space-y-2">
        {message}
        <p className="text-sm">
          Round {openRound.number} is open.{' '}
          <Link href={`/projects/${projectId}/review/${openRound.id}`}>Open it</Link>.
        </p>
      </div>
    );
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        start(async () => {
          const r = await requestReviewAction(projectId, {
            area: String(fd.get('area') ?? ''),
            note: String(fd.get('note') ?? ''),
          });
          if (!r.ok) {
            setMsg({ ok: false, text: r.error });
            return;
          }
          setMsg({
            ok: true,
            text: `Round ${r.data.number} requested for ${r.data.lines} lines${r.data.carried ? ` (${r.data.carried} decision${r.data.carried === 1 ? '' : 's'} carried over: line, design and flags unchanged)` : ''}; ${r.data.notified} reviewer${r.data.notified === 1 ? '' : 's'} notified by e-mail.`,
          });
          router.refresh();
        });
      }}
    >
      <div>
        <label htmlFor="rq-area" className="label">
          Area
        </label>
        <select id="rq-area" name="area" className="input">
          <option value="">All areas</option>
          {areas.map((a) => (
            <option key={a}>{a}</option>
          ))}
        </select>
      </div>
      <div className="min-w-[20rem] flex-1">
        <label htmlFor="rq-note" className="label">
          Note to the reviewer
        </label>
        <input id="rq-note" name="note" className="input" />
      </div>
      <button type="submit" className="btn-primary" disabled={pending}>
        Request a review of the flagged lines
      </button>
      {message}
    </form>
  );
}
