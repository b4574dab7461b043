'use client';
import { useRouter } from 'next/navigation';
import { useMemo, useState, useTransition } from 'react';
import { disposeAction, signOffAction } from '../actions';
import {
  DISPOSITIONS,
  DISPOSITION_LABEL,
  dispositionsFor,
  type Disposition,
} from '@/lib/review/dispositions';

interface Flag {
  type: string;
  message: string;
  valueC?: number;
  limitC?: number;
  conditions?: string;
}
export interface QueueItem {
  id: string;
  tag: string;
  area: string;
  flags: Flag[];
  status: 'open' | 'decided' | 'reopened';
  reopenReason: string | null;
  disposition: string | null;
  comment: string | null;
  requiredMm: number | null;
  requiredText?: string | null;
  deciderName: string | null;
  carriedFromRound: number | null;
}

const LABEL = DISPOSITION_LABEL as Record<string, string>;
/** Dispositions that fit every one of these items (each hazard has its own list). */
const fitting = (items: QueueItem[]) =>
  DISPOSITIONS.filter((d) => items.every((i) => dispositionsFor(i.flags.map((f) => f.type)).includes(d)));

export function ReviewQueue({
  projectId,
  roundId,
  items,
  flagLabels,
  canDispose,
  open,
}: {
  projectId: string;
  roundId: string;
  items: QueueItem[];
  flagLabels: Record<string, string>;
  canDispose: boolean;
  open: boolean;
}) {
  const router = useRouter();
  const [type, setType] = useState('');
  const [area, setArea] = useState('');
  const [status, setStatus] = useState('');
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [disposition, setDisposition] = useState('');
  const [comment, setComment] = useState('');
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [pending, start] = useTransition();
  const areas = [...new Set(items.map((i) => i.area))].sort();
  const shown = useMemo(
    () =>
      items.filter(
        (i) =>
          (!type || i.flags.some((f) => f.type === type)) &&
          (!area || i.area === area) &&
          (!status || i.status === status),
      ),
    [items, type, area, status],
  );
  const targets = selected.size ? items.filter((i) => selected.has(i.id)) : shown;
  const options: Disposition[] = targets.length ? fitting(targets) : [];
  const counts = {
    open: items.filter((i) => i.status === 'open').length,
    decided: items.filter((i) => i.status === 'decided').length,
    reopened: items.filter((i) => i.status === 'reopened').length,
  };

  function apply(ids: string[]) {
    setMsg(null);
    start(async () => {
      const r = await disposeAction(projectId, {
        roundId,
        itemIds: ids,
        disposition: disposition as never,
        comment: comment || undefined,
      });
      if (!r.ok) {
        setMsg({ ok: false, text: r.error });
        return;
      }
      setMsg({ ok: true, text: `${r.data.disposed} line${r.data.disposed === 1 ? '' : 's'} decided.` });
      setSelected(new Set());
      setComment('');
      router.refresh();
    });
  }
  function signOff() {
    setMsg(null);
    start(async () => {
      const r = await signOffAction(projectId, { roundId });
      if (!r.ok) {
        setMsg({ ok: false, text: r.error });
        return;
      }
      setMsg({ ok: true, text: 'Round signed off.' });
      router.refresh();
    });
  }

  return (
    <section aria-label="Review queue">
      <p className="mb-2 text-sm" data-testid="queue-counts">
        {items.length} lines · {counts.open} open · {counts.decided} decided · {counts.reopened} re-opened
      </p>
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <div>
          <label className="label" htmlFor="q-type">
            Flag
          </label>
          <select id="q-type" className="input" value={type} onChange={(e) => setType(e.target.value)}>
            <option value="">All flags</option>
            {Object.entries(flagLabels).map(([k, v]) => (
              <option key={k} value={k}>
                {v}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="q-area">
            Area
          </label>
          <select id="q-area" className="input" value={area} onChange={(e) => setArea(e.target.value)}>
            <option value="">All areas</option>
            {areas.map((a) => (
              <option key={a}>{a}</option>
            ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="q-status">
            Status
          </label>
          <select id="q-status" className="input" value={status} onChange={(e) => setStatus(e.target.value)}>
            <option value="">Any</option>
            <option value="open">Open</option>
            <option value="decided">Decided</option>
            <option value="reopened">Re-opened</option>
          </select>
        </div>
      </div>
      {canDispose && open ? (
        <section className="panel mb-3 flex flex-wrap items-end gap-3 p-3" aria-label="Decide on lines">
          <div>
            <label className="label" htmlFor="d-disp">
              Disposition
            </label>
            <select
              id="d-disp"
              className="input"
              value={options.includes(disposition as Disposition) ? disposition : ''}
              onChange={(e) => setDisposition(e.target.value)}
            >
              <option value="">Choose…</option>
              {options.map((k) => (
                <option key={k} value={k}>
                  {LABEL[k]}
                </option>
              ))}
            </select>
            <p className="mt-1 text-xs text-ink-500">
              {type === 'hot-surface'
                ? 'Burn hazard: insulate, guard, sign or out of reach.'
                : type === 'sweating'
                  ? 'Sweating: insulate, repair the vapour retarder, or accept with drip protection.'
                  : 'Only dispositions that fit every selected (or shown) line are offered; filter by flag to decide burn and sweat lines apart.'}
            </p>
          </div>
          <div className="min-w-[18rem] flex-1">
            <label className="label" htmlFor="d-comment">
              Comment (required to accept or return)
            </label>
            <input
              id="d-comment"
              className="input"
              value={comment}
              onChange={(e) => setComment(e.target.value)}
            />
          </div>
          <button
            type="button"
            className="btn-primary"
            disabled={pending || !options.includes(disposition as Disposition) || selected.size === 0}
            onClick={() => apply([...selected])}
          >
            Apply to {selected.size} selected
          </button>
          <button
            type="button"
            className="btn-quiet"
            disabled={pending || !options.includes(disposition as Disposition) || shown.length === 0}
            onClick={() => apply(shown.map((i) => i.id))}
          >
            Apply to all {shown.length} shown
          </button>
          <button type="button" className="btn-quiet ml-auto" disabled={pending} onClick={signOff}>
            Sign off the round
          </button>
        </section>
      ) : null}
      {msg ? (
        <p
          role={msg.ok ? 'status' : 'alert'}
          className={`mb-3 text-sm ${msg.ok ? 'text-mineral-800' : 'text-alarm-700'}`}
        >
          {msg.text}
        </p>
      ) : null}
      <div className="panel overflow-x-auto">
        <table className="table-dense" aria-label="Flagged lines">
          <thead>
            <tr>
              {canDispose && open ? (
                <th>
                  <span className="sr-only">Select</span>
                </th>
              ) : null}
              <th>Tag</th>
              <th>Area</th>
              <th>Flags and numbers</th>
              <th>Status</th>
              <th>Disposition</th>
            </tr>
          </thead>
          <tbody>
            {shown.map((i) => (
              <tr key={i.id} data-tag={i.tag}>
                {canDispose && open ? (
                  <td>
                    <input
                      type="checkbox"
                      aria-label={`Select ${i.tag}`}
                      checked={selected.has(i.id)}
                      onChange={(e) => {
                        const s = new Set(selected);
                        if (e.target.checked) s.add(i.id);
                        else s.delete(i.id);
                        setSelected(s);
                      }}
                    />
                  </td>
                ) : null}
                <td className="font-mono">{i.tag}</td>
                <td>{i.area}</td>
                <td>
                  <ul className="space-y-0.5">
                    {i.flags.map((f, k) => (
                      <li key={k}>
                        <strong>{flagLabels[f.type]}</strong>: {f.message}
                        {f.conditions ? (
                          <span className="text-xs text-ink-500"> ({f.conditions})</span>
                        ) : null}
                      </li>
                    ))}
                  </ul>
                </td>
                <td>
                  {i.status === 'open' ? (
                    <span className="badge bg-ink-100">open</span>
                  ) : i.status === 'decided' ? (
                    <span className="badge bg-mineral-100 text-mineral-900">decided</span>
                  ) : (
                    <span className="badge bg-ochre-100 text-ochre-900" title={i.reopenReason ?? ''}>
                      re-opened
                    </span>
                  )}
                  {i.reopenReason ? <p className="text-xs text-ochre-700">{i.reopenReason}</p> : null}
                </td>
                <td>
                  {i.disposition ? (
                    <>
                      {LABEL[i.disposition]}
                      {i.requiredText ? ` (${i.requiredText})` : ''}
                      {i.comment ? (
                        <p className="text-xs text-ink-600">
                          “{i.comment}” — {i.deciderName}
                        </p>
                      ) : null}
                      {i.carriedFromRound !== null ? (
                        <p className="text-xs text-mineral-800" data-testid={`carried-${i.tag}`}>
                          Carried over from round {i.carriedFromRound}: line, design and flags unchanged.
                        </p>
                      ) : null}
                    </>
                  ) : (
                    '—'
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
