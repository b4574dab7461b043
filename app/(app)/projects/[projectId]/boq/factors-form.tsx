'use client';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { saveBillFactorsAction } from './actions';

interface Row {
  key: string;
  label: string;
  unit: string;
  value: number;
  source: string;
}

/** The project's accessory factors, each with where its value comes from. */
export function FactorsForm({ projectId, rows }: { projectId: string; rows: Row[] }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  return (
    <form
      aria-label="Bill factors"
      className="space-y-2"
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const input = Object.fromEntries(
          rows.map((r) => {
            const raw = String(fd.get(`${r.key}.value`) ?? '')
              .trim()
              .replace(',', '.');
            return [
              r.key,
              {
                value: raw === '' ? Number.NaN : Number(raw),
                source: String(fd.get(`${r.key}.source`) ?? ''),
              },
            ];
          }),
        );
        start(async () => {
          const r = await saveBillFactorsAction(projectId, input);
          setFields(r.ok ? {} : (r.fields ?? {}));
          setMsg(
            r.ok
              ? { ok: true, text: 'Factors saved; the next issue uses them.' }
              : { ok: false, text: r.error },
          );
          router.refresh();
        });
      }}
    >
      <table className="table-dense panel">
        <thead>
          <tr>
            <th>Factor</th>
            <th>Value</th>
            <th>Source</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => {
            const err = [...(fields[`${r.key}.value`] ?? []), ...(fields[`${r.key}.source`] ?? [])];
            return (
              <tr key={r.key}>
                <td>
                  <label htmlFor={`f-${r.key}`}>
                    {r.label} ({r.unit})
                  </label>
                </td>
                <td>
                  <input
                    id={`f-${r.key}`}
                    name={`${r.key}.value`}
                    defaultValue={r.value}
                    inputMode="decimal"
                    className="input w-24"
                    aria-invalid={err.length ? true : undefined}
                  />
                </td>
                <td>
                  <input
                    name={`${r.key}.source`}
                    defaultValue={r.source}
                    aria-label={`Source of ${r.label.toLowerCase()}`}
                    className="input min-w-[28rem]"
                  />
                  {err.length ? <p className="field-error">{err.join(' ')}</p> : null}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <button type="submit" className="btn-quiet" disabled={pending}>
        {pending ? 'Saving…' : 'Save factors'}
      </button>
      {msg ? (
        <p
          role={msg.ok ? 'status' : 'alert'}
          className={`text-sm ${msg.ok ? 'text-mineral-800' : 'text-alarm-700'}`}
        >
          {msg.text}
        </p>
      ) : null}
    </form>
  );
}
