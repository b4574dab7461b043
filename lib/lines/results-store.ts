/**
 * Results: solving a project's stale lines (or all of them) and reading lines with their results,
 * decisions and staleness for the table and the line page. The stale rule itself lives in `./stale`.
 */
import { and, asc, count, eq, sql } from 'drizzle-orm';
import { upsertRows } from '@/db/bulk';
import { db, type Tx } from '@/db/client';
import { type Line, lineDesigns, lineResults, lines } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { getDesignBasis } from './basis-store';
import { CANDIDATE_MM_POSITION, type CandidateRow } from './candidate-row';
import type { LineFilter } from './filter';
import { resultContext, type ResultRow, resultRow } from './result-row';
import type { SolvePool } from './solve-pool';
import { isResultStale, lineFilterSql, staleSql } from './stale';
import { type TableReads, tableReads } from './table-read-cache';

/** Solves the project's lines (only the stale ones unless `all`), storing each result with what it was computed from. */
export async function solveProject({
  projectId,
  all = false,
  tx: outer,
  onProgress,
  pool,
}: {
  projectId: string;
  all?: boolean;
  /** The import + solve job's transaction: the new lines and their results become visible together. */
  tx?: Tx;
  /** Called after each chunk is solved and written (lines done, lines to do). */
  onProgress?: (done: number, total: number) => Promise<void>;
  /** Worker threads to solve on (the job worker's); without it the lines are solved in this thread. */
  pool?: SolvePool;
}) {
  const { basis, revision } = await getDesignBasis({ projectId });
  const staleCond = all ? sql`true` : staleSql(revision);
  const todo = await (outer ?? db)
    .select({ line: lines })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .where(and(eq(lines.projectId, projectId), staleCond));
  const total = todo.length;
  const ctx = resultContext({ basis, revision, projectId });
  let solveMs = 0;
  // Solved and written a chunk at a time, so only a few chunks of results are held in memory.
  await (outer ?? db).transaction(async (tx) => {
    const chunks: (Line[] | undefined)[] = [];
    for (let i = 0; i < todo.length; i += SOLVE_CHUNK)
      chunks.push(todo.slice(i, i + SOLVE_CHUNK).map((t) => t.line));
    todo.length = 0;
    // With a pool (the job worker on 3+ cores), chunks are solved on worker threads a few at a time;
    // without one, in this thread, handing the event loop back every few lines so the previous
    // chunk's rows keep streaming to PostgreSQL while this one is solved.
    const solveChunk = async (c: Line[]) => {
      if (pool) return pool.solve({ basis, revision, projectId, lines: c });
      const rows: ResultRow[] = [];
      for (let j = 0; j < c.length; j++) {
        rows.push(resultRow(ctx, c[j]));
        if (j % YIELD_EVERY === YIELD_EVERY - 1) await new Promise((r) => setImmediate(r));
      }
      return rows;
    };
    const ahead = pool ? pool.threads * 2 : 1;
    const inFlight: (Promise<ResultRow[]> | undefined)[] = chunks.slice(0, ahead).map((c) => solveChunk(c!));
    // PostgreSQL writes chunk i while chunk i + 1 is solved: two cores busy instead of taking turns.
    let writing: Promise<void> = Promise.resolve();
    let done = 0;
    for (let i = 0; i < chunks.length; i++) {
      const t0 = Date.now();
      const results = await inFlight[i]!;
      inFlight[i] = undefined; // the rows are the write's now; keeping them held every chunk in memory
      chunks[i] = undefined;
      if (i + ahead < chunks.length) inFlight.push(solveChunk(chunks[i + ahead]!));
      solveMs += Date.now() - t0;
      await writing;
      writing = upsertRows(tx, lineResults, results, { target: ['lineId'] }).then(() => {
        done += results.length;
        return onProgress?.(done, total);
      });
      // Awaited before the next write (or at the end); a failure meanwhile is not "unhandled".
      writing.catch(() => undefined);
    }
    await writing;
  });
  return { solved: total, solveMs, basisRevision: revision };
}

const SOLVE_CHUNK = 250;
/** Lines solved between two turns of the event loop (so a write in progress keeps flowing). */
const YIELD_EVERY = 25;

// ---------- reading ----------

