import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { ResultCautions } from '@/components/cautions';
import { Disclosure } from '@/components/disclosure';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { listRevisions } from '@/lib/lines/import-store';
import { listAreas } from '@/lib/lines/results-store';
import { lineTablePage } from '@/lib/lines/picker';
import { getLineTableView } from '@/db/queries/preferences';
import { ImportPanel } from './import-panel';
import { LineTable } from './line-table';
import { RecentJobs } from './job-progress';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Line list', 'lines.read') };
}

export default async function LinesPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed, user } = await loadProject(projectId, 'lines.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Line list</h1>
        <Denied what="The line list" />
      </>
    );
  // The first page of rows comes with the page (the same query as GET …/lines answers), so the table
  // is visible before the scripts run; the table takes over from there.
  const firstPageAt = Date.now();
  const [areas, revisions, basis, view, firstPage] = await Promise.all([
    listAreas({ projectId: project.id }),
    listRevisions({ projectId: project.id }),
    getDesignBasis({ projectId: project.id }),
    getLineTableView({ userId: user.id }),
    lineTablePage({ projectId: project.id, page: 0, size: 100, sort: 'tag', dir: 'asc' }),
  ]);
  const canEdit = can(role, 'lines.edit');
  return (
    <>
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-x-4">
        <h1>Line list</h1>
        <span className="text-xs text-ink-600">
          {revisions[0]
            ? `Revision ${revisions[0].number} · ${revisions[0].fileName} · ${revisions[0].createdAt.toISOString().slice(0, 10)}`
            : 'No revision imported yet'}{' '}
          · design basis revision {basis.revision}
        </span>
      </div>
      <div className="mb-3">
        <ResultCautions compact />
      </div>
      {/* Once a revision exists the import is an occasional step: folded away so the table starts higher. */}
      {canEdit ? (
        <div className="mb-3 flex flex-wrap">
          <Disclosure label="Import a new revision" initiallyOpen={!revisions.length}>
            <ImportPanel projectId={project.id} />
          </Disclosure>
        </div>
      ) : null}
      <RecentJobs projectId={project.id} renderedAt={new Date().toISOString()} />
      <LineTable
        projectId={project.id}
        areas={areas}
        canPick={can(role, 'design.pick')}
        canSolve={canEdit}
        unitSystem={basis.basis.unitSystem}
        firstPage={firstPage}
        firstPageAt={firstPageAt}
        initialView={view}
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
                <th>Original file</th>
              </tr>
            </thead>
            <tbody>
              {revisions.map((r) => {
                const d = r.diff;
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
                    <td>
                      {r.originalKey ? (
                        <a
                          href={`/api/v1/projects/${project.id}/lines/revisions/${r.number}/original`}
                          download
                          aria-label={`Download the original file of revision ${r.number}`}
                        >
                          Download ({Math.max(1, Math.round((r.originalBytes ?? 0) / 1024))} KB)
                        </a>
                      ) : (
                        <span className="text-ink-500">not kept (imported before originals were stored)</span>
                      )}
                    </td>
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
