import { loadProject } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { ResultCautions } from '@/components/cautions';
import { getDesignBasis, listAreas, listRevisions } from '@/lib/lines/store';
import { ImportPanel } from './import-panel';
import { LineTable } from './line-table';
import { RecentJobs } from './job-progress';

export const metadata = { title: 'Line list' };

export default async function LinesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'lines.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Line list</h1>
        <Denied what="The line list" />
      </>
    );
  const [areas, revisions, basis] = await Promise.all([
    listAreas({ projectId: project.id }),
    listRevisions({ projectId: project.id }),
    getDesignBasis({ projectId: project.id }),
  ]);
  const canEdit = can(role, 'lines.edit');
  return (
    <>
      <div className="mb-3 flex items-baseline justify-between">
        <h1>Line list</h1>
        <span className="text-xs text-ink-500">
          {revisions[0]
            ? `Revision ${revisions[0].number} · ${revisions[0].fileName} · ${revisions[0].createdAt.toISOString().slice(0, 10)}`
            : 'No revision imported yet'}{' '}
          · design basis revision {basis.revision}
        </span>
      </div>
      <div className="mb-4">
        <ResultCautions />
      </div>
      {canEdit ? <ImportPanel projectId={project.id} /> : null}
      <RecentJobs projectId={project.id} />
      <LineTable
        projectId={project.id}
        areas={areas}
        canPick={can(role, 'design.pick')}
        canSolve={canEdit}
        unitSystem={basis.basis.unitSystem}
        format={{
          unitSystem: basis.basis.unitSystem,
          thicknessSeries: basis.basis.thicknessSeries,
          currency: basis.basis.currency,
        }}
      />
      {revisions.length ? (
        <section className="mt-6">
          <h2 className="mb-2">Revisions</h2>
          <table className="table-dense panel" aria-label="Revisions">
            <thead>
              <tr>
                <th>No.</th>
                <th>File</th>
                <th>Sheet</th>
                <th>Lines</th>
                <th>Added</th>
                <th>Changed</th>
                <th>Removed</th>
                <th>Date</th>
              </tr>
            </thead>
            <tbody>
              {revisions.map((r) => {
                const d = r.diff as { added: string[]; changed: unknown[]; removed: string[] };
                return (
                  <tr key={r.id}>
                    <td className="num">{r.number}</td>
                    <td>{r.fileName}</td>
                    <td>{r.sheetName}</td>
                    <td className="num">{r.lineCount}</td>
                    <td className="num">{d.added.length}</td>
                    <td className="num">{d.changed.length}</td>
                    <td className="num">{d.removed.length}</td>
                    <td>{r.createdAt.toISOString().slice(0, 16).replace('T', ' ')}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </section>
      ) : null}
    </>
  );
}
