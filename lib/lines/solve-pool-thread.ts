/**
 * One worker thread of the solve pool: builds the result rows of a chunk of lines. The context
 * (basis, systems cache) is kept while consecutive chunks come from the same solve.
 */
import type { Line } from '@/db/schema';
import type { DesignBasis } from './design-basis';
import { type ResultContext, resultContext, resultRow } from './result-row';

let ctx: ResultContext | null = null;

export default function solveChunk(task: {
  basis: DesignBasis;
  revision: number;
  projectId: string;
  lines: Line[];
}) {
  const basisJson = JSON.stringify(task.basis);
  if (
    !ctx ||
    ctx.basisJson !== basisJson ||
    ctx.projectId !== task.projectId ||
    ctx.revision !== task.revision
  )
    ctx = resultContext(task);
  return task.lines.map((l) => resultRow(ctx as ResultContext, l));
}
