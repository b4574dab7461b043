import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { ResultCautions } from '@/components/cautions';
import { dashboard } from '@/lib/budget/store';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { listAreas } from '@/lib/lines/results-store';
import { formatterFor, localizeMessage } from '@/lib/format';
import { TRACING_STANDARD } from '@/lib/lines/tracing';
import { AreaChart, BudgetForm, TotalsTable, WhatIfPanel } from './client';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Heat-loss budget', 'budget.read') };
}

export default async function BudgetPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'budget.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Heat-loss budget</h1>
        <Denied what="The heat-loss budget" />
      </>
    );
  const [d, areas, { basis }] = await Promise.all([
    dashboard({ projectId: project.id }),
    listAreas({ projectId: project.id }),
    getDesignBasis({ projectId: project.id }),
  ]);
  const format = {
    unitSystem: basis.unitSystem,
    thicknessSeries: basis.thicknessSeries,
    currency: basis.currency,
  };
  const u = formatterFor(basis);
  const kw = (v: number | null) => (v === null ? '—' : u.power(v * 1000));
  return (
    <>
      <h1 className="mb-3">Heat-loss budget</h1>
      <div className="mb-4">
        <ResultCautions />
      </div>
      {d.warnings.length ? (
        <div
          role="alert"
          className="mb-4 rounded border border-alarm-500 bg-alarm-50 p-3 text-sm text-alarm-700"
        >
          <strong>Over budget</strong>
          <ul className="mt-1 list-disc pl-5">
            {d.warnings.map((w, i) => (
              <li key={i}>{localizeMessage(w, u)}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {d.lineCount === 0 ? (
        <p className="mb-4 text-sm text-ink-500">
          No solved lines yet: import and solve the line list first.
        </p>
      ) : null}
      {d.incompleteCount ? (
        <p className="caution mb-4 text-sm">
          {d.incompleteCount} line{d.incompleteCount === 1 ? ' has' : 's have'} no length yet and{' '}
          {d.incompleteCount === 1 ? 'is' : 'are'} left out of these totals until a line-list revision gives{' '}
          {d.incompleteCount === 1 ? 'it' : 'them'}.
        </p>
      ) : null}
      <div className="grid gap-4 lg:grid-cols-2">
        <section className="panel p-4">
          <h2 className="mb-2">Plant totals</h2>
          <TotalsTable bare={d.bare} designed={d.designed} savings={d.savings} format={format} />
          <p className="mt-2 text-sm" data-testid="fittings-split">
            Designed: {kw(d.straightKW)} straight runs + {kw(d.fittingsKW)} fittings and supports ={' '}
            {kw(d.designed.kW)} (bare fittings {kw(d.bareFittingsKW)} of the bare total).
          </p>
          <p className="mt-2 text-xs text-ink-500">
            At {d.hours} h/yr and {u.money(d.price, 3)} per kWh of fuel; cold lines gain {kw(d.coldGainKW)}{' '}
            (refrigeration load, not in these totals).
            {d.budget
              ? ` Budget: ${kw(d.budget.totalKW)}, ${u.energy(d.budget.totalMWhPerYear)}/yr.`
              : ' No budget set yet.'}
          </p>
        </section>
        <section className="panel p-4">
          <h2 className="mb-2">By area</h2>
          <AreaChart areas={d.areas} format={format} />
          <table className="table-dense" aria-label="Areas">
            <thead>
              <tr>
                <th>Area</th>
                <th className="text-right">Bare</th>
                <th className="text-right">Designed</th>
                <th className="text-right">Allocation</th>
                <th></th>
              </tr>
            </thead>
            <tbody>
              {d.areas.map((a) => (
                <tr key={a.area} data-area={a.area}>
                  <td>{a.area}</td>
                  <td className="num">{kw(a.bareKW)}</td>
                  <td className="num">{kw(a.designedKW)}</td>
                  <td className="num">{kw(a.allocationKW)}</td>
                  <td>
                    {a.over ? (
                      <span className="badge bg-alarm-100 text-alarm-700">over allocation</span>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      </div>
      <section className="panel mt-4 p-4" aria-labelledby="tracing-heading">
        <h2 id="tracing-heading" className="mb-2">
          Heat tracing
        </h2>
        {d.tracing.lines === 0 ? (
          <p className="text-sm text-ink-500">
            No traced lines: mark lines in the line list (a heat-tracing column) or trace freeze-protected or
            process-control lines on the design basis.
          </p>
        ) : (
          <>
            <p className="mb-2 text-sm" data-testid="tracing-total">
              {d.tracing.lines} traced line{d.tracing.lines === 1 ? '' : 's'}:{' '}
              {u.electricPower(d.tracing.kW * 1000)} electrical, {u.length(d.tracing.tracerM)} of tracer (
              {TRACING_STANDARD}, safety factor {basis.heatTracing.safetyFactor} and fittings included).
            </p>
            <table className="table-dense" aria-label="Heat tracing by area">
              <thead>
                <tr>
                  <th>Area</th>
                  <th className="num">Traced lines</th>
                  <th className="num">Tracer length</th>
                  <th className="num">Tracing duty (kW electrical)</th>
                </tr>
              </thead>
              <tbody>
                {d.tracing.areas.map((a) => (
                  <tr key={a.area} data-tracing-area={a.area}>
                    <td>{a.area}</td>
                    <td className="num">{a.lines}</td>
                    <td className="num">{u.length(a.tracerM)}</td>
                    <td className="num">{u.electricPower(a.kW * 1000)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-2 text-xs text-ink-500">
              Duty = heat loss at the maintain temperature in the minimum design ambient and wind × safety
              factor, fittings as equivalent lengths. For budgeting: tracer selection, circuit lengths, sheath
              temperatures and hazardous-area limits follow the tracer manufacturer and the local electrical
              code.
            </p>
          </>
        )}
      </section>
      <div className="mt-4 grid gap-4 lg:grid-cols-2">
        <section className="panel p-4">
          <h2 className="mb-2">Top 20 lines by heat loss</h2>
          <table className="table-dense" aria-label="Top lines">
            <thead>
              <tr>
                <th>Tag</th>
                <th>Area</th>
                <th className="text-right">Thickness</th>
                <th className="text-right">Designed</th>
                <th className="text-right">Bare</th>
              </tr>
            </thead>
            <tbody>
              {d.top.map((t) => (
                <tr key={t.tag}>
                  <td className="font-mono">{t.tag}</td>
                  <td>{t.area}</td>
                  <td className="num">{u.thickness(t.thicknessMm)}</td>
                  <td className="num">{kw(t.designedKW)}</td>
                  <td className="num">{kw(t.bareKW)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
        <div className="space-y-4">
          <WhatIfPanel projectId={project.id} price={d.price} hours={d.hours} format={format} />
          {can(role, 'budget.edit') ? (
            <BudgetForm projectId={project.id} areas={areas} budget={d.budget} />
          ) : null}
        </div>
      </div>
    </>
  );
}
