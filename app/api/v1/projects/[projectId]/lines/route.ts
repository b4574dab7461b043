import { z } from 'zod';
import { projectAccess, route, fieldsFromZod } from '@/lib/server/route';
import { getDesignBasis, getLine, inputOf, listLines } from '@/lib/lines/store';
import { lineFilterSchema } from '@/lib/lines/filter';
import { candidateNumbers, decidingLimits, worstMargin, type CandidateRow } from '@/lib/lines/deciding';
import type { LineInput } from '@/lib/lines/validate';
import { AppError } from '@/lib/errors';

const querySchema = lineFilterSchema.extend({
  page: z.coerce.number().int().min(0).default(0),
  size: z.coerce.number().int().min(1).max(500).default(100),
  sort: z.enum(['tag', 'area', 'normalTempC', 'outsideDiameterMm', 'recommendedMm', 'heatFlowPerUnit', 'surfaceTempC', 'governing']).default('tag'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});

/** Server-side paginated, sorted and filtered line table. */
export const GET = route<{ projectId: string }>(async (ctx) => {
  const { req, params } = ctx;
  const { project } = await projectAccess(ctx, params.projectId, 'lines.read');
  const q = querySchema.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!q.success) throw new AppError('invalid', 'Some query parameters are not valid.', fieldsFromZod(q.error));
  const r = await listLines({ projectId: project.id, ...q.data });
  const { basis } = await getDesignBasis({ projectId: project.id });
  // The candidate table is sent trimmed to what the inline pick shows: each candidate's surface
  // temperature under every applicable criterion's conditions, the limits beside them, and the
  // worst margin at the chosen thickness (or the recommendation while nothing is chosen).
  const rows = await Promise.all(r.rows.map(async ({ candidates, ...row }) => {
    const stored = (candidates ?? []) as CandidateRow[];
    const facts = { outdoor: row.outdoor, accessible: row.accessible, normalTempC: row.normalTempC, maxTempC: row.maxTempC, purposes: row.purposes } as LineInput;
    const limits = decidingLimits(basis, facts, row.jacketId);
    // Results stored before every candidate was swept: the full line is loaded to solve the rest.
    const gaps = stored.some((c) => (limits.personnelLimitC !== null && c[4] === null) || (limits.condensationNeedC !== null && (c[7] ?? null) === null));
    const line = gaps ? inputOf((await getLine({ projectId: project.id, lineId: row.id })).line) : facts;
    const nums = candidateNumbers(basis, line, row.jacketId, stored, limits);
    const at = nums.find((c) => c.mm === (row.chosenMm ?? row.recommendedMm));
    return { ...row, limits, worstMargin: at ? worstMargin(at, limits) : null, candidates: nums.map((c) => ({ mm: c.mm, heatFlow: c.heatFlow, surfaceC: c.heatLossC, personnelC: c.personnelC, condensationC: c.condensationC, ok: c.ok })) };
  }));
  ctx.note({ rows: rows.length });
  return Response.json({ ...r, rows });
}, { scope: 'lines:read' });
