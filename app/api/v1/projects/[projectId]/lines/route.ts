import { z } from 'zod';
import { route, fieldsFromZod } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { getDesignBasis, getLine, inputOf, listLines } from '@/lib/lines/store';
import { lineFilterSchema } from '@/lib/lines/filter';
import { tableRowDeciding } from '@/lib/lines/picker';
import type { LineInput } from '@/lib/lines/validate';
import { AppError } from '@/lib/errors';

const querySchema = lineFilterSchema.extend({
  page: z.coerce.number().int().min(0).default(0),
  size: z.coerce.number().int().min(1).max(500).default(100),
  sort: z
    .enum([
      'tag',
      'area',
      'normalTempC',
      'outsideDiameterMm',
      'recommendedMm',
      'heatFlowPerUnit',
      'surfaceTempC',
      'governing',
    ])
    .default('tag'),
  dir: z.enum(['asc', 'desc']).default('asc'),
});

/** Server-side paginated, sorted and filtered line table. */
export const GET = route<{ projectId: string }>(async ({ req, user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  const q = querySchema.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!q.success)
    throw new AppError('invalid', 'Some query parameters are not valid.', fieldsFromZod(q.error));
  const r = await listLines({ projectId: project.id, ...q.data });
  const { basis } = await getDesignBasis({ projectId: project.id });
  // The table's columns, and each row's deciding numbers at the chosen thickness (or the
  // recommendation while nothing is chosen) with the worst margin; the picker's thickness options
  // come from ./[lineId]/candidates.
  const rows = await Promise.all(
    r.rows.map(async ({ shownCandidate, outdoor, accessible, maxTempC, purposes, ...row }) => {
      const facts = { outdoor, accessible, normalTempC: row.normalTempC, maxTempC, purposes } as LineInput;
      const loadLine = async () => inputOf((await getLine({ projectId: project.id, lineId: row.id })).line);
      return { ...row, ...(await tableRowDeciding(basis, facts, row.jacketId, shownCandidate, loadLine)) };
    }),
  );
  return Response.json({ ...r, rows });
});
