/**
 * Design picks: the thickness chosen for a line, with its reason, below-criterion marks and audit entry.
 * Bulk acceptance of recommendations lives in `./bulk-accept`.
 */
import { and, eq } from 'drizzle-orm';
import { db } from '@/db/client';
import { lineDesigns, lineResults, lines } from '@/db/schema';
import { actorName, writeAudit } from '@/lib/audit';
import { AppError } from '@/lib/errors';
import { HARD_CRITERIA } from '@/lib/thermal';
import { candidateAt, decodeCandidate } from './candidate-row';
const HARD: ReadonlySet<string> = HARD_CRITERIA;

/**
 * Saves the chosen thickness for a line. `expectedVersion` is the design version the user saw
 * (0 when there was none); a different stored version means someone else saved first.
 */
export async function pickDesign(o: {
  projectId: string;
  lineId: string;
  userId: string;
  thicknessMm: number;
  reason?: string;
  expectedVersion: number;
  via?: string;
}) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ line: lines, result: lineResults })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .where(and(eq(lines.id, o.lineId), eq(lines.projectId, o.projectId)))
      .for('update', { of: lines });
    if (!row) throw new AppError('not_found');
    if (!row.result) throw new AppError('conflict', 'Solve the line before choosing its thickness.');
    const cand = candidateAt(row.result.candidates, o.thicknessMm);
    if (!cand)
      throw new AppError(
        'invalid',
        `${o.thicknessMm} mm is not a candidate of this line's material system.`,
        { thicknessMm: ['Choose one of the candidate thicknesses.'] },
      );
    const below = row.result.outcomes
      .filter((x) => HARD.has(x.id) && x.requiredMm !== null && o.thicknessMm < x.requiredMm!)
      .map((x) => x.id);
    const manual = o.thicknessMm !== row.result.recommendedMm;
    if (below.length && !o.reason?.trim())
      throw new AppError(
        'invalid',
        `This thickness is below what ${below.join(' and ')} requires; give a reason to keep it.`,
        { reason: ['A reason is required for a pick below a hard criterion.'] },
      );
    if (manual && !o.reason?.trim())
      throw new AppError('invalid', 'Give a reason for choosing another thickness than the recommendation.', {
        reason: ['A reason is required for a manual pick.'],
      });
    const [existing] = await tx
      .select()
      .from(lineDesigns)
      .where(eq(lineDesigns.lineId, o.lineId))
      .for('update');
    if ((existing?.version ?? 0) !== o.expectedVersion)
      throw new AppError(
        'conflict',
        "Someone else changed this line's design while you were looking at it. Reload to see their choice, then decide again.",
      );
    const values = {
      lineId: o.lineId,
      projectId: o.projectId,
      thicknessMm: o.thicknessMm,
      layers: decodeCandidate(cand).layers,
      source: manual ? ('manual' as const) : ('recommended' as const),
      reason: o.reason?.trim() || null,
      belowCriterion: below.length ? below.join(',') : null,
      needsRedecision: false,
      redecisionReason: null,
      decidedBy: o.userId,
      decidedAt: new Date(),
      version: (existing?.version ?? row.line.lastDesignVersion) + 1,
    };
    if (existing) await tx.update(lineDesigns).set(values).where(eq(lineDesigns.lineId, o.lineId));
    else await tx.insert(lineDesigns).values(values);
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        lineId: o.lineId,
        tag: row.line.tag,
        actorId: o.userId,
        actorName: await actorName(o.userId),
        action: 'design pick',
        before: existing
          ? { thicknessMm: existing.thicknessMm, source: existing.source, reason: existing.reason }
          : null,
        after: {
          thicknessMm: values.thicknessMm,
          source: values.source,
          reason: values.reason,
          belowCriterion: values.belowCriterion,
          ...(o.via ? { via: o.via } : {}),
        },
      },
    ]);
    return { version: values.version, source: values.source, belowCriterion: values.belowCriterion };
  });
}
