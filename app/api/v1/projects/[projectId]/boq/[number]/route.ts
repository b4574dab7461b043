import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { issueWorkbook } from '@/lib/boq/store';
import { AppError } from '@/lib/errors';

/** Download of an issued bill revision (only issued revisions exist to download). */
export const GET = route<{ projectId: string; number: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({ userId: user.id, projectId: params.projectId, action: 'boq.read' });
  const n = Number(params.number);
  if (!Number.isInteger(n) || n < 1) throw new AppError('not_found', 'Only issued revisions can be downloaded.');
  const { buf, fileName } = await issueWorkbook({ projectId: project.id, number: n });
  return new Response(new Uint8Array(buf), {
    headers: { 'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', 'content-disposition': `attachment; filename="${fileName}"` },
  });
});
