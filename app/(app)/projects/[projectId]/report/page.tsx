import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { listReports } from '@/lib/documents/report-store';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { formatterFor } from '@/lib/format';
import { IssueReportForm } from './issue-form';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Design report', 'report.read') };
}

export default async function ReportPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'report.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Design report</h1>
        <Denied what="The design report" />
      </>
    );
  const [reports, { basis }] = await Promise.all([
    listReports({ projectId: project.id }),
    getDesignBasis({ projectId: project.id }),
  ]);
  const u = formatterFor(basis);
  const base = `/api/v1/projects/${project.id}/reports`;
  return (
    <>
      <h1 className="mb-1">Design report</h1>
      <p className="mb-4 text-sm text-ink-600">
        Cover, design basis with its sources, method statement, summaries by area and by governing criterion,
        the heat-loss budget against its allocation, review status and sign-offs, the lines below a hard
        criterion, and the cautions. Issued revisions are kept exactly as issued.
      </p>
      {can(role, 'report.issue') ? (
        <section className="panel mb-6 p-4" aria-label="Issue the report">
          <p className="mb-3 text-sm">
            Check the draft first:{' '}
            <a href={`${base}/draft`} download>
              Download the draft (PDF)
            </a>
            . Issuing stores the next numbered revision as it stands now.
          </p>
          <IssueReportForm projectId={project.id} next={(reports[0]?.number ?? 0) + 1} />
        </section>
      ) : can(role, 'lines.read') ? (
        <p className="mb-4 text-sm">
          <a href={`${base}/draft`} download>
            Download a draft of the report as it stands (PDF)
          </a>
        </p>
      ) : null}
      <h2 className="mb-2">Issued revisions</h2>
      {reports.length === 0 ? (
        <p className="text-sm text-ink-500">Nothing issued yet.</p>
      ) : (
        <table className="table-dense panel" aria-label="Issued report revisions">
          <thead>
            <tr>
              <th>Rev.</th>
              <th>Issued (UTC)</th>
              <th>By</th>
              <th>Note</th>
              <th className="text-right">Lines</th>
              <th className="text-right">Designed heat loss</th>
              <th>Design basis</th>
              <th>PDF</th>
            </tr>
          </thead>
          <tbody>
            {reports.map((r) => {
              const s = r.summary as { lines: number; designedKW: number };
              return (
                <tr key={r.number}>
                  <td className="num">{r.number}</td>
                  <td>{r.issuedAt.toISOString().slice(0, 16).replace('T', ' ')}</td>
                  <td>{r.issuedBy}</td>
                  <td>{r.note || '—'}</td>
                  <td className="num">{s.lines}</td>
                  <td className="num">{u.power(s.designedKW * 1000)}</td>
                  <td className="num">rev. {r.basisRevision}</td>
                  <td>
                    <a href={`${base}/${r.number}`} download>
                      Download revision {r.number} (PDF)
                    </a>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
    </>
  );
}
