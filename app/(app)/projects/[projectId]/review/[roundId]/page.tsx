import Link from 'next/link';
import { loadProject, orNotFound, projectPageTitle } from '@/lib/server/page';
import { can } from '@/lib/auth/permissions';
import { Denied } from '@/components/denied';
import { getRound, listRounds } from '@/lib/review/store';
import { FLAG_LABEL } from '@/lib/review/flags';
import { ReviewQueue } from './queue';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { formatterFor, localizeMessage } from '@/lib/format';

/** "Round 2 · Review round · BP-STM-24": each round's page has its own title. */
export async function generateMetadata({
  params,
}: {
  params: Promise<{ projectId: string; roundId: string }>;
}) {
  const { projectId, roundId } = await params;
  return {
    title: await projectPageTitle(projectId, 'Review round', 'review.read', async (id) => {
      const r = (await listRounds({ projectId: id })).find((x) => x.round.id === roundId);
      return r ? `Round ${r.round.number}` : null;
    }),
  };
}

export default async function RoundPage({
  params,
}: {
  params: Promise<{ projectId: string; roundId: string }>;
}) {
  const { projectId, roundId } = await params;
  const { project, role, allowed } = await loadProject(projectId, 'review.read');
  if (!allowed) return <Denied what="The safety review" />;
  const data = await orNotFound(getRound({ projectId: project.id, roundId }));
  const { round, items, stale } = data;
  const u = formatterFor((await getDesignBasis({ projectId: project.id })).basis);
  const carried = items.filter((i) => i.carriedFromRound !== null && i.status === 'decided').length;
  return (
    <>
      <p className="mb-1 text-sm">
        <Link href={`/projects/${project.id}/review`}>← Safety review</Link>
      </p>
      <div className="mb-3 flex items-baseline justify-between">
        <h1>Review round {round.number}</h1>
        <span className="text-sm">
          {round.status === 'open'
            ? 'Open'
            : `Signed off ${round.signedOffAt?.toISOString().slice(0, 16).replace('T', ' ')}`}{' '}
          · <Link href={`/projects/${project.id}/review/${round.id}/report`}>Printable report</Link>
        </span>
      </div>
      {carried ? (
        <p role="status" className="mb-3 text-sm" data-testid="carried-summary">
          {carried} decision{carried === 1 ? '' : 's'} carried over from earlier signed-off rounds: those
          lines&apos; inputs, chosen design and flags have not changed. {items.length - carried} to decide.
        </p>
      ) : null}
      {round.note ? <p className="mb-3 text-sm">Note from the engineer: {round.note}</p> : null}
      {stale && round.status === 'open' ? (
        <p role="status" className="caution mb-3">
          The calculation or the design basis changed since this round was requested; it cannot be signed off.
          Solve the lines and request a new round.
        </p>
      ) : null}
      <ReviewQueue
        projectId={project.id}
        roundId={round.id}
        flagLabels={FLAG_LABEL}
        canDispose={can(role, 'review.dispose')}
        open={round.status === 'open'}
        items={items.map((i) => ({
          id: i.id,
          tag: i.tag,
          area: i.area,
          flags: i.flags.map((f) => ({
            ...f,
            message: localizeMessage(f.message, u),
            conditions: f.conditions ? localizeMessage(f.conditions, u) : undefined,
          })),
          status: i.status,
          reopenReason: i.reopenReason,
          disposition: i.disposition,
          comment: i.comment,
          requiredMm: i.requiredMm,
          requiredText: i.requiredMm !== null ? u.thickness(i.requiredMm) : null,
          deciderName: i.deciderName,
          carriedFromRound: i.carriedFromRound,
        }))}
      />
    </>
  );
}
