import { z } from 'zod';
import { projectAccess, route, fieldsFromZod } from '@/lib/server/route';
import { lineFilterSchema } from '@/lib/lines/filter';
import { lineTablePage } from '@/lib/lines/picker';
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
export const GET = route<{ projectId: string }>(
  async (ctx) => {
    const { req, params } = ctx;
    const { project } = await projectAccess(ctx, params.projectId, 'lines.read');
    const q = querySchema.safeParse(Object.fromEntries(req.nextUrl.searchParams));
    if (!q.success)
      throw new AppError('invalid', 'Some query parameters are not valid.', fieldsFromZod(q.error));
    const page = await lineTablePage({ projectId: project.id, ...q.data });
    ctx.note({ rows: page.rows.length });
    return Response.json(page);
  },
  { scope: 'lines:read' },
);
