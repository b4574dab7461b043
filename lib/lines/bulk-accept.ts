/**
 * "Accept recommendation for the filtered lines": a preview that counts what would change for the
 * table's exact filter, an apply that changes exactly those lines (or refuses when anything moved),
 * and an undo that puts the previous decisions back. Free of Next.js.
 *
 * What a bulk accept may change: a current (not stale) solved line with a recommendation that has
 * no decision yet, or whose decision is an accepted recommendation other than the current one.
 * It never touches a manual pick, a decision waiting for re-decision, or a stale result.
 */
import { canonicalJson } from './canonical-json';
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { db, type Tx } from '@/db/client';
import {
  bulkAccepts,
  lineDesigns,
  lineResults,
  lines,
  users,
  type BulkAcceptEntry,
  type DesignSnapshot,
  type LineDesign,
} from '@/db/schema';
import { AppError } from '@/lib/errors';
import { actorName, writeAudit } from '@/lib/audit';
import { basisRevisionOf, lineFilterSql, staleSql } from './stale';
import type { LineFilter } from './filter';
import type { StoredLayer } from './stored-result';

/** Why a line in the filter is or is not changed. */
export type BulkClass =
  | 'new'
  | 'update'
  | 'manual'
  | 'redecide'
  | 'stale'
  | 'noRecommendation'
  | 'alreadyAccepted';

export interface BulkItem {
  lineId: string /** design version the preview saw, 0 for none */;
  version: number;
  thicknessMm: number;
}

export interface BulkPreview {
  filter: LineFilter;
  /** Lines the accept changes: `newDecisions` without a decision, `updated` holding an older accepted recommendation. */
  change: number;
  newDecisions: number;
  updated: number;
  /** Lines in the filter it leaves alone, by reason. */
  leftAlone: {
    manual: number;
    redecide: number;
    stale: number;
    noRecommendation: number;
    alreadyAccepted: number;
  };
  leftAloneTotal: number;
  /** Exactly the lines `applyBulkAccept` must find unchanged. */
  items: BulkItem[];
}

const CHUNK = 1000;
const chunks = <T>(xs: T[]) =>
  Array.from({ length: Math.ceil(xs.length / CHUNK) }, (_, i) => xs.slice(i * CHUNK, (i + 1) * CHUNK));

// jsonb does not keep key order: compare layer lists with sorted keys.
const sameJson = (a: unknown, b: unknown) => canonicalJson(a) === canonicalJson(b);

interface Classified {
  lineId: string;
  tag: string;
  lastDesignVersion: number;
  recommendedMm: number | null;
  /** Null without a result (such a line is never accepted). */
  recLayers: StoredLayer[] | null;
  design: LineDesign | null;
  cls: BulkClass;
}

function classOf(r: {
  stale: boolean;
  recommendedMm: number | null;
  /** Null without a result (such a line is never accepted). */
  recLayers: StoredLayer[] | null;
  design: LineDesign | null;
}): BulkClass {
  if (r.design?.source === 'manual') return 'manual';
  if (r.design?.needsRedecision) return 'redecide';
  if (r.stale) return 'stale';
  if (r.recommendedMm === null) return 'noRecommendation';
  if (r.design && r.design.thicknessMm === r.recommendedMm && sameJson(r.design.layers, r.recLayers))
    return 'alreadyAccepted';
  // A vessel accepted part by part at the engine's per-part decisions is its recommendation already.
  if (r.design?.parts) return 'alreadyAccepted';
  return r.design ? 'update' : 'new';
}

/** Every line the table's filter shows, with what a bulk accept would do to it. */
async function classify(
  exec: Tx | typeof db,
  projectId: string,
  filter: LineFilter,
  revision: number,
): Promise<Classified[]> {
  const rows = await exec
    .select({
      lineId: lines.id,
      tag: lines.tag,
      lastDesignVersion: lines.lastDesignVersion,
      stale: staleSql(revision),
      recommendedMm: lineResults.recommendedMm,
      recLayers: lineResults.layers,
      design: lineDesigns,
    })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(lineFilterSql(projectId, filter, revision))
    .orderBy(asc(lines.tag));
  return rows.map((r) => ({ ...r, cls: classOf(r) }));
}

