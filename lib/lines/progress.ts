/** How far a project has come, counted per step for the overview — reads only. */
import { and, count, desc, eq, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { boqIssues, lineDesigns, lineResults, lines } from '@/db/schema';
import { collectBillLines } from '@/lib/boq/store';
import { currentFlags } from '@/lib/review/store';
import { getDesignBasis } from './basis-store';
import { staleSql } from './stale';

export interface ProjectProgress {
  lines: number;
  /** Lines with a current (not stale) result. */
  solved: number;
  /** Lines with a chosen thickness that needs no re-decision. */
  decided: number;
  /** Lines with a safety flag (hot surface, sweating, interface limit, below a criterion). */
  flagged: number;
  /** Flagged lines whose current decision is in a signed-off review round. */
  signedOff: number;
  /** Lines counted in the latest issued bill (null: none issued yet). */
  billed: number | null;
  lastIssue: number | null;
}

export async function projectProgress({ projectId }: { projectId: string }): Promise<ProjectProgress> {
  const { revision } = await getDesignBasis({ projectId });
  const [[{ total }], [{ solved }], [{ decided }], [last], bill] = await Promise.all([
    db.select({ total: count() }).from(lines).where(eq(lines.projectId, projectId)),
    db
      .select({ solved: count() })
      .from(lines)
      .innerJoin(lineResults, eq(lineResults.lineId, lines.id))
      .where(and(eq(lines.projectId, projectId), sql`not (${staleSql(revision)})`)),
    db
      .select({ decided: count() })
      .from(lineDesigns)
      .where(and(eq(lineDesigns.projectId, projectId), eq(lineDesigns.needsRedecision, false))),
    db
      .select({ number: boqIssues.number, counted: boqIssues.counted })
      .from(boqIssues)
      .where(eq(boqIssues.projectId, projectId))
      .orderBy(desc(boqIssues.number))
      .limit(1),
    collectBillLines({ projectId }),
  ]);
  // The same safety flags the bill waits for (lib/boq/store.ts).
  const SAFETY = ['hot-surface', 'sweating', 'interface-limit', 'below-criterion'];
  const flaggedTags = new Set(
    (await currentFlags({ projectId }))
      .filter((f) => f.flags.some((x) => SAFETY.includes(x.type)))
      .map((f) => f.tag),
  );
  const flaggedLines = bill.filter((l) => flaggedTags.has(l.tag));
  return {
    lines: Number(total),
    solved: Number(solved),
    decided: Number(decided),
    flagged: flaggedLines.length,
    signedOff: flaggedLines.filter(
      (l) => l.reviewStatus.startsWith('signed off') && !l.reviewStatus.endsWith('(re-opened)'),
    ).length,
    billed: last?.counted ?? null,
    lastIssue: last?.number ?? null,
  };
}
