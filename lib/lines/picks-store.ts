/**
 * Design picks: the thickness chosen for a line, with its reason, below-criterion marks and audit entry.
 * A vessel may be picked part by part (`pickVesselParts`; the rules in `./vessel-parts`). Bulk acceptance
 * of recommendations lives in `./bulk-accept`.
 */
import { and, eq } from 'drizzle-orm';
import { db, type Tx } from '@/db/client';
import { lineDesigns, lineResults, lines } from '@/db/schema';
import { actorName, writeAudit } from '@/lib/audit';
import { AppError } from '@/lib/errors';
import { HARD_CRITERIA, vesselPartDecisions } from '@/lib/thermal';
import { candidateAt, decodeCandidate } from './candidate-row';
import {
  describeDesign,
  partsBelow,
  partsDiffer,
  VESSEL_PART_IDS,
  VESSEL_PART_LABEL,
  type DesignParts,
  type PartPicks,
} from './vessel-parts';

type LineDesign = typeof lineDesigns.$inferSelect;
type NewLineDesign = typeof lineDesigns.$inferInsert;

const HARD: ReadonlySet<string> = HARD_CRITERIA;

/**
 * The line's stored design, locked for this transaction, when its version is the one the user saw
 * (`expectedVersion`, 0 when there was none); otherwise someone else saved first and the pick is refused.
 */
async function lockedDesign(tx: Tx, lineId: string, expectedVersion: number) {
  const [existing] = await tx.select().from(lineDesigns).where(eq(lineDesigns.lineId, lineId)).for('update');
  if ((existing?.version ?? 0) !== expectedVersion)
    throw new AppError(
      'conflict',
      "Someone else changed this line's design while you were looking at it. Reload to see their choice, then decide again.",
    );
  return existing;
}

/** Writes the design over the locked one, or as the line's first. */
async function storeDesign(tx: Tx, existing: LineDesign | undefined, values: NewLineDesign) {
  if (existing) await tx.update(lineDesigns).set(values).where(eq(lineDesigns.lineId, values.lineId));
  else await tx.insert(lineDesigns).values(values);
}

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
    const existing = await lockedDesign(tx, o.lineId, o.expectedVersion);
    const values = {
      lineId: o.lineId,
      projectId: o.projectId,
      thicknessMm: o.thicknessMm,
      layers: decodeCandidate(cand).layers,
      source: manual ? ('manual' as const) : ('recommended' as const),
      reason: o.reason?.trim() || null,
      belowCriterion: below.length ? below.join(',') : null,
      // One thickness all round: a vessel's earlier part-by-part pick is replaced.
      parts: null,
      needsRedecision: false,
      redecisionReason: null,
      decidedBy: o.userId,
      decidedAt: new Date(),
      version: (existing?.version ?? row.line.lastDesignVersion) + 1,
    };
    await storeDesign(tx, existing, values);
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

/**
 * Saves a vessel's pick part by part: the shell and each head their own thickness, or a head guarded
 * instead of insulated to the touch limit. Version-checked and audited as `pickDesign`; a reason is
 * needed for a guard, a part below its hard criteria, or anything but the engine's per-part decisions.
 * Every part at one thickness and no guard is stored as a plain one-thickness design.
 */
