/**
 * The one stale rule, for SQL and TypeScript: a line's result is stale when there is none, or when
 * it was computed from another design-basis revision, other line inputs or another calculation
 * version. Both forms come from `currentProvenance`, so they cannot drift apart.
 */
import { and, eq, ilike, or, sql, type SQL } from 'drizzle-orm';
import type { db, Tx } from '@/db/client';
import { designBases, lineDesigns, lineResults, lines } from '@/db/schema';
import { CALCULATION_VERSION } from '@/lib/thermal';
import type { LineFilter } from './filter';

/** What a current result was computed from; `inputVersion` is the line's value or its column. */
function currentProvenance<V>(basisRevision: number, inputVersion: V) {
  return { basisRevision, inputVersion, calcVersion: CALCULATION_VERSION as string };
}
type Provenance = ReturnType<typeof currentProvenance<number>>;
const KEYS = Object.keys(currentProvenance(0, 0)) as (keyof Provenance)[];

export function isResultStale(
  result: Provenance | null | undefined,
  line: { inputVersion: number },
  basisRevision: number,
): boolean {
  if (!result) return true;
  const cur = currentProvenance(basisRevision, line.inputVersion);
  return KEYS.some((k) => result[k] !== cur[k]);
}

/** The same rule over `lines` left-joined with `line_results`. */
export function staleSql(basisRevision: number): SQL<boolean> {
  const cur = currentProvenance(basisRevision, lines.inputVersion);
  return sql<boolean>`(${lineResults.lineId} is null or ${sql.join(
    KEYS.map((k) => sql`${lineResults[k]} <> ${cur[k]}`),
    sql` or `,
  )})`;
}

/** The design basis' revision as stored (1 before the first save, as `getDesignBasis` answers). */
export async function basisRevisionOf(
  exec: Tx | typeof db,
  projectId: string,
  lock?: 'share',
): Promise<number> {
  const q = exec
    .select({ revision: designBases.revision })
    .from(designBases)
    .where(eq(designBases.projectId, projectId));
  const [row] = lock ? await q.for(lock) : await q;
  return row?.revision ?? 1;
}

/**
 * The line table's filter as a condition over `lines` left-joined with `line_results` and
 * `line_designs`: the list and the bulk actions select exactly the same lines.
 */
export function lineFilterSql(projectId: string, f: LineFilter, basisRevision: number): SQL {
  const where: SQL[] = [eq(lines.projectId, projectId)];
  if (f.q) where.push(or(ilike(lines.tag, `%${f.q}%`), ilike(lines.service, `%${f.q}%`))!);
  if (f.area) where.push(eq(lines.area, f.area));
  if (f.status === 'stale') where.push(staleSql(basisRevision));
  if (f.status === 'flagged')
    where.push(sql`(${lineDesigns.belowCriterion} is not null or cardinality(${lineResults.unmet}) > 0)`);
  if (f.status === 'overridden') where.push(eq(lineDesigns.source, 'manual'));
  if (f.status === 'undecided') where.push(sql`${lineDesigns.lineId} is null`);
  if (f.status === 'redecide') where.push(eq(lineDesigns.needsRedecision, true));
  return and(...where)!;
}
