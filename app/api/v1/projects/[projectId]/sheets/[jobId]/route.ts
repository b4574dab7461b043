import { and, eq } from 'drizzle-orm';
import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { db } from '@/db/client';
import { sheetBatches } from '@/db/schema';
import { download } from '@/lib/documents/requests';
import { AppError } from '@/lib/errors';

/** The PDF a finished batch-of-sheets job produced. */
export const GET = route<{ projectId: string; jobId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(params.jobId))
    throw new AppError('not_found');
  const [b] = await db
    .select({ pdf: sheetBatches.pdf, fileName: sheetBatches.fileName })
    .from(sheetBatches)
    .where(and(eq(sheetBatches.jobId, params.jobId), eq(sheetBatches.projectId, project.id)));
  if (!b)
    throw new AppError(
      'not_found',
      'This batch of calculation sheets is not ready (or does not exist); wait for its job to finish.',
    );
  return download(b.pdf, b.fileName, 'application/pdf');
});