const changes = (c: Classified) => c.cls === 'new' || c.cls === 'update';
const itemOf = (c: Classified): BulkItem => ({
  lineId: c.lineId,
  version: c.design?.version ?? 0,
  thicknessMm: c.recommendedMm!,
});

function previewOf(filter: LineFilter, all: Classified[]): BulkPreview {
  const n = (cls: BulkClass) => all.filter((c) => c.cls === cls).length;
  const leftAlone = {
    manual: n('manual'),
    redecide: n('redecide'),
    stale: n('stale'),
    noRecommendation: n('noRecommendation'),
    alreadyAccepted: n('alreadyAccepted'),
  };
  const items = all.filter(changes).map(itemOf);
  return {
    filter,
    change: items.length,
    newDecisions: n('new'),
    updated: n('update'),
    leftAlone,
    leftAloneTotal: Object.values(leftAlone).reduce((a, b) => a + b, 0),
    items,
  };
}

/** What accepting the recommendation for the filtered lines would change and leave alone (reads only). */
export async function previewBulkAccept(o: { projectId: string; filter: LineFilter }): Promise<BulkPreview> {
  const revision = await basisRevisionOf(db, o.projectId);
  return previewOf(o.filter, await classify(db, o.projectId, o.filter, revision));
}

const snapshotOf = (d: LineDesign): DesignSnapshot => ({
  thicknessMm: d.thicknessMm,
  layers: d.layers,
  source: d.source,
  reason: d.reason,
  belowCriterion: d.belowCriterion,
  parts: d.parts ?? null,
  needsRedecision: d.needsRedecision,
  redecisionReason: d.redecisionReason,
  decidedBy: d.decidedBy,
  decidedAt: d.decidedAt.toISOString(),
  version: d.version,
});
const auditView = (d: DesignSnapshot | LineDesign | null) =>
  d
    ? {
        thicknessMm: d.thicknessMm,
        source: d.source,
        reason: d.reason,
        belowCriterion: d.belowCriterion,
        needsRedecision: d.needsRedecision,
      }
    : null;

/**
 * Locks the given lines, their designs and results (in line-id order: picks lock the line first, then
 * its design), after the project's import lock, so nothing changes them until the transaction ends.
 */
