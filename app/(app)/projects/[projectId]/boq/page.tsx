import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { getIssue, listIssues, materialPricesByName, previewBill, unchangedSince } from '@/lib/boq/store';
import { currentBillFactors, EDITABLE_FACTORS } from '@/lib/boq/factors';
import { FactorsForm } from './factors-form';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { fixed, formatterFor, localizeMessage } from '@/lib/format';
import { IssueButton } from './issue-button';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Bill of quantities', 'boq.read') };
}

export default async function BoqPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'boq.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Bill of quantities</h1>
        <Denied what="The bill of quantities" />
      </>
    );
  const issues = await listIssues({ projectId: project.id });
  const canIssue = can(role, 'boq.issue');
  const preview = canIssue ? await previewBill({ projectId: project.id }) : null;
  const sameAs = preview ? await unchangedSince({ projectId: project.id, preview }) : null;
  const factorRows = canIssue
    ? await currentBillFactors({ projectId: project.id }).then((f) =>
        EDITABLE_FACTORS.map((d) => ({
          key: d.key,
          label: d.label,
          unit: d.unit,
          value: f[d.key].value,
          source: f[d.key].source,
        })),
      )
    : [];
  const latest = issues[0] ? await getIssue({ projectId: project.id, number: issues[0].number }) : null;
  const { basis } = await getDesignBasis({ projectId: project.id });
  const u = formatterFor(basis);
  const us = u.system === 'US';
  const msg = (t: string) => localizeMessage(t, u);
  const prices = materialPricesByName(basis);
  const vol = (m3: number) =>
    us ? `${fixed(m3 / (0.3048 * 0.3048 * 0.3048), 2)} ft³` : `${fixed(m3, 3)} m³`;
  const materialCost = latest
    ? latest.quantities.materials.reduce((a, m) => a + (prices[m.material] ?? 0) * m.volumeM3, 0)
    : 0;
  return (
    <>
      <h1 className="mb-3">Bill of quantities</h1>
      {canIssue && preview ? (
        <section
          className="panel mb-6 flex flex-wrap items-center justify-between gap-4 p-4"
          aria-label="Next issue"
        >
          <p className="text-sm">
            Not yet issued: <strong>{preview.counted}</strong> lines decided and cleared,{' '}
            <strong>{preview.pending}</strong> pending (undecided, needing re-decision or awaiting safety
            sign-off — listed, not counted).
          </p>
          <IssueButton projectId={project.id} next={(issues[0]?.number ?? 0) + 1} unchangedSince={sameAs} />
          {preview.schedule.some((r) => r.geometry === 'vessel') ? (
            <table className="table-dense w-full" aria-label="Vessels in the next issue">
              <caption className="mb-1 text-left text-sm font-semibold">
                Vessels in the next issue: shell and each head at their own thickness
              </caption>
              <thead>
                <tr>
                  <th>Tag</th>
                  <th className="text-right">Area</th>
                  <th>Insulation by part</th>
                  <th>Status</th>
                </tr>
              </thead>
              <tbody>
                {preview.schedule
                  .filter((r) => r.geometry === 'vessel')
                  .map((r) => (
                    <tr key={r.tag} data-tag={r.tag}>
                      <td>{r.tag}</td>
                      <td className="num">{r.areaM2 === null ? '—' : u.area(r.areaM2)}</td>
                      <td>{msg(r.layers)}</td>
                      <td>{r.status}</td>
                    </tr>
                  ))}
              </tbody>
            </table>
          ) : null}
          <details className="mt-4">
            <summary className="cursor-pointer text-sm">Bill factors and their sources</summary>
            <p className="my-2 text-xs text-ink-600">
              Accessories (bands, tie wire, vapour retarder, mastic, joint sealant) and jacket laps are
              counted with these factors. Issued bills keep the factors they were issued with.
            </p>
            <FactorsForm projectId={project.id} rows={factorRows} />
          </details>
        </section>
      ) : null}
      <h2 className="mb-2">Issued revisions</h2>
      {issues.length === 0 ? (
        <p className="mb-6 text-sm text-ink-500">
          Nothing issued yet.{' '}
          {canIssue
            ? 'Issue the first revision when the decided lines are ready.'
            : 'The engineer issues the bill when the design is ready.'}
        </p>
      ) : (
        <table className="table-dense panel mb-6" aria-label="Issued revisions">
          <thead>
            <tr>
              <th>Issue</th>
              <th>Issued (UTC)</th>
              <th>Counted</th>
              <th>Pending</th>
              <th>Design basis</th>
              <th>Workbook</th>
            </tr>
          </thead>
          <tbody>
            {issues.map((i) => (
              <tr key={i.id}>
                <td className="num">{i.number}</td>
                <td>{i.issuedAt.toISOString().slice(0, 16).replace('T', ' ')}</td>
                <td className="num">{i.counted}</td>
                <td className="num">{i.pending}</td>
                <td className="num">rev. {i.basisRevision}</td>
                <td>
                  <a href={`/api/v1/projects/${project.id}/boq/${i.number}`} download>
                    Download issue {i.number} (.xlsx)
                  </a>
                  {i.documentSha256 ? (
                    <span className="ml-2 text-xs text-ink-500" title={`SHA-256 ${i.documentSha256}`}>
                      kept as issued · SHA-256 {i.documentSha256.slice(0, 12)}…
                    </span>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {latest ? (
        <section aria-label="Latest issue summary">
          <h2 className="mb-2">Issue {latest.issue.number}: summary</h2>
          {latest.quantities.tracing?.length ? (
            <p className="mb-2 text-sm" data-testid="bill-tracing">
              Heat tracing (sheet &ldquo;Heat tracing&rdquo; of the workbook):{' '}
              {latest.quantities.tracing.length} traced line
              {latest.quantities.tracing.length === 1 ? '' : 's'},{' '}
              {u.length(latest.quantities.tracing.reduce((a, t) => a + t.tracerM, 0))} of tracer,{' '}
              {u.electricPower(latest.quantities.tracing.reduce((a, t) => a + t.requiredW, 0))} electrical.
            </p>
          ) : null}
          <table className="table-dense panel mb-4" aria-label="Material summary">
            <thead>
              <tr>
                <th>Material</th>
                <th>Layer</th>
                <th>Size</th>
                <th>Thickness</th>
                <th className="text-right">Length</th>
                <th className="text-right">Volume</th>
                <th className="text-right">Material at design-basis price</th>
              </tr>
            </thead>
            <tbody>
              {latest.quantities.materials.map((m, i) => (
                <tr key={i}>
                  <td>{m.material}</td>
                  <td className="num">{m.layer}</td>
                  <td>{m.size}</td>
                  <td className="num">{u.thickness(m.thicknessMm)}</td>
                  <td className="num">{u.length(m.lengthM)}</td>
                  <td className="num">{vol(m.volumeM3)}</td>
                  <td className="num">{u.money((prices[m.material] ?? 0) * m.volumeM3)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mb-4 text-sm" data-testid="bill-material-cost">
            Material at the design basis&apos;s prices (waste included; labour, jacketing and accessories not
            included): <strong>{u.money(materialCost)}</strong>
          </p>
          {latest.quantities.surfaces.length ? (
            <table className="table-dense panel mb-4" aria-label="Vessels and flat surfaces">
              <thead>
                <tr>
                  <th>Part</th>
                  <th>Material</th>
                  <th>Layer</th>
                  <th>Thickness</th>
                  <th className="text-right">Area</th>
                  <th className="text-right">Volume</th>
                </tr>
              </thead>
              <tbody>
                {latest.quantities.surfaces.map((r, i) => (
                  <tr key={i}>
                    <td>{r.kind}</td>
                    <td>{r.material}</td>
                    <td className="num">{r.layer}</td>
                    <td className="num">{u.thickness(r.thicknessMm)}</td>
                    <td className="num">{u.area(r.areaM2)}</td>
                    <td className="num">{vol(r.volumeM3)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : null}
          <div className="grid gap-4 md:grid-cols-2">
            <table className="table-dense panel" aria-label="Jacketing">
              <thead>
                <tr>
                  <th>Jacket</th>
                  <th>OD over insulation</th>
                  <th className="text-right">Area</th>
                </tr>
              </thead>
              <tbody>
                {latest.quantities.jackets.map((j, i) => (
                  <tr key={i}>
                    <td>{j.jacket}</td>
                    <td>
                      {j.outsideDiameterMm === null ? 'flat / vessel' : u.diameter(j.outsideDiameterMm)}
                    </td>
                    <td className="num">{u.area(j.areaM2)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <div className="panel p-3">
              <h3 className="mb-1 text-sm font-semibold">
                Change from issue {latest.issue.number - 1 || '—'}
              </h3>
              {latest.issue.number === 1 ? (
                <p className="text-sm text-ink-500">First issue.</p>
              ) : latest.delta.length === 0 ? (
                <p className="text-sm">No change in quantities.</p>
              ) : (
                <ul className="max-h-64 overflow-auto text-sm" aria-label="Quantity changes">
                  {latest.delta.map((d, i) => (
                    <li key={i}>
                      {d.key} — {d.quantity}: {fixed(d.before, 2)} → {fixed(d.after, 2)} (
                      {d.change > 0 ? '+' : ''}
                      {fixed(d.change, 2)})
                    </li>
                  ))}
                </ul>
              )}
            </div>
          </div>
        </section>
      ) : null}
    </>
  );
}
