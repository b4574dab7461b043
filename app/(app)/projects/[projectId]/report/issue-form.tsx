'use client';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { issueReportAction } from './actions';

export function IssueReportForm({ projectId, next }: { projectId: string; next: number }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [note, setNote] = useState('');
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r = await issueReportAction(projectId, { note });
          setMsg(
            r.ok ? { ok: true, text: `Revision ${r.data.number} issued.` } : { ok: false, text: r.error },
          );
          if (r.ok) setNote('');
          router.refresh();
        });
      }}
    >
      <div className="min-w-72 flex-1">
        <label className="label" htmlFor="report-note">
          Revision note (optional)
        </label>
        <input
          id="report-note"
          className="input w-full"
          maxLength={300}
          value={note}
          onChange={(e) => setNote(e.target.value)}
          placeholder="e.g. Issued for construction"
        />
      </div>
      <button type="submit" className="btn-primary" disabled={pending}>
        {pending ? 'Issuing…' : `Issue revision ${next}`}
      </button>
      {msg ? (
        <p
          role={msg.ok ? 'status' : 'alert'}
          className={`w-full text-sm ${msg.ok ? 'text-mineral-800' : 'text-alarm-700'}`}
        >
          {msg.text}
        </p>
      ) : null}
    </form>
  );
}
