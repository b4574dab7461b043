/**
 * Safety review rounds, dispositions, sign-off and the audit trail — free of Next.js.
 * A disposed item re-opens by itself when its line's inputs or design change after the decision
 * (the status is derived from the versions recorded with the decision, so no writer can forget it).
 */
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { actorName, writeAudit } from '@/lib/audit';
import {
  auditLog,
  lineDesigns,
  lineResults,
  lines,
  memberships,
  projects,
  reviewItems,
  reviewRounds,
  users,
} from '@/db/schema';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { composeMail, sendMail } from '@/lib/mail';
import { CALCULATION_VERSION } from '@/lib/thermal';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { inputOf } from '@/lib/lines/result-row';
import { isResultStale } from '@/lib/lines/stale';
import { FLAG_LABEL, flagsForLine, type Flag, type FlagType } from './flags';

import { DISPOSITION_LABEL, NEEDS_COMMENT, dispositionsFor, type Disposition } from './dispositions';
export { DISPOSITION_LABEL, type Disposition };

/**
 * Two flag lists are the same finding when they name the same types with the same numbers and
 * conditions (values compared to 0.01 K; the wording may change between versions).
 */
export function sameFlags(a: Flag[], b: Flag[]): boolean {
  const key = (f: Flag) =>
    JSON.stringify([
      f.type,
      f.valueC === undefined ? null : Math.round(f.valueC * 100),
      f.limitC === undefined ? null : Math.round(f.limitC * 100),
      f.conditions ?? null,
    ]);
  const ka = a.map(key).sort(),
    kb = b.map(key).sort();
  return ka.length === kb.length && ka.every((k, i) => k === kb[i]);
}

/** Every line of the project with its current flags (flagged lines only). */
export async function currentFlags({ projectId, area }: { projectId: string; area?: string }) {
  const { basis, revision } = await getDesignBasis({ projectId });
  // Only the result columns the flags need (the stored candidate curves and profiles are large).
  const rows = await db
    .select({
      line: lines,
      result: {
        jacketId: lineResults.jacketId,
        basisRevision: lineResults.basisRevision,
        inputVersion: lineResults.inputVersion,
        calcVersion: lineResults.calcVersion,
        unmet: lineResults.unmet,
        recommendedMm: lineResults.recommendedMm,
      },
      design: {
        layers: lineDesigns.layers,
        belowCriterion: lineDesigns.belowCriterion,
        parts: lineDesigns.parts,
        version: lineDesigns.version,
      },
    })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(area ? and(eq(lines.projectId, projectId), eq(lines.area, area)) : eq(lines.projectId, projectId))
    .orderBy(asc(lines.tag));
  const out: {
    lineId: string;
    tag: string;
    area: string;
    inputVersion: number;
    designVersion: number;
    flags: Flag[];
    recommendedMm: number | null;
  }[] = [];
  for (const { line, result, design } of rows) {
    const stale = isResultStale(result, line, revision);
    const flags = flagsForLine(basis, {
      line: inputOf(line),
      design: design
        ? {
            layers: design.layers,
            belowCriterion: design.belowCriterion,
            parts: design.parts,
          }
        : null,
      jacketId: result?.jacketId ?? null,
      solved: !!result,
      stale,
      unmet: result?.unmet ?? [],
    });
    if (flags.length)
      out.push({
        lineId: line.id,
        tag: line.tag,
        area: line.area,
        inputVersion: line.inputVersion,
        designVersion: design?.version ?? 0,
        flags,
        recommendedMm: result?.recommendedMm ?? null,
      });
  }
  return out;
}

export function countByType(items: { flags: Flag[] }[]) {
  const c: Partial<Record<FlagType, number>> = {};
  for (const i of items) for (const t of new Set(i.flags.map((f) => f.type))) c[t] = (c[t] ?? 0) + 1;
  return c;
}

async function orgPeople(projectId: string, role: 'reviewer' | 'owner') {
  return db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(projects)
    .innerJoin(memberships, eq(memberships.organizationId, projects.organizationId))
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(projects.id, projectId), eq(memberships.role, role)));
}