async function lockLines(tx: Tx, projectId: string, ids: string[]) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${projectId}))`);
  const sorted = [...ids].sort();
  const found = new Set<string>();
  for (const part of chunks(sorted)) {
    for (const r of await tx
      .select({ id: lines.id })
      .from(lines)
      .where(and(eq(lines.projectId, projectId), inArray(lines.id, part)))
      .orderBy(asc(lines.id))
      .for('update'))
      found.add(r.id);
  }
  for (const part of chunks(sorted)) {
    await tx
      .select({ id: lineDesigns.lineId })
      .from(lineDesigns)
      .where(inArray(lineDesigns.lineId, part))
      .orderBy(asc(lineDesigns.lineId))
      .for('update');
    await tx
      .select({ id: lineResults.lineId })
      .from(lineResults)
      .where(inArray(lineResults.lineId, part))
      .orderBy(asc(lineResults.lineId))
      .for('share');
  }
  return found;
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/**
 * Accepts the recommendation for exactly the lines a preview of the same filter returned. In one
 * transaction it checks them again under the same rules; if the filter now selects other lines to
 * change, or any of them has another design version or recommendation than the preview saw, nothing
 * is written and the user is asked to look again. The previous decisions are kept for `undoBulkAccept`.
 */
export async function applyBulkAccept(o: {
  projectId: string;
  userId: string;
  filter: LineFilter;
  items: BulkItem[];
}) {
  if (new Set(o.items.map((i) => i.lineId)).size !== o.items.length)
    throw new AppError(
      'invalid',
      'The list of lines to accept names a line twice; reload the page and try again.',
    );
  const name = await actorName(o.userId);
  return db.transaction(async (tx) => {
    await lockLines(
      tx,
      o.projectId,
      o.items.map((i) => i.lineId),
    );
    // A basis save waits for this transaction, so no result goes stale under it.
    const revision = await basisRevisionOf(tx, o.projectId, 'share');
    const all = await classify(tx, o.projectId, o.filter, revision);
    const now = new Map(all.filter(changes).map((c) => [c.lineId, c]));
    const seen = new Map(o.items.map((i) => [i.lineId, i]));
    const moved = new Set<string>();
    for (const i of o.items) {
      const c = now.get(i.lineId);
      if (!c || (c.design?.version ?? 0) !== i.version || c.recommendedMm !== i.thicknessMm)
        moved.add(i.lineId);
    }
    for (const id of now.keys()) if (!seen.has(id)) moved.add(id);
    if (moved.size) {
      throw new AppError(
        'conflict',
        `${plural(moved.size, 'line')} changed since the counts were shown (someone picked, imported or solved). Nothing was accepted; look at the new counts and confirm again.`,
      );
    }
    const picked = [...now.values()];
    if (!picked.length) return { bulkAcceptId: null, accepted: 0 };

    const decidedAt = new Date();
    const entries: BulkAcceptEntry[] = [];
    const values = picked.map((c) => {
      const version = (c.design?.version ?? c.lastDesignVersion) + 1;
      entries.push({ lineId: c.lineId, tag: c.tag, before: c.design ? snapshotOf(c.design) : null, version });
      return {
        lineId: c.lineId,
        projectId: o.projectId,
        thicknessMm: c.recommendedMm!,
        layers: c.recLayers!, // picked lines have a current result
        source: 'recommended' as const,
        reason: null,
        belowCriterion: null,
        parts: null,
        needsRedecision: false,
        redecisionReason: null,
        decidedBy: o.userId,
        decidedAt,
        version,
      };
    });
    for (const part of chunks(values)) {
      await tx
        .insert(lineDesigns)
        .values(part)
        .onConflictDoUpdate({
          target: lineDesigns.lineId,
          set: {
            thicknessMm: sql`excluded.thickness_mm`,
            layers: sql`excluded.layers`,
            source: sql`excluded.source`,
            reason: null,
            belowCriterion: null,
            parts: null,
            needsRedecision: false,
            redecisionReason: null,
            decidedBy: sql`excluded.decided_by`,
            decidedAt: sql`excluded.decided_at`,
            version: sql`excluded.version`,
          },
        });
    }
    const [batch] = await tx
      .insert(bulkAccepts)
      .values({
        projectId: o.projectId,
        acceptedBy: o.userId,
        acceptedAt: decidedAt,
        filter: o.filter,
        entries,
      })
      .returning({ id: bulkAccepts.id });
    const leftAlone = previewOf(o.filter, all).leftAlone;
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        actorId: o.userId,
        actorName: name,
        action: 'bulk accept',
        after: { bulkAcceptId: batch.id, filter: o.filter, accepted: picked.length, leftAlone },
      },
      ...picked.map((c, k) => ({
        projectId: o.projectId,
        lineId: c.lineId,
        tag: c.tag,
        actorId: o.userId,
        actorName: name,
        action: 'recommendation accepted',
        before: auditView(c.design),
        after: {
          thicknessMm: c.recommendedMm,
          source: 'recommended',
          version: entries[k].version,
          bulkAcceptId: batch.id,
        },
      })),
    ]);
    return { bulkAcceptId: batch.id, accepted: picked.length };
  });
}

/**
 * Undoes a bulk accept in one transaction: each line still holding the design the accept wrote gets
 * its previous decision back (with reason, below-criterion mark, re-decision state and decider) or,
 * where it had none, no decision. Lines decided again since, or removed, are left as they are and
 * named in the answer. The restored design gets a new version number, so a pick made against the
 * accepted design is refused.
 */
export async function undoBulkAccept(o: { projectId: string; userId: string; bulkAcceptId: string }) {
  const name = await actorName(o.userId);
  return db.transaction(async (tx) => {
    const [batch] = await tx
      .select()
      .from(bulkAccepts)
      .where(and(eq(bulkAccepts.id, o.bulkAcceptId), eq(bulkAccepts.projectId, o.projectId)))
      .for('update');
    if (!batch) throw new AppError('not_found', 'That bulk accept does not exist in this project.');
    if (batch.undoneAt) throw new AppError('conflict', 'That bulk accept has already been undone.');
    const present = await lockLines(
      tx,
      o.projectId,
      batch.entries.map((e) => e.lineId),
    );
    const current = new Map<string, LineDesign>();
    for (const part of chunks(batch.entries.map((e) => e.lineId))) {
      for (const d of await tx.select().from(lineDesigns).where(inArray(lineDesigns.lineId, part)))
        current.set(d.lineId, d);
    }
    // A decider who has left since is restored as unknown (the column's own rule on user removal).
    const deciders = [
      ...new Set(batch.entries.map((e) => e.before?.decidedBy).filter((x): x is string => !!x)),
    ];
    const known = new Set(
      deciders.length
        ? (await tx.select({ id: users.id }).from(users).where(inArray(users.id, deciders))).map((u) => u.id)
        : [],
    );

    const restored: BulkAcceptEntry[] = [],
      changedSince: string[] = [],
      removed: string[] = [];
    const audit: Parameters<typeof writeAudit>[1] = [];
    for (const e of batch.entries) {
      const cur = current.get(e.lineId);
      if (!present.has(e.lineId)) {
        removed.push(e.tag);
        continue;
      }
      if (!cur || cur.version !== e.version) {
        changedSince.push(e.tag);
        continue;
      }
      const b = e.before;
      if (b) {
        await tx
          .update(lineDesigns)
          .set({
            thicknessMm: b.thicknessMm,
            layers: b.layers,
            source: b.source,
            reason: b.reason,
            belowCriterion: b.belowCriterion,
            parts: b.parts ?? null,
            needsRedecision: b.needsRedecision,
            redecisionReason: b.redecisionReason,
            decidedBy: b.decidedBy && known.has(b.decidedBy) ? b.decidedBy : null,
            decidedAt: new Date(b.decidedAt),
            version: cur.version + 1,
          })
          .where(eq(lineDesigns.lineId, e.lineId));
      } else {
        await tx.delete(lineDesigns).where(eq(lineDesigns.lineId, e.lineId));
        await tx
          .update(lines)
          .set({ lastDesignVersion: sql`greatest(${lines.lastDesignVersion}, ${cur.version})` })
          .where(eq(lines.id, e.lineId));
      }
      restored.push(e);
      audit.push({
        projectId: o.projectId,
        lineId: e.lineId,
        tag: e.tag,
        actorId: o.userId,
        actorName: name,
        action: 'bulk accept undone',
        before: auditView(cur),
        after: auditView(b),
      });
    }
    await tx
      .update(bulkAccepts)
      .set({ undoneBy: o.userId, undoneAt: new Date() })
      .where(eq(bulkAccepts.id, batch.id));
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        actorId: o.userId,
        actorName: name,
        action: 'bulk accept undone',
        before: { bulkAcceptId: batch.id },
        after: { restored: restored.length, changedSince, removed },
      },
      ...audit,
    ]);
    return { restored: restored.length, changedSince, removed };
  });
}

/**
 * Preview and apply in one call, for the seed, benchmarks and tests: accepts the recommendation for
 * the filtered lines under the same rules as the button (manual picks, re-decisions and stale
 * results are left alone).
 */
export async function acceptRecommendations(o: { projectId: string; userId: string } & LineFilter) {
  const filter: LineFilter = { q: o.q, area: o.area, status: o.status };
  const p = await previewBulkAccept({ projectId: o.projectId, filter });
  const r = await applyBulkAccept({ projectId: o.projectId, userId: o.userId, filter, items: p.items });
  return { ...r, leftAlone: p.leftAlone };
}
