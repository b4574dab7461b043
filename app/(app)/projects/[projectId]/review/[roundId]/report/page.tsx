import { loadProject, orNotFound, projectPageTitle } from '@/lib/server/page';
import { Denied } from '@/components/denied';
import { getRound, listRounds } from '@/lib/review/store';
import { DISPOSITION_LABEL, type Disposition } from '@/lib/review/store';
import { FLAG_LABEL } from '@/lib/review/flags';
import { PrintButton } from './print-button';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { formatterFor, localizeMessage } from '@/lib/format';

/** "Round 2 · Review report · BP-STM-24": each round's page has its own title. */
export async function generateMetadata({
  params,
}: {
  params: Promise<{ projectId: string; roundId: string }>;
}) {
  const { projectId, roundId } = await params;
  return {
    title: await projectPageTitle(projectId, 'Review report', 'review.read', async (id) => {
      const r = (await listRounds({ projectId: id })).find((x) => x.round.id === roundId);
      return r ? `Round ${r.round.number}` : null;
    }),
  };
}

export default async function ReportPage({
  params,
}: {
  params: Promise<{ projectId: string; roundId: string }>;
}) {
  const { projectId, roundId } = await params;
  const { project, organizationName, allowed } = await loadProject(projectId, 'review.read');
  if (!allowed) return <Denied what="The safety review" />;
  const data = await orNotFound(getRound({ projectId: project.id, roundId }));
  const { round, items } = data;
  const u = formatterFor((await getDesignBasis({ projectId: project.id })).basis);
  const snap = round.snapshot;
  // A signed-off round prints exactly what was signed; an open one prints the current state.
  const rows = snap
    ? snap.items
    : items.map((i) => ({
        tag: i.tag,
        area: i.area,
        flags: i.flags,
        disposition: i.disposition as Disposition | null,
        comment: i.comment,
        requiredMm: i.requiredMm,
        decidedBy: i.deciderName,
      }));
  return (
    <article className="print-report mx-auto max-w-5xl bg-white p-8 text-sm">
      <div className="no-print mb-4 flex justify-end">
        <PrintButton />
      </div>
      <header className="mb-4 border-b border-ink-300 pb-3">
        <h1 className="text-lg">
          Surface safety review — {project.code} {project.name}
        </h1>
        <p>
          {organizationName} · {project.site} · Round {round.number} · requested{' '}
          {round.requestedAt.toISOString().slice(0, 10)} · calculation {round.calcVersion}, design basis
          revision {round.basisRevision}
        </p>
        <p data-testid="signoff">
          {round.status === 'signed-off'
            ? `Signed off by ${snap?.signedBy} on ${round.signedOffAt?.toISOString().slice(0, 16).replace('T', ' ')} UTC`
            : 'NOT SIGNED OFF — draft'}
        </p>
      </header>
      <table className="table-dense" aria-label="Flagged surfaces">
        <thead>
          <tr>
            <th>Tag</th>
            <th>Area</th>
            <th>Flag</th>
            <th>Value</th>
            <th>Limit</th>
            <th>Conditions</th>
            <th>Disposition</th>
            <th>Comment</th>
          </tr>
        </thead>
        <tbody>
          {rows.flatMap((r) =>
            r.flags.map((f, k) => (
              <tr key={`${r.tag}-${k}`} data-tag={r.tag}>
                <td className="font-mono">{k === 0 ? r.tag : ''}</td>
                <td>{k === 0 ? r.area : ''}</td>
                <td>{FLAG_LABEL[f.type]}</td>
                <td className="num">{u.temp(f.valueC)}</td>
                <td className="num">{u.temp(f.limitC)}</td>
                <td className="text-xs">{localizeMessage(f.conditions ?? f.message, u)}</td>
                <td>
                  {k === 0
                    ? r.disposition
                      ? `${DISPOSITION_LABEL[r.disposition]}${r.requiredMm !== null ? ` — ${u.thickness(r.requiredMm)}` : ''}`
                      : 'undecided'
                    : ''}
                </td>
                <td className="text-xs">
                  {k === 0 ? `${r.comment ?? ''}${r.decidedBy ? ` (${r.decidedBy})` : ''}` : ''}
                </td>
              </tr>
            )),
          )}
        </tbody>
      </table>
      <footer className="mt-6 space-y-1 border-t border-ink-300 pt-3 text-xs text-ink-700">
        <p>
          Results are estimates by a published method (ASTM C680 / ISO 12241 with Churchill–Chu and
          Churchill–Bernstein surface films); material data are typical values to verify with the
          manufacturer.
        </p>
        <p>
          Contact-burn thresholds depend on the surface material and the contact time (ASTM C1055; ISO
          13732-1); the touch limits used are project settings, not values those standards mandate.
        </p>
        <p>Final decisions follow local codes and a qualified person.</p>
      </footer>
    </article>
  );
}
