/**
 * Results: solving a project's stale lines (or all of them) and reading lines with their results,
 * decisions and staleness for the table and the line page. The stale rule itself lives in `./stale`.
 */
import { and, asc, count, eq, inArray, sql } from 'drizzle-orm';
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

export async function listLines(o: LineQuery) {
  const { revision } = await getDesignBasis({ projectId: o.projectId });
  const stale = staleSql(revision);
  const where = [lineFilterSql(o.projectId, o, revision)];
  const sortCol = {
    tag: sql`${lines.tagKey} collate "C"`,
    area: lines.area,
    normalTempC: lines.normalTempC,
    outsideDiameterMm: lines.outsideDiameterMm,
    recommendedMm: lineResults.recommendedMm,
    heatFlowPerUnit: lineResults.heatFlowPerUnit,
    surfaceTempC: lineResults.surfaceTempC,
    governing: lineResults.governing,
  }[o.sort];
  // Two steps: the page's ids from a narrow sort (only the sort key travels through the joins and
  // the sort — the wide rows made the sort of a 10,000-line project cost ~40 ms a page), then the
  // columns the table shows for those ids only. The candidate table (the bulk of a result) is read
  // by lib/lines/picker.ts when a picker opens; here only the one candidate the row shows.
  const filtered = and(...where);
  const [page, [{ total }]] = await Promise.all([
    db
      .select({ id: lines.id })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(filtered)
      .orderBy(
        o.dir === 'asc' ? sql`${sortCol} asc nulls last` : sql`${sortCol} desc nulls last`,
        sql`${lines.tagKey} collate "C" asc`,
      )
      .limit(o.size)
      .offset(o.page * o.size),
    db
      .select({ total: count() })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(filtered),
  ]);
  const ids = page.map((r) => r.id);
  const found = ids.length
    ? await db
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
          stale,
          shownCandidate: sql<CandidateRow | null>`(select c from json_array_elements(${lineResults.candidates}) c
            where (c->>${sql.raw(String(CANDIDATE_MM_POSITION))})::float8 = coalesce(${lineDesigns.thicknessMm}, ${lineResults.recommendedMm}) limit 1)`,
        })
        .from(lines)
        .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
        .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
        .where(inArray(lines.id, ids))
    : [];
  const byId = new Map(found.map((r) => [r.id, r]));
  return {
    // In the page's order; a line deleted between the two reads is left out.
    rows: ids.flatMap((id) => byId.get(id) ?? []),
    total,
    page: o.page,
    size: o.size,
  };
}

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
