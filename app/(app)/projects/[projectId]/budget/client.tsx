'use client';
import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { useJobOutcome } from '../lines/job-progress';
import { saveBudgetAction, whatIfAction } from './actions';
import { convert, formatter, sig, type FormatOptions } from '@/lib/format';

interface Totals {
  kW: number;
  mwhPerYear: number;
  costPerYear: number;
  co2TonnesPerYear: number;
}
const n = (v: number, d = 1) =>
  v.toLocaleString('en-GB', { maximumFractionDigits: d, minimumFractionDigits: d });

export function AreaChart({
  areas,
  format,
}: {
  areas: { area: string; bareKW: number; designedKW: number; allocationKW: number | null }[];
  format: FormatOptions;
}) {
  // US customary: thousands of Btu/h (MBH), as US plant rooms size heat.
  const us = format.unitSystem === 'US';
  const p = (kw: number) => (us ? convert.wToBtuPerH(kw * 1000) / 1000 : kw);
  const unit = us ? 'MBH (1000 Btu/h)' : 'kW';
  areas = areas.map((a) => ({
    ...a,
    bareKW: p(a.bareKW),
    designedKW: p(a.designedKW),
    allocationKW: a.allocationKW === null ? null : p(a.allocationKW),
  }));
  return (
    <div className="h-80" role="img" aria-label="Heat loss per area against allocation">
      <ResponsiveContainer>
        <BarChart
          data={areas.map((a) => ({ ...a, allocation: a.allocationKW ?? 0 }))}
          margin={{ top: 10, right: 20, left: 10, bottom: 40 }}
        >
          <CartesianGrid stroke="#d5d9df" strokeDasharray="3 3" />
          <XAxis dataKey="area" tick={{ fontSize: 11 }} angle={-15} textAnchor="end" interval={0} />
          <YAxis
            tick={{ fontSize: 11 }}
            tickFormatter={(v: number) => sig(v, 3)}
            label={{ value: unit, angle: -90, position: 'insideLeft' }}
          />
          <Tooltip
            formatter={(v) => (typeof v === 'number' ? `${sig(v, 3)} ${us ? 'MBH' : 'kW'}` : String(v))}
          />
          <Legend
            verticalAlign="top"
            height={24}
            formatter={(v) => <span style={{ color: '#23282e' }}>{v}</span>}
          />
          <Bar dataKey="designedKW" name="Designed" fill="#257a74" isAnimationActive={false} />
          <Bar
            dataKey="allocation"
            name="Allocation"
            fill="#fdf8ec"
            stroke="#a15a1c"
            strokeWidth={2}
            strokeDasharray="4 2"
            isAnimationActive={false}
          />
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

export function TotalsTable({
  bare,
  designed,
  savings,
  label = 'Totals',
  format,
}: {
  bare: Totals;
  designed: Totals;
  savings: Totals;
  label?: string;
  format: FormatOptions;
}) {
  const u = formatter(format);
  return (
    <table className="table-dense" aria-label={label}>
      <thead>
        <tr>
          <th></th>
          <th className="text-right">Heat loss</th>
          <th className="text-right">Energy per year</th>
          <th className="text-right">Cost per year ({u.currency})</th>
          <th className="text-right">t CO₂/yr</th>
        </tr>
      </thead>
      <tbody>
        {(
          [
            ['Bare', bare],
            ['Designed', designed],
            ['Saved by insulation', savings],
          ] as const
        ).map(([k, t]) => (
          <tr key={k}>
            <td>{k}</td>
            <td className="num">{u.power(t.kW * 1000)}</td>
            <td className="num">{u.energy(t.mwhPerYear)}</td>
            <td className="num">{u.money(t.costPerYear)}</td>
            <td className="num">{n(t.co2TonnesPerYear)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function WhatIfPanel({
  projectId,
  price,
  hours,
  format,
}: {
  projectId: string;
  price: number;
  hours: number;
  format: FormatOptions;
}) {
  const [p, setP] = useState(String(price));
  const [h, setH] = useState(String(hours));
  const [policy, setPolicy] = useState('chosen');
  const [result, setResult] = useState<{
    bare: Totals;
    designed: Totals;
    savings: Totals;
    warnings: string[];
  } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [starting, start] = useTransition();
  // The totals are summed by the worker (a big project has many lines); the panel follows the job.
  const [jobId, setJobId] = useState<string | null>(null);
  useJobOutcome(projectId, jobId, {
    onDone: (r) => {
      setJobId(null);
      setResult(r as unknown as NonNullable<typeof result>);
    },
    onFailed: (message) => {
      setJobId(null);
      setError(message);
    },
  });
  const pending = starting || jobId !== null;
  return (
    <section className="panel p-4" aria-label="What if">
      <h2 className="mb-2">What if</h2>
      <p className="mb-3 text-xs text-ink-500">
        Shows the totals a different price, operating time or thickness policy would give. Nothing is saved.
      </p>
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <div>
          <label className="label" htmlFor="wi-price">
            Energy price per kWh ({format.currency ?? 'EUR'})
          </label>
          <input id="wi-price" className="input w-28" value={p} onChange={(e) => setP(e.target.value)} />
        </div>
        <div>
          <label className="label" htmlFor="wi-hours">
            Hours per year
          </label>
          <input id="wi-hours" className="input w-28" value={h} onChange={(e) => setH(e.target.value)} />
        </div>
        <div>
          <label className="label" htmlFor="wi-policy">
            Thickness policy
          </label>
          <select id="wi-policy" className="input" value={policy} onChange={(e) => setPolicy(e.target.value)}>
            <option value="chosen">As chosen (recommendation where undecided)</option>
            <option value="recommended">Recommendation everywhere</option>
            <option value="economic-plus-one">Economic + one size up</option>
          </select>
        </div>
        <button
          type="button"
          className="btn-quiet"
          disabled={pending}
          onClick={() => {
            setError(null);
            start(async () => {
              const r = await whatIfAction(projectId, {
                energyPricePerKWh: Number(p),
                hoursPerYear: Number(h),
                policy,
              });
              setResult(null);
              if (!r.ok) {
                setError(r.error);
                return;
              }
              setJobId(r.data.id);
            });
          }}
        >
          Show totals
        </button>
      </div>
      {jobId ? (
        <p role="status" className="text-sm text-ink-700">
          Summing the totals…
        </p>
      ) : null}
      {error ? (
        <p role="alert" className="text-sm text-alarm-700">
          {error}
        </p>
      ) : null}
      {result ? (
        <>
          <TotalsTable
            bare={result.bare}
            designed={result.designed}
            savings={result.savings}
            label="What-if totals"
            format={format}
          />
          {result.warnings.map((w, i) => (
            <p key={i} className="mt-1 text-xs text-alarm-700">
              {w}
            </p>
          ))}
        </>
      ) : null}
    </section>
  );
}

export function BudgetForm({
  projectId,
  areas,
  budget,
}: {
  projectId: string;
  areas: string[];
  budget: { totalKW: number; totalMWhPerYear: number; allocations: { area: string; kW: number }[] } | null;
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [msg, setMsg] = useState<{ ok: boolean; text: string; fields?: Record<string, string[]> } | null>(
    null,
  );
  const alloc = (a: string) => budget?.allocations.find((x) => x.area === a)?.kW ?? '';
  return (
    <form
      className="panel space-y-3 p-4"
      aria-label="Budget"
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const input = {
          totalKW: fd.get('totalKW'),
          totalMWhPerYear: fd.get('totalMWhPerYear'),
          allocations: areas
            .map((a, i) => ({ area: a, kW: fd.get(`kw-${i}`) }))
            .filter((x) => String(x.kW ?? '').trim() !== ''),
        };
        start(async () => {
          const r = await saveBudgetAction(projectId, input);
          setMsg(r.ok ? { ok: true, text: 'Budget saved.' } : { ok: false, text: r.error, fields: r.fields });
          if (r.ok) router.refresh();
        });
      }}
    >
      <h2>Budget and allocation</h2>
      <div className="flex flex-wrap gap-3">
        <div>
          <label className="label" htmlFor="b-kw">
            Plant budget, kW
          </label>
          <input
            id="b-kw"
            name="totalKW"
            className="input w-32"
            defaultValue={budget?.totalKW ?? ''}
            aria-invalid={msg?.fields?.totalKW ? true : undefined}
          />
          {msg?.fields?.totalKW ? <p className="field-error">{msg.fields.totalKW.join(' ')}</p> : null}
        </div>
        <div>
          <label className="label" htmlFor="b-mwh">
            Plant budget, MWh/yr
          </label>
          <input
            id="b-mwh"
            name="totalMWhPerYear"
            className="input w-32"
            defaultValue={budget?.totalMWhPerYear ?? ''}
          />
          {msg?.fields?.totalMWhPerYear ? (
            <p className="field-error">{msg.fields.totalMWhPerYear.join(' ')}</p>
          ) : null}
        </div>
      </div>
      <table className="table-dense">
        <thead>
          <tr>
            <th>Area</th>
            <th>Allocation, kW</th>
          </tr>
        </thead>
        <tbody>
          {areas.map((a, i) => (
            <tr key={a}>
              <td>{a}</td>
              <td>
                <input
                  aria-label={`Allocation for ${a}`}
                  name={`kw-${i}`}
                  className="input w-28"
                  defaultValue={alloc(a)}
                />
                {msg?.fields?.[`allocations.${i}.kW`] ? (
                  <p className="field-error">{msg.fields[`allocations.${i}.kW`].join(' ')}</p>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <button type="submit" className="btn-primary" disabled={pending}>
        Save budget
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
