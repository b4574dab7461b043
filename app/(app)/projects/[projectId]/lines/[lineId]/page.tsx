import Link from 'next/link';
import { loadProject, orNotFound, projectPageTitle } from '@/lib/server/page';
import { Denied } from '@/components/denied';
import { ResultCautions } from '@/components/cautions';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { inputOf } from '@/lib/lines/result-row';
import { getLine } from '@/lib/lines/results-store';
import { GEOMETRY_LABEL, PURPOSE_LABEL, isSurfaceGeometry, type Purpose } from '@/lib/lines/fields';
import { catalogueOf } from '@/lib/lines/catalogue';
import { CostChart } from './cost-chart';
import { auditForLine } from '@/lib/review/store';
import { economicsView } from '@/lib/lines/economics-view';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import { lineTracing, TRACING_REASON_LABEL, TRACING_STANDARD } from '@/lib/lines/tracing';
import type { LineInput } from '@/lib/lines/validate';
import { candidateNumbers, decidingLimits, worstMargin } from '@/lib/lines/deciding';
import { decodeCandidate } from '@/lib/lines/candidate-row';
import { criterionLabel } from '@/lib/lines/criterion-labels';
import { conditionSetOf, describeConditionSet } from '@/lib/lines/criterion-conditions';
import { criteriaFor } from '@/lib/lines/solve-line';
import {
  CUI_METAL_LABEL,
  describeCuiFinding,
  designFactor,
  energyTerms,
  vesselPartDecisions,
} from '@/lib/thermal';
import { cuiScreenFor } from '@/lib/lines/cui';
import { convert, describeChanges, formatterFor, localizeMessage, sig } from '@/lib/format';
import { PrintButton } from '@/components/print-button';
import { can } from '@/lib/auth/permissions';
import { VESSEL_PART_IDS, VESSEL_PART_LABEL } from '@/lib/lines/vessel-parts';
import { PartsPicker } from './parts-picker';
import { listComments } from '@/lib/comments/store';
import { LineComments } from './line-comments';

/** "1\"-HW-207-B2 · Line · BP-STM-24": each line's page has its own title. */
export async function generateMetadata({
  params,
}: {
  params: Promise<{ projectId: string; lineId: string }>;
}) {
  const { projectId, lineId } = await params;
  return {
    title: await projectPageTitle(projectId, 'Line', 'lines.read', async (id) => {
      const { line } = await getLine({ projectId: id, lineId });
      return line.tag;
    }),
  };
}

const PART_LABEL = { shell: 'Shell', top: 'Top head', bottom: 'Bottom head' } as const;

function Changes({ lines }: { lines: string[] }) {
  return lines.length ? (
    <ul className="space-y-0.5">
      {lines.map((l, i) => (
        <li key={i}>{l}</li>
      ))}
    </ul>
  ) : (
    <>—</>
  );
}