export async function pickVesselParts(o: {
  projectId: string;
  lineId: string;
  userId: string;
  parts: PartPicks;
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
    if (row.line.geometry !== 'vessel')
      throw new AppError('invalid', 'Only a vessel has a shell and heads to choose apart.');
    if (!row.result) throw new AppError('conflict', 'Solve the line before choosing its thickness.');
    const result = row.result;
    if (o.parts.shell.guarded)
      throw new AppError('invalid', 'Only a head can be guarded; insulate the shell.', {
        'parts.shell.guarded': ['Only a head can be guarded.'],
      });
    const layersOf = {} as Record<
      (typeof VESSEL_PART_IDS)[number],
      { materialId: string; thicknessMm: number }[]
    >;
    for (const p of VESSEL_PART_IDS) {
      const cand = candidateAt(result.candidates, o.parts[p].thicknessMm);
      if (!cand)
        throw new AppError(
          'invalid',
          `${o.parts[p].thicknessMm} mm for the ${VESSEL_PART_LABEL[p]} is not a candidate of this line's material system.`,
          { [`parts.${p}.thicknessMm`]: ['Choose one of the candidate thicknesses.'] },
        );
      layersOf[p] = decodeCandidate(cand).layers;
    }
    const reason = o.reason?.trim() || null;
    const below = partsBelow(result.outcomes, o.parts);
    const belowIds = [...new Set(below.flatMap((b) => b.criteria))];
    const split = partsDiffer(o.parts);
    // "As recommended": one thickness at the recommendation, or each part at the engine's own per-part decision.
    const perPart = vesselPartDecisions(
      result.outcomes,
      result.candidates.map((r) => {
        const c = decodeCandidate(r);
        return { totalMm: c.mm, serviceLimitOk: c.withinLimits };
      }),
    );
    const guarded = VESSEL_PART_IDS.filter((p) => o.parts[p].guarded);
    const recommended =
      !guarded.length &&
      (split
        ? VESSEL_PART_IDS.every((p) => perPart[p].recommendedMm === o.parts[p].thicknessMm)
        : o.parts.shell.thicknessMm === result.recommendedMm);
    if (!reason) {
      if (guarded.length)
        throw new AppError(
          'invalid',
          `Give the reason the ${guarded.map((p) => VESSEL_PART_LABEL[p]).join(' and ')} is guarded instead of insulated to the touch limit.`,
          { reason: ['A reason is required for a guarded head.'] },
        );
      if (below.length)
        throw new AppError(
          'invalid',
          `${below.map((b) => `The ${VESSEL_PART_LABEL[b.part]} is below what ${b.criteria.join(' and ')} requires`).join('; ')}; give a reason to keep it.`,
          { reason: ['A reason is required for a pick below a hard criterion.'] },
        );
      if (!recommended)
        throw new AppError(
          'invalid',
          'Give a reason for choosing other thicknesses than the recommendation.',
          {
            reason: ['A reason is required for a manual pick.'],
          },
        );
    }
    const existing = await lockedDesign(tx, o.lineId, o.expectedVersion);
    const parts: DesignParts | null = split
      ? {
          shell: { thicknessMm: o.parts.shell.thicknessMm, layers: layersOf.shell },
          top: {
            thicknessMm: o.parts.top.thicknessMm,
            layers: layersOf.top,
            ...(o.parts.top.guarded ? { guarded: true } : {}),
          },
          bottom: {
            thicknessMm: o.parts.bottom.thicknessMm,
            layers: layersOf.bottom,
            ...(o.parts.bottom.guarded ? { guarded: true } : {}),
          },
        }
      : null;
    const values = {
      lineId: o.lineId,
      projectId: o.projectId,
      // The shell's thickness: the design's one number where one is shown (most of a vessel's area).
      thicknessMm: o.parts.shell.thicknessMm,
      layers: layersOf.shell,
      parts,
      source: recommended ? ('recommended' as const) : ('manual' as const),
      reason,
      belowCriterion: belowIds.length ? belowIds.join(',') : null,
      needsRedecision: false,
      redecisionReason: null,
      decidedBy: o.userId,
      decidedAt: new Date(),
      version: (existing?.version ?? row.line.lastDesignVersion) + 1,
    };
    await storeDesign(tx, existing, values);
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        lineId: o.lineId,
        tag: row.line.tag,
        actorId: o.userId,
        actorName: await actorName(o.userId),
        action: 'design pick',
        before: existing
          ? {
              thicknessMm: existing.thicknessMm,
              parts: describeDesign(existing.thicknessMm, existing.parts),
              source: existing.source,
              reason: existing.reason,
            }
          : null,
        after: {
          thicknessMm: values.thicknessMm,
          parts: describeDesign(values.thicknessMm, parts),
          source: values.source,
          reason: values.reason,
          belowCriterion: values.belowCriterion,
          ...(o.via ? { via: o.via } : {}),
        },
      },
    ]);
    return {
      version: values.version,
      source: values.source,
      belowCriterion: values.belowCriterion,
      parts: describeDesign(values.thicknessMm, parts),
    };
  });
}
