import { and, eq } from 'drizzle-orm';
import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { db } from '@/db/client';
import { sheetBatches } from '@/db/schema';
import { download } from '@/lib/documents/requests';
import { AppError } from '@/lib/errors';
import { getDocument } from '@/lib/storage/documents';

/** The zip (one PDF per line) a finished batch-of-sheets job produced. */
export const GET = route<{ projectId: string; jobId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(params.jobId))
    throw new AppError('not_found');
  const [b] = await db
    .select({
      pdf: sheetBatches.pdf,
      fileName: sheetBatches.fileName,
      key: sheetBatches.documentKey,
      sha256: sheetBatches.documentSha256,
      bytes: sheetBatches.documentBytes,
    })
    .from(sheetBatches)
    .where(and(eq(sheetBatches.jobId, params.jobId), eq(sheetBatches.projectId, project.id)));
  if (!b)
    throw new AppError(
      'not_found',
      'This batch of calculation sheets is not ready (or does not exist); wait for its job to finish.',
    );
  // Batches are kept in the object store (checked against their SHA-256); older ones kept their PDF here.
  if (b.key && b.sha256 && b.bytes !== null) {
    const buf = await getDocument({ key: b.key, sha256: b.sha256, bytes: b.bytes });
    return download(buf, b.fileName, b.fileName.endsWith('.zip') ? 'application/zip' : 'application/pdf');
  }
  if (!b.pdf) throw new AppError('not_found');
  return download(b.pdf, b.fileName, 'application/pdf');
});
