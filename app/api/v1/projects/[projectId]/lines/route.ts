import { z } from 'zod';
import { route, fieldsFromZod } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
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
export const GET = route<{ projectId: string }>(async ({ req, user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  const q = querySchema.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!q.success)
    throw new AppError('invalid', 'Some query parameters are not valid.', fieldsFromZod(q.error));
  return Response.json(await lineTablePage({ projectId: project.id, ...q.data }));
});