/** An engineer asks for a review of the currently flagged lines (optionally of one area). */
export async function requestReview({
  projectId,
  userId,
  area,
  note = '',
}: {
  projectId: string;
  userId: string;
  area?: string;
  note?: string;
}) {
  const flagged = await currentFlags({ projectId, area });
  if (flagged.length === 0) throw new AppError('invalid', 'No line is flagged; there is nothing to review.');
  const { revision } = await getDesignBasis({ projectId });
  const name = await actorName(userId);
  const { round, carried } = await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`review${projectId}`}))`);
    const [open] = await tx
      .select()
      .from(reviewRounds)
      .where(and(eq(reviewRounds.projectId, projectId), eq(reviewRounds.status, 'open')));
    if (open)
      throw new AppError(
        'conflict',
        `Review round ${open.number} is still open; the reviewer signs it off before a new one is requested.`,
      );
    const [{ n }] = await tx
      .select({ n: sql<number>`coalesce(max(${reviewRounds.number}), 0)` })
      .from(reviewRounds)
      .where(eq(reviewRounds.projectId, projectId));
    const [r] = await tx
      .insert(reviewRounds)
      .values({
        projectId,
        number: Number(n) + 1,
        note,
        requestedBy: userId,
        calcVersion: CALCULATION_VERSION,
        basisRevision: revision,
      })
      .returning();
    // Carry-over: each line's latest decision in a signed-off round stands when the line's inputs,
    // its chosen design and its flags are what they were then. The decision is copied into a new
    // row of the new round (rows of signed-off rounds never change: migration 0007).
    const previous = await tx
      .selectDistinctOn([reviewItems.lineId], { item: reviewItems, number: reviewRounds.number })
      .from(reviewItems)
      .innerJoin(reviewRounds, eq(reviewRounds.id, reviewItems.roundId))
      .where(
        and(
          eq(reviewRounds.projectId, projectId),
          eq(reviewRounds.status, 'signed-off'),
          inArray(
            reviewItems.lineId,
            flagged.map((f) => f.lineId),
          ),
        ),
      )
      .orderBy(reviewItems.lineId, desc(reviewRounds.number));
    const prevByLine = new Map(previous.map((p) => [p.item.lineId, p]));
    let carriedCount = 0;
    const rows = flagged.map((f) => {
      const base = {
        roundId: r.id,
        projectId,
        lineId: f.lineId,
        tag: f.tag,
        area: f.area,
        flags: f.flags,
        lineInputVersion: f.inputVersion,
        designVersion: f.designVersion,
      };
      const p = prevByLine.get(f.lineId);
      const d = p?.item.disposition as Disposition | null | undefined;
      if (
        !p ||
        !d ||
        d === 'returned' ||
        p.item.lineInputVersion !== f.inputVersion ||
        p.item.designVersion !== f.designVersion ||
        !sameFlags(p.item.flags, f.flags) ||
        !dispositionsFor(f.flags.map((x) => x.type)).includes(d)
      )
        return base;
      carriedCount++;
      return {
        ...base,
        disposition: d,
        comment: p.item.comment,
        requiredMm: p.item.requiredMm,
        decidedBy: p.item.decidedBy,
        decidedAt: p.item.decidedAt,
        carriedFromRound: p.number,
      };
    });
    await tx.insert(reviewItems).values(rows);
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: name,
        action: `review round ${r.number} requested`,
        after: {
          lines: flagged.length,
          counts: countByType(flagged),
          carriedOver: carriedCount,
          area: area ?? null,
        },
      },
      ...rows
        .filter((x) => 'carriedFromRound' in x)
        .map((x) => ({
          projectId,
          lineId: x.lineId,
          tag: x.tag,
          actorId: userId,
          actorName: name,
          action: `decision carried over to round ${r.number}`,
          after: {
            disposition: (x as { disposition: string }).disposition,
            fromRound: (x as { carriedFromRound: number }).carriedFromRound,
          },
        })),
    ]);
    return { round: r, carried: carriedCount };
  });
  const counts = countByType(flagged);
  const [project] = await db.select().from(projects).where(eq(projects.id, projectId));
  const reviewers = await orgPeople(projectId, 'reviewer');
  for (const rv of reviewers) {
    await sendMail(
      composeMail({
        to: rv.email,
        subject: `Safety review requested: ${project.code} round ${round.number} (${flagged.length} lines)`,
        lines: [
          `${name} asks you to review ${flagged.length} flagged surfaces of ${project.name} in round ${round.number}.`,
          ...Object.entries(counts).map(([t, c]) => `${FLAG_LABEL[t as FlagType]}: ${c}`),
          carried
            ? `${carried} decision${carried === 1 ? '' : 's'} carried over from earlier signed-off rounds (line, design and flags unchanged); ${flagged.length - carried} to decide.`
            : '',
          note ? `Note: ${note}` : '',
        ].filter(Boolean),
        link: {
          label: `Open review round ${round.number}`,
          url: `${env.appUrl()}/projects/${projectId}/review/${round.id}`,
        },
        footer:
          'Results are estimates by published methods; burn thresholds depend on material and contact time; decisions follow local codes and a qualified person.',
      }),
    );
  }
  return { round, lines: flagged.length, counts, carried, notified: reviewers.length };
}

export type ItemStatus = 'open' | 'decided' | 'reopened';

/** A round with its items and each item's current status (re-opened when its line moved on). */
export async function getRound({ projectId, roundId }: { projectId: string; roundId: string }) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(roundId))
    throw new AppError('not_found');
  const [round] = await db
    .select()
    .from(reviewRounds)
    .where(and(eq(reviewRounds.id, roundId), eq(reviewRounds.projectId, projectId)));
  if (!round) throw new AppError('not_found');
  const rows = await db
    .select({
      item: reviewItems,
      inputVersion: lines.inputVersion,
      designVersion: lineDesigns.version,
      decider: users.name,
    })
    .from(reviewItems)
    .leftJoin(lines, eq(lines.id, reviewItems.lineId))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, reviewItems.lineId))
    .leftJoin(users, eq(users.id, reviewItems.decidedBy))
    .where(eq(reviewItems.roundId, roundId))
    .orderBy(asc(reviewItems.tag));
  const items = rows.map(({ item, inputVersion, designVersion, decider }) => {
    let status: ItemStatus = item.disposition ? 'decided' : 'open';
    let why: string | null = null;
    if (item.disposition) {
      if (item.lineId === null) {
        status = 'reopened';
        why = 'The line was removed from the line list.';
      } else if (inputVersion !== item.lineInputVersion) {
        status = 'reopened';
        why = "The line's inputs changed after the decision.";
      } else if ((designVersion ?? 0) !== item.designVersion) {
        status = 'reopened';
        why = "The line's chosen design changed after the decision.";
      }
    }
    return {
      ...item,
      flags: item.flags,
      status,
      reopenReason: why,
      deciderName: decider,
      allowed: dispositionsFor(item.flags.map((f) => f.type)),
    };
  });
  const { revision } = await getDesignBasis({ projectId });
  const stale = round.calcVersion !== CALCULATION_VERSION || round.basisRevision !== revision;
  return { round, items, stale };
}

export async function listRounds({ projectId }: { projectId: string }) {
  return db
    .select({ round: reviewRounds, requester: users.name })
    .from(reviewRounds)
    .innerJoin(users, eq(users.id, reviewRounds.requestedBy))
    .where(eq(reviewRounds.projectId, projectId))
    .orderBy(desc(reviewRounds.number));
}

/** The reviewer's decision on one or more items of an open round (bulk: one comment for all). */
export async function dispose(o: {
  projectId: string;
  roundId: string;
  itemIds: string[];
  disposition: Disposition;
  comment?: string;
  requiredMm?: number;
  userId: string;
}) {
  const comment = o.comment?.trim() ?? '';
  if (NEEDS_COMMENT.includes(o.disposition) && !comment)
    throw new AppError('invalid', 'A comment is required for this disposition.', {
      comment: ['Say why the surface is accepted or returned.'],
    });
  if (o.itemIds.length === 0) throw new AppError('invalid', 'Choose at least one line.');
  const name = await actorName(o.userId);
  const result = await db.transaction(async (tx) => {
    const [round] = await tx
      .select()
      .from(reviewRounds)
      .where(and(eq(reviewRounds.id, o.roundId), eq(reviewRounds.projectId, o.projectId)))
      .for('update');
    if (!round) throw new AppError('not_found');
    if (round.status !== 'open')
      throw new AppError(
        'conflict',
        `Round ${round.number} is signed off; its decisions cannot change. Request a new round.`,
      );
    const items = await tx
      .select({
        item: reviewItems,
        inputVersion: lines.inputVersion,
        designVersion: lineDesigns.version,
        recommendedMm: lineResults.recommendedMm,
      })
      .from(reviewItems)
      .leftJoin(lines, eq(lines.id, reviewItems.lineId))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, reviewItems.lineId))
      .leftJoin(lineResults, eq(lineResults.lineId, reviewItems.lineId))
      .where(and(eq(reviewItems.roundId, round.id), inArray(reviewItems.id, o.itemIds)));
    if (items.length !== new Set(o.itemIds).size)
      throw new AppError('not_found', 'Some lines are not part of this round.');
    const misfit = items.filter(
      ({ item }) => !dispositionsFor(item.flags.map((f) => f.type)).includes(o.disposition),
    );
    if (misfit.length) {
      const tags =
        misfit
          .slice(0, 5)
          .map(({ item }) => item.tag)
          .join(', ') + (misfit.length > 5 ? ', …' : '');
      throw new AppError(
        'invalid',
        `Disposition: "${DISPOSITION_LABEL[o.disposition]}" does not fit the flags of ${misfit.length === 1 ? 'line' : `${misfit.length} lines`} ${tags}; choose one for ${misfit.some(({ item }) => item.flags.some((f) => f.type === 'sweating')) ? 'a sweating surface' : 'a hot surface'}.`,
        { disposition: ['Choose a disposition that fits the flag.'] },
      );
    }
    const now = new Date();
    const audit = [];
    for (const { item, inputVersion, designVersion, recommendedMm } of items) {
      const after = {
        disposition: o.disposition,
        comment: comment || null,
        requiredMm: o.disposition === 'insulate' ? (o.requiredMm ?? recommendedMm ?? null) : null,
      };
      await tx
        .update(reviewItems)
        .set({
          ...after,
          carriedFromRound: null,
          decidedBy: o.userId,
          decidedAt: now,
          lineInputVersion: inputVersion ?? item.lineInputVersion,
          designVersion: designVersion ?? 0,
        })
        .where(eq(reviewItems.id, item.id));
      audit.push({
        projectId: o.projectId,
        lineId: item.lineId,
        tag: item.tag,
        actorId: o.userId,
        actorName: name,
        action: `disposition (round ${round.number})`,
        before: item.disposition ? { disposition: item.disposition, comment: item.comment } : null,
        after,
      });
    }
    await writeAudit(tx, audit);
    return { round, count: items.length };
  });
  if (o.disposition === 'returned' || o.disposition === 'insulate') {
    const [req] = await db
      .select({ email: users.email })
      .from(users)
      .where(eq(users.id, result.round.requestedBy));
    const [project] = await db.select().from(projects).where(eq(projects.id, o.projectId));
    if (req)
      await sendMail(
        composeMail({
          to: req.email,
          subject: `${project.code} review round ${result.round.number}: ${result.count} line${result.count === 1 ? '' : 's'} returned to you`,
          lines: [
            `${name} ${o.disposition === 'insulate' ? 'asks for insulation for protection on' : 'returned'} ${result.count} line${result.count === 1 ? '' : 's'}.`,
            comment ? `Comment: ${comment}` : '',
          ].filter(Boolean),
          link: {
            label: 'See the decisions',
            url: `${env.appUrl()}/projects/${o.projectId}/review/${o.roundId}`,
          },
        }),
      );
  }
  return { disposed: result.count };
}

/** Sign-off: every item decided, nothing re-opened, the round not stale. Snapshot kept as signed. */
export async function signOff({
  projectId,
  roundId,
  userId,
}: {
  projectId: string;
  roundId: string;
  userId: string;
}) {
  const { round, items, stale } = await getRound({ projectId, roundId });
  if (round.status !== 'open') throw new AppError('conflict', `Round ${round.number} is already signed off.`);
  if (stale)
    throw new AppError(
      'conflict',
      'The calculation or the design basis changed since this round was requested. Solve the lines and request a new round.',
    );
  const undecided = items.filter((i) => i.status !== 'decided');
  if (undecided.length)
    throw new AppError(
      'invalid',
      `${undecided.length} line${undecided.length === 1 ? ' is' : 's are'} not decided yet (${undecided
        .slice(0, 5)
        .map((i) => i.tag)
        .join(', ')}${undecided.length > 5 ? ', …' : ''}).`,
    );
  const name = await actorName(userId);
  const snapshot = {
    signedBy: name,
    calcVersion: round.calcVersion,
    basisRevision: round.basisRevision,
    items: items.map((i) => ({
      tag: i.tag,
      area: i.area,
      flags: i.flags,
      disposition: i.disposition,
      comment: i.comment,
      requiredMm: i.requiredMm,
      decidedBy: i.deciderName,
      decidedAt: i.decidedAt,
    })),
  };
  await db.transaction(async (tx) => {
    const [locked] = await tx.select().from(reviewRounds).where(eq(reviewRounds.id, roundId)).for('update');
    if (locked.status !== 'open')
      throw new AppError('conflict', `Round ${round.number} is already signed off.`);
    await tx
      .update(reviewRounds)
      .set({ status: 'signed-off', signedOffBy: userId, signedOffAt: new Date(), snapshot })
      .where(eq(reviewRounds.id, roundId));
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: name,
        action: `review round ${round.number} signed off`,
        after: { lines: items.length },
      },
    ]);
  });
  const [project] = await db.select().from(projects).where(eq(projects.id, projectId));
  const [req] = await db.select({ email: users.email }).from(users).where(eq(users.id, round.requestedBy));
  const owners = await orgPeople(projectId, 'owner');
  for (const to of new Set([req?.email, ...owners.map((o) => o.email)].filter(Boolean) as string[])) {
    await sendMail(
      composeMail({
        to,
        subject: `${project.code} review round ${round.number} signed off`,
        lines: [
          `${name} signed off review round ${round.number} of ${project.name}: ${items.length} surfaces decided.`,
        ],
        link: {
          label: 'Open the review report',
          url: `${env.appUrl()}/projects/${projectId}/review/${roundId}/report`,
        },
      }),
    );
  }
  return { signedOff: true };
}

export async function auditForLine({ projectId, lineId }: { projectId: string; lineId: string }) {
  return db
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.projectId, projectId), eq(auditLog.lineId, lineId)))
    .orderBy(desc(auditLog.at), desc(auditLog.id));
}
