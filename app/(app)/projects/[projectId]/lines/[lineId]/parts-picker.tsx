'use client';
import { useRouter } from 'next/navigation';
import { useId, useState, useTransition } from 'react';
import {
  VESSEL_PART_IDS,
  VESSEL_PART_LABEL,
  type PartPicks,
  type VesselPartId,
} from '@/lib/lines/vessel-parts';
import { pickVesselPartsAction } from '../actions';

const TITLE: Record<VesselPartId, string> = { shell: 'Shell', top: 'Top head', bottom: 'Bottom head' };

/**
 * Pick a vessel part by part: each part's thickness (the engine's per-part recommendation marked), or
 * a head guarded instead of insulated to the touch limit. The server decides whether a reason is
 * needed (manual, below a criterion, guarded) and says so.
 */
export function PartsPicker(props: {
  projectId: string;
  lineId: string;
  expectedVersion: number;
  options: { mm: number; label: string; withinLimits: boolean }[];
  recommended: Record<VesselPartId, number | null>;
  current: PartPicks | null;
}) {
  const router = useRouter();
  const id = useId();
  const initial = (p: VesselPartId) => ({
    thicknessMm: props.current?.[p].thicknessMm ?? props.recommended[p] ?? props.options[0]?.mm ?? 0,
    guarded: !!props.current?.[p].guarded,
  });
  const [picks, setPicks] = useState<PartPicks>({
    shell: initial('shell'),
    top: initial('top'),
    bottom: initial('bottom'),
  });
  const [reason, setReason] = useState('');
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);
  const [pending, start] = useTransition();
  const set = (p: VesselPartId, v: Partial<PartPicks[VesselPartId]>) =>
    setPicks((x) => ({ ...x, [p]: { ...x[p], ...v } }));
  function save() {
    setMessage(null);
    start(async () => {
      const r = await pickVesselPartsAction(props.projectId, {
        lineId: props.lineId,
        parts: picks,
        reason: reason.trim() || undefined,
        expectedVersion: props.expectedVersion,
      });
      if (!r.ok) {
        setMessage({ kind: 'error', text: r.error });
        return;
      }
      setReason('');
      setMessage({ kind: 'ok', text: `Saved: ${r.data.parts}.` });
      router.refresh();
    });
  }
  return (
    <form
      className="mt-3 border-t border-ink-200 pt-3"
      aria-label="Choose per part"
      onSubmit={(e) => {
        e.preventDefault();
        save();
      }}
    >
      <h3 className="mb-1 text-sm font-semibold">Choose per part</h3>
      <div className="flex flex-wrap items-end gap-4">
        {VESSEL_PART_IDS.map((p) => (
          <div key={p} className="text-sm">
            <label htmlFor={`${id}-${p}`} className="block">
              {TITLE[p]} thickness
            </label>
            <select
              id={`${id}-${p}`}
              className="input py-0.5 text-sm"
              value={picks[p].thicknessMm}
              onChange={(e) => set(p, { thicknessMm: Number(e.target.value) })}
            >
              {props.options.map((o) => (
                <option key={o.mm} value={o.mm}>
                  {o.label}
                  {o.mm === props.recommended[p] ? ' ★ recommended' : ''}
                  {o.withinLimits ? '' : ' (over a layer limit)'}
                </option>
              ))}
            </select>
            {p !== 'shell' ? (
              <label className="mt-1 flex items-center gap-1 text-xs">
                <input
                  type="checkbox"
                  checked={!!picks[p].guarded}
                  onChange={(e) => set(p, { guarded: e.target.checked })}
                />
                Guard the {VESSEL_PART_LABEL[p]} instead (personnel guard)
              </label>
            ) : null}
          </div>
        ))}
        <div className="text-sm">
          <label htmlFor={`${id}-reason`} className="block">
            Reason (needed for a manual pick, a guard, or a part below a criterion)
          </label>
          <input
            id={`${id}-reason`}
            className="input w-72 py-0.5 text-sm"
            value={reason}
            maxLength={500}
            onChange={(e) => setReason(e.target.value)}
          />
        </div>
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? 'Saving…' : 'Save parts'}
        </button>
      </div>
      <p className="mt-1 text-xs text-ink-600">
        A guarded head stays flagged for the safety reviewer (a guard is a disposition the reviewer signs
        off); follow your site&apos;s rules for guards and local codes for hot surfaces.
      </p>
      {message ? (
        <p
          role={message.kind === 'error' ? 'alert' : 'status'}
          className={`mt-1 text-sm ${message.kind === 'error' ? 'text-alarm-700' : 'text-mineral-800'}`}
        >
          {message.text}
        </p>
      ) : null}
    </form>
  );
}