export type LineSort =
  | 'tag'
  | 'area'
  | 'normalTempC'
  | 'outsideDiameterMm'
  | 'recommendedMm'
  | 'heatFlowPerUnit'
  | 'surfaceTempC'
  | 'governing';
export interface LineQuery extends LineFilter {
  projectId: string;
  page: number;
  size: number;
  sort: LineSort;
  dir: 'asc' | 'desc';
}

/**
 * One page of the line table. `basisRevision` saves a read when the caller has the basis already,
 * `reads` the cache's sync when the caller has begun the request with `tableReads()`.
 * Two steps: the page's ids in order (`lineTableOrder`: a narrow sort where only the sort key travels
 * through the joins, its answer kept per project, filter and sort while nothing changed), then the
 * columns the table shows for those ids only, by one prepared statement. The candidate table (the
 * bulk of a result) is read by lib/lines/picker.ts when a picker opens; here only the one candidate
 * the row shows.
 */
export async function listLines(o: LineQuery & { basisRevision?: number; reads?: TableReads | null }) {
  const reads = o.reads === undefined ? await tableReads() : o.reads;
  const revision = o.basisRevision ?? (await getDesignBasis({ projectId: o.projectId })).revision;
  const { ids, total } = await lineTableOrder(o, revision, reads);
  return { rows: await lineTableRows(ids, revision), total, page: o.page, size: o.size };
}

/** The table's columns for these lines, in the order given; a line deleted meanwhile is left out. */
export async function lineTableRows(ids: readonly string[], revision: number) {
  const found = ids.length ? await tableRowsById.execute({ ids }) : [];
  const byId = new Map(found.map((r) => [r.id, r]));
  return ids.flatMap((id) => {
    const r = byId.get(id);
    return r ? [tableRow(r, revision)] : [];
  });
}

const SORT_COLUMN = {
  tag: sql`${lines.tagKey} collate "C"`,
  area: lines.area,
  normalTempC: lines.normalTempC,
  outsideDiameterMm: lines.outsideDiameterMm,
  recommendedMm: lineResults.recommendedMm,
  heatFlowPerUnit: lineResults.heatFlowPerUnit,
  surfaceTempC: lineResults.surfaceTempC,
  governing: lineResults.governing,
} satisfies Record<LineSort, unknown>;

/** The filter's condition and the table's order: the sort key (nulls last), then the tag. */
function orderOf(o: LineQuery, revision: number) {
  const sortCol = SORT_COLUMN[o.sort];
  return {
    where: lineFilterSql(o.projectId, o, revision),
    orderBy: [
      o.dir === 'asc' ? sql`${sortCol} asc nulls last` : sql`${sortCol} desc nulls last`,
      sql`${lines.tagKey} collate "C" asc`,
    ],
  };
}

/**
 * The page's ids and the filter's total: a slice of the whole order kept in this process
 * (`./table-read-cache`), or while it cannot be trusted, the page and the count from PostgreSQL.
 */
export async function lineTableOrder(o: LineQuery, revision: number, reads: TableReads | null) {
  const { where, orderBy } = orderOf(o, revision);
  // The revision is part of the key: the stale filter depends on it.
  const key = JSON.stringify(['order', revision, o.q ?? '', o.area ?? '', o.status ?? '', o.sort, o.dir]);
  const all = await reads?.get(
    o.projectId,
    key,
    async () => {
      // Every id in order as one text value (10,000 rows would cost more to parse one by one).
      const [{ ids }] = await db
        .select({
          ids: sql<string | null>`string_agg(${lines.id}::text, ',' order by ${sql.join(orderBy, sql`, `)})`,
        })
        .from(lines)
        .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
        .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
        .where(where);
      const list = ids ? ids.split(',') : [];
      return { ids: list as readonly string[], total: list.length };
    },
    (v) => v.total,
  );
  if (all) return { ids: all.ids.slice(o.page * o.size, (o.page + 1) * o.size), total: all.total };
  const [page, [{ total }]] = await Promise.all([
    db
      .select({ id: lines.id })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(where)
      .orderBy(...orderBy)
      .limit(o.size)
      .offset(o.page * o.size),
    // A second pass, but without a sort: with no filter on results or picks, PostgreSQL drops both
    // joins and counts the project's lines from an index (a window count over the sorted rows cost more).
    db
      .select({ total: count() })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(where),
  ]);
  return { ids: page.map((r) => r.id), total };
}

