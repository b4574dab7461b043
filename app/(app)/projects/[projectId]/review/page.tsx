import Link from 'next/link';
import { loadProject, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { ResultCautions } from '@/components/cautions';
import { countByType, currentFlags, listRounds } from '@/lib/review/store';
import { FLAG_LABEL, type FlagType } from '@/lib/review/flags';
import { listAreas } from '@/lib/lines/results-store';
import { RequestReviewForm } from './request-form';

export async function generateMetadata({ params }: { params: Promise<{ projectId: string }> }) {
  return { title: await projectPageTitle((await params).projectId, 'Safety review', 'review.read') };
}

export default async function ReviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'review.read');
  if (!allowed)
    return (
      <>
        <h1 className="mb-4">Safety review</h1>
        <Denied what="The safety review" />
      </>
    );
  const [flagged, rounds, areas] = await Promise.all([
    currentFlags({ projectId: project.id }),
    listRounds({ projectId: project.id }),
    listAreas({ projectId: project.id }),
  ]);
  const counts = countByType(flagged);
  const open = rounds.find((r) => r.round.status === 'open');
  return (
    <>
      <h1 className="mb-3">Safety review</h1>
      <div className="mb-4">
        <ResultCautions />
      </div>
      <p className="mb-4 max-w-3xl text-sm text-ink-600">
        Every surface that can burn someone or sweat is flagged from the chosen design, with the numbers
        behind it. Contact-burn thresholds depend on the surface material and the contact time (ASTM C1055;
        ISO 13732-1), which is why metal and non-metal finishes have their own touch limits in the design
        basis. Final decisions follow local codes and a qualified person.
      </p>
      <section className="panel mb-6 p-4" aria-label="Flagged now">
        <h2 className="mb-2">Flagged now: {flagged.length} lines</h2>
        <ul className="mb-3 flex flex-wrap gap-3 text-sm">
          {(Object.keys(FLAG_LABEL) as FlagType[]).map((t) => (
            <li key={t} className="badge bg-ink-100 text-ink-800">
              {FLAG_LABEL[t]}: {counts[t] ?? 0}
            </li>
          ))}
        </ul>
        {can(role, 'review.request') ? (
          <RequestReviewForm
            projectId={project.id}
            areas={areas}
            openRound={open ? { id: open.round.id, number: open.round.number } : null}
          />
        ) : open ? (
          <p className="text-sm">
            Round {open.round.number} is open.{' '}
            <Link href={`/projects/${project.id}/review/${open.round.id}`}>Open it</Link>.
          </p>
        ) : null}
      </section>
      <h2 className="mb-2">Rounds</h2>
      {rounds.length === 0 ? (
        <p className="text-sm text-ink-500">No review requested yet.</p>
      ) : (
        <table className="table-dense panel" aria-label="Review rounds">
          <thead>
            <tr>
              <th>Round</th>
              <th>Status</th>
              <th>Requested by</th>
              <th>Requested</th>
              <th>Signed off</th>
              <th></th>
            </tr>
          </thead>
          <tbody>
            {rounds.map(({ round, requester }) => (
              <tr key={round.id}>
                <td>
                  <Link href={`/projects/${project.id}/review/${round.id}`}>Round {round.number}</Link>
                </td>
                <td>
                  {round.status === 'open' ? (
                    <span className="badge bg-ochre-100 text-ochre-900">open</span>
                  ) : (
                    <span className="badge bg-mineral-100 text-mineral-900">signed off</span>
                  )}
                </td>
                <td>{requester}</td>
                <td>{round.requestedAt.toISOString().slice(0, 16).replace('T', ' ')}</td>
                <td>
                  {round.signedOffAt ? round.signedOffAt.toISOString().slice(0, 16).replace('T', ' ') : '—'}
                </td>
                <td>
                  <Link href={`/projects/${project.id}/review/${round.id}/report`}>Report</Link>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </>
  );
}