export default async function LinePage({
  params,
}: {
  params: Promise<{ projectId: string; lineId: string }>;
}) {
  const { projectId, lineId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'lines.read');
  if (!allowed) return <Denied what="The line list" />;
  const row = await orNotFound(getLine({ projectId: project.id, lineId }));
  const { line, result, design, stale } = row;
  const audit = await auditForLine({ projectId: project.id, lineId: line.id });
  const { basis } = await getDesignBasis({ projectId: project.id });
  const cat = catalogueOf(basis);
  const ev = result ? economicsView(basis, line as unknown as LineInput, design?.thicknessMm ?? null) : null;
  const u = formatterFor(basis);
  // A decision taken before the energy code applied (or changed) that the current result says is too thin.
  const codeOutcome = !stale ? result?.outcomes.find((o) => o.id === 'energyCode') : undefined;
  const codeFail =
    design && codeOutcome && (codeOutcome.requiredMm === null || design.thicknessMm < codeOutcome.requiredMm)
      ? codeOutcome
      : null;
  // Heat tracing at the line's thickness: the chosen one, else the recommendation.
  const tracing = result
    ? lineTracing(basis, line, result.tracing, design?.thicknessMm ?? result.recommendedMm)
    : null;
  const msg = (t: string) => localizeMessage(t, u);
  const cands = (result?.candidates ?? []).map(decodeCandidate);
  const rows = result?.candidates ?? [];
  const limits = decidingLimits(basis, line as unknown as LineInput, result?.jacketId ?? null);
  const nums = result ? candidateNumbers(basis, inputOf(line), result.jacketId, rows, limits) : [];
  const atMm = design?.thicknessMm ?? result?.recommendedMm ?? null;
  const econ = result?.outcomes ?? [];
  const crit = criteriaFor(basis, line.outdoor);
  const cui = cuiScreenFor(basis, inputOf(line));
  // A vessel's parts from the stored outcomes and candidates (the engine's own rule, vesselPartDecisions).
  const partDecisions =
    result && line.geometry === 'vessel' && result.outcomes.some((o) => o.parts)
      ? vesselPartDecisions(
          result.outcomes,
          cands.map((c) => ({ totalMm: c.mm, serviceLimitOk: c.withinLimits })),
        )
      : null;
  const canPick = can(role, 'design.pick');
  const cold = line.normalTempC < crit.conditions.heatLoss.airC;
  const energy = energyTerms(basis.economics, cold);
  const layerMaterials = [...new Set((result?.layers ?? []).map((l) => l.materialId))]
    .map((id) => cat.materials.get(id))
    .filter((m) => m !== undefined);
  const wind = (ms: number) => (u.system === 'US' ? `${sig(ms / 0.44704, 2)} mph` : `${ms} m/s`);
  const optimum = econ.find((o) => o.id === 'economic')?.requiredMm ?? null;
  const d = result?.design;
  const surface = isSurfaceGeometry(line.geometry);
  const fittingsW =
    result && result.heatFlowPerUnit !== null
      ? lineFittingsW(
          basis,
          line,
          result.heatFlowPerUnit,
          cands[0]?.heatFlow ?? 0,
          result.recommendedMm === 0,
        )
      : 0;
  const per = surface ? u.units.area : u.units.length;
  const recNums = nums.find((c) => c.mm === result?.recommendedMm);
  // Per metre/m² amounts from the economics, in the project's length or area unit.
  const perUnit = (v: number, digits: number) =>
    u.money(u.system === 'US' ? (surface ? convert.perM2ToPerFt2(v) : convert.perMToPerFt(v)) : v, digits);
  // Audit keys carry SI units ("thickness (mm): 25 → 40"): shown in the project's units.
  const msgKey = (t: string) =>
    u.system === 'SI' && u.series === 'mm'
      ? t
      : t
          .replace(
            /thickness \(mm\): (.*)$/,
            (_, v: string) => `thickness: ${v.replace(/-?\d+(?:\.\d+)?/g, (n) => u.thickness(Number(n)))}`,
          )
          .replace(
            /required \(mm\): (-?\d+(?:\.\d+)?)/,
            (_, n: string) => `required: ${u.thickness(Number(n))}`,
          );
  return (
    <>
      <div className="no-print mb-1 flex flex-wrap items-center justify-between gap-2 text-sm">
        <Link href={`/projects/${project.id}/lines`}>← Line list</Link>
        <span className="flex items-center gap-3">
          <a href={`/api/v1/projects/${project.id}/lines/${line.id}/sheet`} download>
            Download calculation sheet (PDF)
          </a>
          <PrintButton label="Print this page" />
        </span>
      </div>
      <p className="mb-1 hidden text-xs text-ink-600 print:block">
        {project.code} · {project.name} · calculation sheet · line-list revision {line.revision} · design
        basis revision {result?.basisRevision ?? '—'} · calculation version {result?.calcVersion ?? '—'}
      </p>
      <h1 className="mb-1 font-mono">{line.tag}</h1>
      <p className="mb-4 text-sm text-ink-600">
        {line.service} · {line.area} · {GEOMETRY_LABEL[line.geometry]} {line.nps ? `NPS ${line.nps}` : ''}{' '}
        {line.outsideDiameterMm ? `(${u.diameter(line.outsideDiameterMm)} OD)` : ''}
      </p>
      <div className="mb-4">
        <ResultCautions />
      </div>
      {stale ? (
        <p role="status" className="caution mb-4">
          These results are stale: the line or the design basis changed since they were computed. Solve the
          stale lines on the line list.
        </p>
      ) : null}
      <div className="grid gap-4 lg:grid-cols-3">
        <section className="panel p-4">
          <h2 className="mb-2">Inputs</h2>
          <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
            <dt className="text-ink-500">Normal / max temperature</dt>
            <dd>
              {u.temp(line.normalTempC)} / {u.temp(line.maxTempC)}
            </dd>
            <dt className="text-ink-500">{surface ? 'Area / height' : 'Length'}</dt>
            <dd>
              {surface ? `${u.area(line.surfaceAreaM2)} / ${u.length(line.heightM)}` : u.length(line.lengthM)}
            </dd>
            <dt className="text-ink-500">Steam pressure</dt>
            <dd>{u.pressure(line.steamPressureBarG)}</dd>
            <dt className="text-ink-500">Purposes</dt>
            <dd>{(line.purposes as Purpose[]).map((p) => PURPOSE_LABEL[p]).join(', ')}</dd>
            <dt className="text-ink-500">Location / access</dt>
            <dd>
              {line.outdoor ? 'Outdoor' : 'Indoor'} · {line.accessible ? 'accessible' : 'not accessible'}
              {line.accessHeightM !== null ? ` (${u.length(line.accessHeightM)})` : ''}
            </dd>
            <dt className="text-ink-500">Fittings</dt>
            <dd>
              {line.elbows} elbows, {line.tees} tees, {line.valves} valves, {line.flanges} flanges
            </dd>
            <dt className="text-ink-500">System</dt>
            <dd>
              {result
                ? `${result.systemLabel}, ${cat.jackets.get(result.jacketId)?.name ?? result.jacketId}`
                : '—'}
            </dd>
          </dl>
        </section>
        <section className="panel p-4">
          <h2 className="mb-2">Recommendation</h2>
          {result ? (
            <>
              <p className="text-2xl font-semibold" data-testid="recommended">
                {result.recommendedMm === null ? 'none' : u.thickness(result.recommendedMm)}
              </p>
              <p className="mb-2 text-sm text-ink-600">
                {result.layers
                  .map(
                    (l) =>
                      `${u.thickness(l.thicknessMm)} ${cat.materials.get(l.materialId)?.name ?? l.materialId}`,
                  )
                  .join(' + ') || 'no insulation'}
              </p>
              <ul className="space-y-1 text-sm">
                {econ.map((o) => (
                  <li key={o.id} data-testid={`criterion-${o.id}`}>
                    <strong>
                      {o.id === result.governing ? '▶ ' : ''}
                      {criterionLabel(o.id)}
                    </strong>
                    : {o.requiredMm === null ? 'not met' : u.thickness(o.requiredMm)} — {msg(o.message)}
                    <span className="block text-xs text-ink-500" data-testid={`criterion-${o.id}-conditions`}>
                      Judged under{' '}
                      {describeConditionSet(
                        conditionSetOf(o, line.normalTempC < crit.conditions.heatLoss.airC),
                        crit.conditions,
                        u.temp,
                        wind,
                      )}
                      .
                    </span>
                    {o.id === 'personnel' && o.touchBasis ? (
                      <span className="block text-xs text-ink-500" data-testid="touch-basis">
                        Touch limit {u.temp(o.limitC ?? null)}: {msg(o.touchBasis)} A burn threshold for
                        healthy adult skin; follow local codes and a qualified person where others may touch.
                      </span>
                    ) : null}
                  </li>
                ))}
              </ul>
              {result.warnings.length ? (
                <ul className="mt-2 space-y-1 text-xs text-alarm-700">
                  {result.warnings.map((w, i) => (
                    <li key={i}>{msg(w)}</li>
                  ))}
                </ul>
              ) : null}
            </>
          ) : (
            <p className="text-sm text-ink-500">Not solved yet.</p>
          )}
        </section>
        <section className="panel p-4">
          <h2 className="mb-2">Chosen design</h2>
          {design ? (
            <div className="space-y-1 text-sm">
              <p className="text-xl font-semibold" data-testid="chosen-design">
                {design.parts && line.geometry === 'vessel'
                  ? VESSEL_PART_IDS.map(
                      (p) =>
                        `${VESSEL_PART_LABEL[p]} ${u.thickness(design.parts![p].thicknessMm)}${design.parts![p].guarded ? ' (guarded)' : ''}`,
                    ).join(' · ')
                  : u.thickness(design.thicknessMm)}{' '}
                <span className="text-sm font-normal text-ink-600">
                  ({design.source === 'manual' ? 'manual pick' : 'recommendation accepted'})
                </span>
              </p>
              {design.reason ? <p>Reason: {design.reason}</p> : null}
              {design.belowCriterion ? (
                <p className="text-alarm-700">Below {design.belowCriterion} — flagged for review.</p>
              ) : null}
              {codeFail ? (
                <p className="text-alarm-700" data-testid="energy-code-fail">
                  Fails the energy code: {localizeMessage(codeFail.message, u)} The chosen{' '}
                  {u.thickness(design.thicknessMm)} is below the{' '}
                  {codeFail.requiredMm === null ? 'code minimum' : u.thickness(codeFail.requiredMm)} it asks;
                  choose the thickness again.
                </p>
              ) : null}
              {design.needsRedecision ? (
                <p className="text-ochre-700">Needs re-decision: {design.redecisionReason}</p>
              ) : null}
              <p className="text-xs text-ink-500">
                Decided {design.decidedAt.toISOString().slice(0, 16).replace('T', ' ')}
              </p>
            </div>
          ) : (
            <p className="text-sm text-ink-500">No thickness chosen yet.</p>
          )}
        </section>
      </div>
      {result ? (
        <div className="mt-4 grid gap-4 lg:grid-cols-2">
          <section className="panel p-4">
            <h2 className="mb-2">Cost curve</h2>
            <CostChart
              points={cands.map((c) => ({ mm: c.mm, heatFlow: c.heatFlow, annualCost: c.annualCost }))}
              optimumMm={optimum}
              chosenMm={design?.thicknessMm ?? null}
              surface={surface}
              format={{
                unitSystem: basis.unitSystem,
                thicknessSeries: basis.thicknessSeries,
                currency: basis.currency,
              }}
            />
          </section>
          {ev ? (
            <section className="panel p-4" aria-labelledby="econ-h">
              <h2 id="econ-h" className="mb-2">
                Economic thickness
              </h2>
              <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
                <dt className="text-ink-500">Optimum</dt>
                <dd data-testid="econ-optimum">{u.thickness(ev.optimumMm)}</dd>
                <dt className="text-ink-500">Within {ev.flatRangePct} % of the lowest annual cost</dt>
                <dd data-testid="econ-range">
                  {ev.range ? `${u.thickness(ev.range.fromMm)} – ${u.thickness(ev.range.toMm)}` : '—'}
                </dd>
                <dt className="text-ink-500">Project rule</dt>
                <dd>
                  {ev.choice === 'optimum'
                    ? 'the optimum is required'
                    : 'the thinnest in the range is required'}
                </dd>
                {ev.vsBare ? (
                  <>
                    <dt className="text-ink-500">
                      {u.thickness(ev.atMm)} against bare, per {per}
                    </dt>
                    <dd>
                      extra first cost {perUnit(ev.vsBare.extraInstalled, 2)}, saves{' '}
                      {perUnit(ev.vsBare.annualSaving, 2)} a year; payback{' '}
                      {ev.vsBare.paybackYears === null ? 'none' : `${sig(ev.vsBare.paybackYears, 2)} years`}
                      {';'}
                      net present value {perUnit(ev.vsBare.npv, 2)}
                    </dd>
                  </>
                ) : null}
                {ev.vsThinner ? (
                  <>
                    <dt className="text-ink-500">
                      {u.thickness(ev.atMm)} against {u.thickness(ev.vsThinner.againstMm)}, per {per}
                    </dt>
                    <dd>
                      extra {perUnit(ev.vsThinner.extraInstalled, 2)}, saves{' '}
                      {perUnit(ev.vsThinner.annualSaving, 2)} a year; payback{' '}
                      {ev.vsThinner.paybackYears === null
                        ? 'none'
                        : `${sig(ev.vsThinner.paybackYears, 2)} years`}
                      ; net present value {perUnit(ev.vsThinner.npv, 2)}
                    </dd>
                  </>
                ) : null}
              </dl>
              <table className="table-dense mt-3" aria-label="Optimum under other prices">
                <thead>
                  <tr>
                    <th>If</th>
                    <th className="text-right">Optimum</th>
                  </tr>
                </thead>
                <tbody>
                  {ev.sensitivity.map((x) => (
                    <tr key={x.label}>
                      <td>{x.label}</td>
                      <td className="num">{u.thickness(x.optimumMm)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <p className="mt-2 text-xs text-ink-600">
                Annualised cost = capital recovery × installed cost + levelised energy cost (cold lines priced
                as cooling), in {u.currency}. Rates and prices are the design basis&apos;s; set the
                project&apos;s own.
              </p>
            </section>
          ) : null}
          {tracing ? (
            <section className="panel p-4" aria-labelledby="tracing-heading" data-testid="tracing">
              <h2 id="tracing-heading" className="mb-2">
                Heat tracing ({TRACING_STANDARD})
              </h2>
              <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
                <dt className="text-ink-500">Traced because</dt>
                <dd>{TRACING_REASON_LABEL[tracing.reason]}</dd>
                <dt className="text-ink-500">Held at</dt>
                <dd>
                  {u.temp(tracing.maintainC)} in {u.temp(tracing.airC)} air, wind {wind(tracing.windMs)},{' '}
                  {u.thickness(tracing.thicknessMm)} {design ? '(chosen)' : '(recommended)'}
                </dd>
                <dt className="text-ink-500">Heat loss at the maintain temperature</dt>
                <dd>
                  {u.linearLoss(tracing.heatLossWPerM)}
                  {tracing.fittingsW ? ` + fittings ${u.power(tracing.fittingsW)}` : ''}
                </dd>
                <dt className="text-ink-500">Required tracer output</dt>
                <dd data-testid="tracing-required">
                  {u.tracerRating(tracing.requiredWPerM)} (safety factor {tracing.safetyFactor}
                  {tracing.fittingsW ? ', fittings spread over the run' : ''})
                  {tracing.lengthM !== null ? ` · ${u.electricPower(tracing.requiredW)} for the line` : ''}
                </dd>
                <dt className="text-ink-500">Tracer length</dt>
                <dd>
                  {tracing.tracerM === null
                    ? 'no pipe length yet'
                    : `${u.length(tracing.tracerM)} (run ${u.length(tracing.lengthM)} + fitting allowances, common practice)`}
                </dd>
              </dl>
              <p className="mt-2 text-xs text-ink-500">
                Required output = heat loss at the maintain temperature in the minimum design ambient and wind
                × safety factor, fittings as equivalent lengths. Tracer selection, sheath temperature, circuit
                lengths and hazardous-area limits follow the manufacturer and the local electrical code.
              </p>
            </section>
          ) : null}
          <section className="panel p-4">
            <h2 className="mb-2">At the recommendation (heat-loss conditions)</h2>
            <dl className="grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-500">Heat loss</dt>
              <dd>
                {u.heatFlowPerUnit(result.heatFlowPerUnit, surface)}
                {line.geometry === 'vessel' ? ' (mean over the outside area)' : ''} ·{' '}
                {u.power(result.totalHeatW)} for the line (bare {u.power(result.bareHeatW)})
              </dd>
              {fittingsW ? (
                <>
                  <dt className="text-ink-500">Straight run + fittings</dt>
                  <dd data-testid="fittings-heat">
                    {u.power(result.totalHeatW)} + {u.power(fittingsW)} ({line.elbows} elbows, {line.tees}{' '}
                    tees, {line.valves} valves, {line.flanges} flanges, supports as equivalent lengths
                    {basis.fittings.valvesBare ? '; valves and flanges bare' : ''}) ={' '}
                    {u.power((result.totalHeatW ?? 0) + fittingsW)}
                  </dd>
                </>
              ) : null}
              <dt className="text-ink-500">Surface temperature</dt>
              <dd>{u.temp(result.surfaceTempC)}</dd>
              {recNums?.personnelC !== undefined && limits.personnelLimitC !== null ? (
                <>
                  <dt className="text-ink-500">Personnel check</dt>
                  <dd data-testid="rec-personnel">
                    {u.temp(recNums.personnelC)} (limit {u.temp(limits.personnelLimitC)})
                  </dd>
                </>
              ) : null}
              {recNums?.condensationC !== undefined && limits.condensationNeedC !== null ? (
                <>
                  <dt className="text-ink-500">Condensation check</dt>
                  <dd>
                    {u.temp(recNums.condensationC)} (at least {u.temp(limits.condensationNeedC)})
                  </dd>
                </>
              ) : null}
              <dt className="text-ink-500">Annual energy / cost / CO₂</dt>
              <dd>
                {u.energy(result.annualMWh)} · {u.money(result.annualCost)} · {sig(result.co2Tonnes, 3)} t
                <span className="block text-xs text-ink-500" data-testid="co2-scope">
                  CO₂ {energy.scope} ({energy.source}): energy {cold ? 'gained' : 'lost'} ÷{' '}
                  {cold
                    ? `COP ${sig(1 / energy.boughtPerHeat, 3)}`
                    : `efficiency ${sig(100 / energy.boughtPerHeat, 3)} %`}{' '}
                  × {sig(energy.co2KgPerKWh, 3)} kg CO₂ per kWh bought.
                </span>
              </dd>
              {result.condensateKgPerH !== null ? (
                <>
                  <dt className="text-ink-500">Condensate</dt>
                  <dd>{u.mass(result.condensateKgPerH)}/h</dd>
                </>
              ) : null}
              {d && line.geometry === 'vessel' ? (
                <>
                  <dt className="text-ink-500">Vessel model</dt>
                  <dd>
                    Shell plus two flat heads; the coefficients and profile below are the shell&apos;s, the
                    heat loss covers all three.
                  </dd>
                </>
              ) : null}
              {d ? (
                <>
                  <dt className="text-ink-500">Surface coefficients</dt>
                  <dd>
                    convection {u.htc(d.convective)}, radiation {u.htc(d.radiative)}
                  </dd>
                  {d.overall.perLengthWPerMK !== undefined ? (
                    <>
                      <dt className="text-ink-500">U per {u.units.length === 'ft' ? 'foot' : 'metre'}</dt>
                      <dd>
                        {u.system === 'US'
                          ? `${sig((d.overall.perLengthWPerMK * 0.3048 * 3600) / 1055.05585262 / 1.8, 4)} Btu/(h·ft·°F)`
                          : `${sig(d.overall.perLengthWPerMK, 4)} W/(m·K)`}
                      </dd>
                    </>
                  ) : null}
                  <dt className="text-ink-500">U referred to the outer surface</dt>
                  <dd>
                    {u.htc(d.overall.outerSurface.valueWPerM2K)}
                    {d.overall.outerSurface.diameterM
                      ? ` on D = ${u.diameter(d.overall.outerSurface.diameterM * 1000)}`
                      : ''}
                  </dd>
                  <dt className="text-ink-500">U referred to the inner surface</dt>
                  <dd>
                    {u.htc(d.overall.innerSurface.valueWPerM2K)}
                    {d.overall.innerSurface.diameterM
                      ? ` on D = ${u.diameter(d.overall.innerSurface.diameterM * 1000)}`
                      : ''}
                  </dd>
                </>
              ) : null}
            </dl>
            {d ? (
              <table className="table-dense mt-3" aria-label="Temperature profile">
                <thead>
                  <tr>
                    <th>
                      {line.geometry === 'flat' ? 'Depth' : 'Radius'}, {u.units.diameter}
                    </th>
                    <th>Temperature, {u.units.temp}</th>
                  </tr>
                </thead>
                <tbody>
                  {d.profileC.map((p, i) => (
                    <tr key={i}>
                      <td className="num">{u.diameter(p.radiusOrDepthM * 1000).replace(/ (mm|in)$/, '')}</td>
                      <td className="num">{u.tempValue(p.tempC)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            ) : null}
          </section>
        </div>
      ) : null}
      {nums.length ? (
        <section className="panel mt-4 overflow-x-auto p-4" aria-labelledby="deciding-h">
          <h2 id="deciding-h" className="mb-1">
            Candidates and the numbers that decide
          </h2>
          <p className="mb-2 text-xs text-ink-600">
            Each surface temperature is solved under its criterion&apos;s own conditions: heat loss at{' '}
            {u.temp(basis.conditions.heatLoss[line.outdoor ? 'outdoor' : 'indoor'].airC)} air
            {limits.personnelLimitC !== null
              ? `, personnel at ${u.temp(basis.conditions.personnel[line.outdoor ? 'outdoor' : 'indoor'].airC)} still air and the ${u.temp(line.maxTempC ?? line.normalTempC)} maximum process temperature (touch limit ${u.temp(limits.personnelLimitC)})`
              : ''}
            {limits.condensationNeedC !== null
              ? `, condensation at ${u.temp(basis.conditions.condensation[line.outdoor ? 'outdoor' : 'indoor'].airC)} and ${basis.conditions.condensation[line.outdoor ? 'outdoor' : 'indoor'].relativeHumidityPct} % RH (${limits.dewBasis} ${u.temp(limits.dewPointC)} + ${u.tempDelta(basis.dewPointMarginK).replace(/^\+/, '')} margin = ${u.temp(limits.condensationNeedC)})`
              : ''}
            .
          </p>
          <table className="table-dense" aria-label="Candidates">
            <thead>
              <tr>
                <th>Thickness</th>
                <th className="text-right">Heat loss</th>
                <th className="text-right">Surface (heat loss)</th>
                {limits.personnelLimitC !== null ? (
                  <th className="text-right">Surface (personnel) · limit {u.temp(limits.personnelLimitC)}</th>
                ) : null}
                {limits.condensationNeedC !== null ? (
                  <th className="text-right">
                    Surface (condensation) · at least {u.temp(limits.condensationNeedC)}
                  </th>
                ) : null}
                <th className="text-right">Worst margin</th>
                <th></th>
              </tr>
            </thead>
            <tbody>
              {nums.map((c) => {
                const m = worstMargin(c, limits);
                return (
                  <tr key={c.mm} data-mm={c.mm} className={c.mm === atMm ? 'bg-mineral-50' : undefined}>
                    <td>
                      {u.thickness(c.mm)}
                      {c.mm === result?.recommendedMm ? ' ★' : ''}
                    </td>
                    <td className="num">{u.heatFlowPerUnit(c.heatFlow, surface)}</td>
                    <td className="num">{u.temp(c.heatLossC)}</td>
                    {limits.personnelLimitC !== null ? (
                      <td
                        className={`num ${c.personnelC !== null && c.personnelC > limits.personnelLimitC ? 'text-alarm-700' : ''}`}
                      >
                        {u.temp(c.personnelC)}
                      </td>
                    ) : null}
                    {limits.condensationNeedC !== null ? (
                      <td
                        className={`num ${c.condensationC !== null && c.condensationC < limits.condensationNeedC ? 'text-alarm-700' : ''}`}
                      >
                        {u.temp(c.condensationC)}
                      </td>
                    ) : null}
                    <td className="num">{m ? `${u.tempDelta(m.marginK)} ${m.criterion}` : '—'}</td>
                    <td className="text-xs">
                      {c.mm === design?.thicknessMm ? 'chosen' : ''}
                      {!c.ok ? ' layer over its service limit' : ''}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </section>
      ) : null}
      {partDecisions ? (
        <section className="panel mt-4 p-4" aria-labelledby="parts-h">
          <h2 id="parts-h" className="mb-1">
            Vessel parts decided per part
          </h2>
          <p className="mb-2 text-xs text-ink-600">
            The touch and condensation criteria are judged on each part&apos;s own surface (heads as flat
            discs); the other criteria as the whole vessel&apos;s. The recommendation above is the thickest
            part; a part may take its own thickness, or a guard where none meets the touch limit.
          </p>
          <table className="table-dense" aria-label="Vessel parts">
            <thead>
              <tr>
                <th>Part</th>
                <th>Thickness</th>
                <th>Governing</th>
                <th>Not met on this part</th>
                <th>Chosen</th>
              </tr>
            </thead>
            <tbody>
              {(['shell', 'top', 'bottom'] as const).map((p) => (
                <tr key={p} data-part={p}>
                  <td>{PART_LABEL[p]}</td>
                  <td>
                    {partDecisions[p].recommendedMm === null
                      ? 'none'
                      : u.thickness(partDecisions[p].recommendedMm)}
                  </td>
                  <td>{partDecisions[p].governing ? criterionLabel(partDecisions[p].governing!) : '—'}</td>
                  <td>
                    {partDecisions[p].unmet.length
                      ? `${partDecisions[p].unmet.map((x: string) => criterionLabel(x)).join(', ')}: guard or another system for this part`
                      : '—'}
                  </td>
                  <td>
                    {design
                      ? `${u.thickness(design.parts?.[p].thicknessMm ?? design.thicknessMm)}${design.parts?.[p].guarded ? ', guarded' : ''}`
                      : '—'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {canPick && !stale ? (
            <PartsPicker
              projectId={project.id}
              lineId={line.id}
              expectedVersion={design?.version ?? 0}
              options={cands.map((c) => ({
                mm: c.mm,
                label: u.thickness(c.mm),
                withinLimits: c.withinLimits,
              }))}
              recommended={{
                shell: partDecisions.shell.recommendedMm,
                top: partDecisions.top.recommendedMm,
                bottom: partDecisions.bottom.recommendedMm,
              }}
              current={
                design
                  ? {
                      shell: { thicknessMm: design.parts?.shell.thicknessMm ?? design.thicknessMm },
                      top: {
                        thicknessMm: design.parts?.top.thicknessMm ?? design.thicknessMm,
                        guarded: !!design.parts?.top.guarded,
                      },
                      bottom: {
                        thicknessMm: design.parts?.bottom.thicknessMm ?? design.thicknessMm,
                        guarded: !!design.parts?.bottom.guarded,
                      },
                    }
                  : null
              }
            />
          ) : null}
        </section>
      ) : null}
      <section className="panel mt-4 p-4" aria-labelledby="cui-h" data-testid="cui">
        <h2 id="cui-h" className="mb-1">
          Corrosion under insulation (screen)
        </h2>
        {cui.inWindow ? (
          <>
            <ul className="space-y-0.5 text-sm">
              {cui.findings.map((f) => (
                <li key={f.source}>{msg(describeCuiFinding(f))}</li>
              ))}
            </ul>
            {cui.coatingNote ? <p className="mt-1 text-sm">Specification: {cui.coatingNote}</p> : null}
            {cui.chlorideFreeInsulation ? (
              <p className="mt-1 text-sm">
                Specification: chloride-free insulation to ASTM C795 on this stainless line.
              </p>
            ) : null}
          </>
        ) : (
          <p className="text-sm">
            Outside the screened windows ({basis.cui.metals.map((m) => CUI_METAL_LABEL[m]).join(', ')}
            {basis.cui.screenIdle ? '; idle at ambient included' : ''}).
          </p>
        )}
        <p className="mt-1 text-xs text-ink-500">
          A screen by temperature only (windows as recalled from the documents named; verify against the
          edition your specification cites). It does not replace the owner&apos;s inspection programme.
        </p>
      </section>
      {layerMaterials.length ? (
        <section className="panel mt-4 overflow-x-auto p-4" aria-labelledby="lambda-h">
          <h2 id="lambda-h" className="mb-1">
            Conductivity: declared and design (EN ISO 23993)
          </h2>
          <p className="mb-2 text-xs text-ink-600">
            The thickness is chosen on the design curve: the declared curve times the project&apos;s ageing,
            moisture and installation factors (design basis). The declared values are kept as given by their
            source.
          </p>
          {layerMaterials.map((m) => {
            const F = designFactor(m.designFactors);
            const declared = m.conductivity.type === 'table' ? m.conductivity.points : null;
            return (
              <div key={m.id} className="mb-3" data-testid={`lambda-${m.id}`}>
                <p className="text-sm">
                  <strong>{m.name}</strong> — design factor {F.toFixed(3)}
                  {m.designFactors
                    ? ` (ageing ${m.designFactors.ageing}, moisture ${m.designFactors.moisture}, installation ${m.designFactors.installation}${m.designFactors.source ? `; ${m.designFactors.source}` : ''})`
                    : ' (no factors set: design = declared)'}
                  . Declared data: {m.source}
                </p>
                {declared ? (
                  <table className="table-dense" aria-label={`${m.name} conductivity`}>
                    <thead>
                      <tr>
                        <th>Mean temperature</th>
                        <th className="text-right">Declared</th>
                        <th className="text-right">Design</th>
                      </tr>
                    </thead>
                    <tbody>
                      {declared.map(([t, k]) => (
                        <tr key={t}>
                          <td>{u.temp(t)}</td>
                          <td className="num">{u.conductivity(k)}</td>
                          <td className="num">{u.conductivity(k * F)}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                ) : null}
              </div>
            );
          })}
        </section>
      ) : null}
      {can(role, 'comments.read') ? (
        <LineComments
          projectId={project.id}
          lineId={line.id}
          tag={line.tag}
          initial={await listComments({ projectId: project.id, lineId: line.id })}
          canWrite={can(role, 'comments.write')}
        />
      ) : null}
      <section className="panel mt-4 overflow-x-auto p-4">
        <h2 className="mb-2">Record</h2>
        {audit.length === 0 ? (
          <p className="text-sm text-ink-500">No decisions recorded yet.</p>
        ) : (
          <table className="table-dense [overflow-wrap:anywhere]" aria-label="Audit trail">
            <thead>
              <tr>
                <th>When (UTC)</th>
                <th>Who</th>
                <th>What</th>
                <th>Before</th>
                <th>After</th>
              </tr>
            </thead>
            <tbody>
              {audit.map((a) => (
                <tr key={a.id}>
                  <td>{a.at.toISOString().slice(0, 16).replace('T', ' ')}</td>
                  <td>{a.actorName}</td>
                  <td>{a.action}</td>
                  <td className="text-xs">
                    {a.before ? <Changes lines={describeChanges(null, a.before).map(msgKey)} /> : '—'}
                  </td>
                  <td className="text-xs">
                    {a.after ? (
                      <Changes lines={describeChanges(a.before ?? null, a.after).map(msgKey)} />
                    ) : (
                      '—'
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </>
  );
}
