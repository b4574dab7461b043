import Link from 'next/link';
import { loadProject, orNotFound } from '@/lib/server/page';
import { Denied } from '@/components/denied';
import { ResultCautions } from '@/components/cautions';
import { getDesignBasis, getLine } from '@/lib/lines/store';
import { GEOMETRY_LABEL, PURPOSE_LABEL, isSurfaceGeometry, type Purpose } from '@/lib/lines/fields';
import { catalogueOf } from '@/lib/lines/catalogue';
import { CostChart } from './cost-chart';
import { auditForLine } from '@/lib/review/store';
import { economicsView } from '@/lib/lines/economics-view';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import type { LineInput } from '@/lib/lines/validate';

export const metadata = { title: 'Line' };

type Cand = [number, [string, number][], number, number, number | null, number | null, boolean];
const f = (v: number | null | undefined, d = 1) => (v === null || v === undefined ? '—' : v.toFixed(d));

export default async function LinePage({ params }: { params: Promise<{ projectId: string; lineId: string }> }) {
  const { projectId, lineId } = await params;
  const { project, allowed } = await loadProject(projectId, 'lines.read');
  if (!allowed) return <Denied what="The line list" />;
  const row = await orNotFound(getLine({ projectId: project.id, lineId }));
  const { line, result, design, stale } = row;
  const audit = await auditForLine({ projectId: project.id, lineId: line.id });
  const { basis } = await getDesignBasis({ projectId: project.id });
  const cat = catalogueOf(basis);
  const ev = result ? economicsView(basis, line as unknown as LineInput, design?.thicknessMm ?? null) : null;
  const cands = (result?.candidates ?? []) as Cand[];
  const econ = (result?.outcomes as { id: string; requiredMm: number | null; message: string }[] | undefined) ?? [];
  const optimum = econ.find((o) => o.id === 'economic')?.requiredMm ?? null;
  const d = result?.design as { profileC: { radiusOrDepthM: number; tempC: number }[]; overall: { perLengthWPerMK?: number; outerSurface: { valueWPerM2K: number; diameterM?: number }; innerSurface: { valueWPerM2K: number; diameterM?: number } }; convective: number; radiative: number } | null | undefined;
  const surface = isSurfaceGeometry(line.geometry);
  const fittingsW = result && result.heatFlowPerUnit !== null ? lineFittingsW(basis, line, result.heatFlowPerUnit, cands[0]?.[2] ?? 0, result.recommendedMm === 0) : 0;
  const unit = surface ? 'W/m²' : 'W/m';
  return (
    <>
      <p className="mb-1 text-sm"><Link href={`/projects/${project.id}/lines`}>← Line list</Link></p>
      <h1 className="mb-1 font-mono">{line.tag}</h1>
      <p className="mb-4 text-sm text-ink-600">{line.service} · {line.area} · {GEOMETRY_LABEL[line.geometry]} {line.nps ? `NPS ${line.nps}` : ''} {line.outsideDiameterMm ? `(${f(line.outsideDiameterMm)} mm OD)` : ''}</p>
      <div className="mb-4"><ResultCautions /></div>
      {stale ? <p role="status" className="caution mb-4">These results are stale: the line or the design basis changed since they were computed. Solve the stale lines on the line list.</p> : null}
      <div className="grid gap-4 lg:grid-cols-3">
        <section className="panel p-4">
          <h2 className="mb-2">Inputs</h2>
          <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
            <dt className="text-ink-500">Normal / max temperature</dt><dd>{f(line.normalTempC)} / {f(line.maxTempC)} °C</dd>
            <dt className="text-ink-500">{surface ? 'Area / height' : 'Length'}</dt><dd>{surface ? `${f(line.surfaceAreaM2)} m² / ${f(line.heightM)} m` : `${f(line.lengthM)} m`}</dd>
            <dt className="text-ink-500">Steam pressure</dt><dd>{line.steamPressureBarG !== null ? `${f(line.steamPressureBarG)} bar(g)` : '—'}</dd>
            <dt className="text-ink-500">Purposes</dt><dd>{(line.purposes as Purpose[]).map((p) => PURPOSE_LABEL[p]).join(', ')}</dd>
            <dt className="text-ink-500">Location / access</dt><dd>{line.outdoor ? 'Outdoor' : 'Indoor'} · {line.accessible ? 'accessible' : 'not accessible'}{line.accessHeightM !== null ? ` (${f(line.accessHeightM)} m)` : ''}</dd>
            <dt className="text-ink-500">Fittings</dt><dd>{line.elbows} elbows, {line.tees} tees, {line.valves} valves, {line.flanges} flanges</dd>
            <dt className="text-ink-500">System</dt><dd>{result ? `${result.systemLabel}, ${cat.jackets.get(result.jacketId)?.name ?? result.jacketId}` : '—'}</dd>
          </dl>
        </section>
        <section className="panel p-4">
          <h2 className="mb-2">Recommendation</h2>
          {result ? (
            <>
              <p className="text-2xl font-semibold" data-testid="recommended">{result.recommendedMm === null ? 'none' : result.recommendedMm === 0 ? 'bare' : `${result.recommendedMm} mm`}</p>
              <p className="mb-2 text-sm text-ink-600">{(result.layers as { materialId: string; thicknessMm: number }[]).map((l) => `${l.thicknessMm} mm ${cat.materials.get(l.materialId)?.name ?? l.materialId}`).join(' + ') || 'no insulation'}</p>
              <ul className="space-y-1 text-sm">
                {econ.map((o) => <li key={o.id}><strong>{o.id === result.governing ? '▶ ' : ''}{o.id}</strong>: {o.requiredMm === null ? 'not met' : `${o.requiredMm} mm`} — {o.message}</li>)}
              </ul>
              {(result.warnings as string[]).length ? <ul className="mt-2 space-y-1 text-xs text-alarm-700">{(result.warnings as string[]).map((w, i) => <li key={i}>{w}</li>)}</ul> : null}
            </>
          ) : <p className="text-sm text-ink-500">Not solved yet.</p>}
        </section>
        <section className="panel p-4">
          <h2 className="mb-2">Chosen design</h2>
          {design ? (
            <div className="space-y-1 text-sm">
              <p className="text-xl font-semibold">{design.thicknessMm === 0 ? 'bare' : `${design.thicknessMm} mm`} <span className="text-sm font-normal text-ink-600">({design.source === 'manual' ? 'manual pick' : 'recommendation accepted'})</span></p>
              {design.reason ? <p>Reason: {design.reason}</p> : null}
              {design.belowCriterion ? <p className="text-alarm-700">Below {design.belowCriterion} — flagged for review.</p> : null}
              {design.needsRedecision ? <p className="text-ochre-700">Needs re-decision: {design.redecisionReason}</p> : null}
              <p className="text-xs text-ink-500">Decided {design.decidedAt.toISOString().slice(0, 16).replace('T', ' ')}</p>
            </div>
          ) : <p className="text-sm text-ink-500">No thickness chosen yet.</p>}
        </section>
      </div>
      {result ? (
        <div className="mt-4 grid gap-4 lg:grid-cols-2">
          <section className="panel p-4">
            <h2 className="mb-2">Cost curve</h2>
            <CostChart points={cands.map((c) => ({ mm: c[0], heatFlow: c[2], annualCost: c[5] }))} optimumMm={optimum} chosenMm={design?.thicknessMm ?? null} unit={unit} />
          </section>
          {ev ? (
            <section className="panel p-4" aria-labelledby="econ-h">
              <h2 id="econ-h" className="mb-2">Economic thickness</h2>
              <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
                <dt className="text-ink-500">Optimum</dt><dd data-testid="econ-optimum">{ev.optimumMm === null ? '—' : `${ev.optimumMm} mm`}</dd>
                <dt className="text-ink-500">Within {ev.flatRangePct} % of the lowest annual cost</dt><dd data-testid="econ-range">{ev.range ? `${ev.range.fromMm}–${ev.range.toMm} mm` : '—'}</dd>
                <dt className="text-ink-500">Project rule</dt><dd>{ev.choice === 'optimum' ? 'the optimum is required' : 'the thinnest in the range is required'}</dd>
                {ev.vsBare ? <>
                  <dt className="text-ink-500">{ev.atMm} mm against bare, per {ev.per}</dt>
                  <dd>extra first cost {f(ev.vsBare.extraInstalled, 0)}, saves {f(ev.vsBare.annualSaving, 0)} a year; payback {ev.vsBare.paybackYears === null ? 'none' : `${f(ev.vsBare.paybackYears, 1)} years`}; net present value {f(ev.vsBare.npv, 0)}</dd>
                </> : null}
                {ev.vsThinner ? <>
                  <dt className="text-ink-500">{ev.atMm} mm against {ev.vsThinner.againstMm} mm</dt>
                  <dd>extra {f(ev.vsThinner.extraInstalled, 1)}, saves {f(ev.vsThinner.annualSaving, 1)} a year; payback {ev.vsThinner.paybackYears === null ? 'none' : `${f(ev.vsThinner.paybackYears, 1)} years`}; net present value {f(ev.vsThinner.npv, 1)}</dd>
                </> : null}
              </dl>
              <table className="table-dense mt-3" aria-label="Optimum under other prices">
                <thead><tr><th>If</th><th className="text-right">Optimum, mm</th></tr></thead>
                <tbody>{ev.sensitivity.map((x) => <tr key={x.label}><td>{x.label}</td><td className="num">{x.optimumMm ?? '—'}</td></tr>)}</tbody>
              </table>
              <p className="mt-2 text-xs text-ink-600">Annualised cost = capital recovery × installed cost + levelised energy cost (cold lines priced as cooling). Rates and prices are the design basis&apos;s; set the project&apos;s own.</p>
            </section>
          ) : null}
          <section className="panel p-4">
            <h2 className="mb-2">At the recommendation (heat-loss conditions)</h2>
            <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-500">Heat loss</dt><dd>{f(result.heatFlowPerUnit)} {unit}{line.geometry === 'vessel' ? ' (mean over the outside area)' : ''} · {f((result.totalHeatW ?? 0) / 1000, 2)} kW for the line (bare {f(result.bareHeatW / 1000, 2)} kW)</dd>
              {fittingsW ? <><dt className="text-ink-500">Straight run + fittings</dt><dd data-testid="fittings-heat">{f((result.totalHeatW ?? 0) / 1000, 2)} kW + {f(fittingsW / 1000, 2)} kW ({line.elbows} elbows, {line.tees} tees, {line.valves} valves, {line.flanges} flanges, supports as equivalent lengths{basis.fittings.valvesBare ? '; valves and flanges bare' : ''}) = {f(((result.totalHeatW ?? 0) + fittingsW) / 1000, 2)} kW</dd></> : null}
              <dt className="text-ink-500">Surface temperature</dt><dd>{f(result.surfaceTempC)} °C (personnel check {f(result.personnelSurfaceC)} °C)</dd>
              <dt className="text-ink-500">Annual energy / cost / CO₂</dt><dd>{f(result.annualMWh)} MWh · {f(result.annualCost, 0)} · {f(result.co2Tonnes, 2)} t</dd>
              {result.condensateKgPerH !== null ? <><dt className="text-ink-500">Condensate</dt><dd>{f(result.condensateKgPerH, 2)} kg/h</dd></> : null}
              {d && line.geometry === 'vessel' ? <><dt className="text-ink-500">Vessel model</dt><dd>Shell plus two flat heads; the coefficients and profile below are the shell&apos;s, the heat loss covers all three.</dd></> : null}
              {d ? <>
                <dt className="text-ink-500">Surface coefficients</dt><dd>convection {f(d.convective, 2)}, radiation {f(d.radiative, 2)} W/(m²·K)</dd>
                {d.overall.perLengthWPerMK !== undefined ? <><dt className="text-ink-500">U per metre</dt><dd>{f(d.overall.perLengthWPerMK, 4)} W/(m·K)</dd></> : null}
                <dt className="text-ink-500">U referred to the outer surface</dt><dd>{f(d.overall.outerSurface.valueWPerM2K, 4)} W/(m²·K){d.overall.outerSurface.diameterM ? ` on D = ${f(d.overall.outerSurface.diameterM * 1000, 1)} mm` : ''}</dd>
                <dt className="text-ink-500">U referred to the inner surface</dt><dd>{f(d.overall.innerSurface.valueWPerM2K, 4)} W/(m²·K){d.overall.innerSurface.diameterM ? ` on D = ${f(d.overall.innerSurface.diameterM * 1000, 1)} mm` : ''}</dd>
              </> : null}
            </dl>
            {d ? (
              <table className="table-dense mt-3" aria-label="Temperature profile">
                <thead><tr><th>{line.geometry === 'flat' ? 'Depth' : 'Radius'}, mm</th><th>Temperature, °C</th></tr></thead>
                <tbody>{d.profileC.map((p, i) => <tr key={i}><td className="num">{f(p.radiusOrDepthM * 1000)}</td><td className="num">{f(p.tempC)}</td></tr>)}</tbody>
              </table>
            ) : null}
          </section>
        </div>
      ) : null}
      <section className="panel mt-4 p-4">
        <h2 className="mb-2">Record</h2>
        {audit.length === 0 ? <p className="text-sm text-ink-500">No decisions recorded yet.</p> : (
          <table className="table-dense" aria-label="Audit trail">
            <thead><tr><th>When (UTC)</th><th>Who</th><th>What</th><th>Before</th><th>After</th></tr></thead>
            <tbody>{audit.map((a) => (
              <tr key={a.id}><td>{a.at.toISOString().slice(0, 16).replace('T', ' ')}</td><td>{a.actorName}</td><td>{a.action}</td>
                <td className="font-mono text-xs">{a.before ? JSON.stringify(a.before) : '—'}</td><td className="font-mono text-xs">{a.after ? JSON.stringify(a.after) : '—'}</td></tr>
            ))}</tbody>
          </table>
        )}
      </section>
    </>
  );
}