/** A row as the table reads it, with its staleness (written out field by field: an object rest is slow here). */
function tableRow(r: Awaited<ReturnType<typeof tableRowsById.execute>>[number], revision: number) {
  return {
    id: r.id,
    tag: r.tag,
    service: r.service,
    area: r.area,
    geometry: r.geometry,
    nps: r.nps,
    outsideDiameterMm: r.outsideDiameterMm,
    normalTempC: r.normalTempC,
    recommendedMm: r.recommendedMm,
    governing: r.governing,
    heatFlowPerUnit: r.heatFlowPerUnit,
    surfaceTempC: r.surfaceTempC,
    unmet: r.unmet,
    solved: r.solved,
    jacketId: r.jacketId,
    outdoor: r.outdoor,
    accessible: r.accessible,
    maxTempC: r.maxTempC,
    purposes: r.purposes,
    chosenMm: r.chosenMm,
    source: r.source,
    belowCriterion: r.belowCriterion,
    needsRedecision: r.needsRedecision,
    designVersion: r.designVersion,
    stale: isResultStale(r.resultProvenance, { inputVersion: r.inputVersion }, revision),
    shownCandidate: r.shownCandidate,
  };
}

/** The columns the table shows, for a page of ids (prepared once per connection). */
const tableRowsById = db
  .select({
    id: lines.id,
    tag: lines.tag,
    service: lines.service,
    area: lines.area,
    geometry: lines.geometry,
    nps: lines.nps,
    outsideDiameterMm: lines.outsideDiameterMm,
    normalTempC: lines.normalTempC,
    recommendedMm: lineResults.recommendedMm,
    governing: lineResults.governing,
    heatFlowPerUnit: lineResults.heatFlowPerUnit,
    surfaceTempC: lineResults.surfaceTempC,
    unmet: lineResults.unmet,
    solved: sql<boolean>`${lineResults.lineId} is not null`,
    jacketId: lineResults.jacketId,
    // The facts that decide which limits apply, and the one candidate at the chosen (or else
    // the recommended) thickness for the worst-margin column.
    outdoor: lines.outdoor,
    accessible: lines.accessible,
    maxTempC: lines.maxTempC,
    purposes: lines.purposes,
    chosenMm: lineDesigns.thicknessMm,
    source: lineDesigns.source,
    belowCriterion: lineDesigns.belowCriterion,
    needsRedecision: lineDesigns.needsRedecision,
    designVersion: lineDesigns.version,
    // What the stale rule compares (applied in TypeScript with the basis revision of the request).
    inputVersion: lines.inputVersion,
    resultProvenance: {
      basisRevision: lineResults.basisRevision,
      inputVersion: lineResults.inputVersion,
      calcVersion: lineResults.calcVersion,
    },
    shownCandidate: sql<CandidateRow | null>`(select c from json_array_elements(${lineResults.candidates}) c
      where (c->>${sql.raw(String(CANDIDATE_MM_POSITION))})::float8 = coalesce(${lineDesigns.thicknessMm}, ${lineResults.recommendedMm}) limit 1)`,
  })
  .from(lines)
  .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
  .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
  .where(sql`${lines.id} = any(${sql.placeholder('ids')}::uuid[])`)
  .prepare('line_table_rows');

export async function listAreas({ projectId }: { projectId: string }) {
  const r = await db
    .selectDistinct({ area: lines.area })
    .from(lines)
    .where(eq(lines.projectId, projectId))
    .orderBy(asc(lines.area));
  return r.map((x) => x.area);
}

export async function getLine({ projectId, lineId }: { projectId: string; lineId: string }) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(lineId))
    throw new AppError('not_found');
  const [row] = await db
    .select({ line: lines, result: lineResults, design: lineDesigns })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(and(eq(lines.id, lineId), eq(lines.projectId, projectId)));
  if (!row) throw new AppError('not_found');
  const { revision } = await getDesignBasis({ projectId });
  const stale = isResultStale(row.result, row.line, revision);
  return { ...row, stale };
}
