import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { issueWorkbook } from '@/lib/boq/store';
import { AppError } from '@/lib/errors';

/** Download of an issued bill revision (only issued revisions exist to download). */
export const GET = route<{ projectId: string; number: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'boq.read',
  });
  // Strictly digits: Number() would read "0x1", "1e0" or " 1" as 1.
  const n = /^[1-9][0-9]{0,8}$/.test(params.number) ? Number(params.number) : NaN;
  if (!Number.isInteger(n)) throw new AppError('not_found', 'Only issued revisions can be downloaded.');
  const { buf, fileName } = await issueWorkbook({ projectId: project.id, number: n });
  return new Response(new Uint8Array(buf), {
    headers: {
      'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      'content-disposition': `attachment; filename="${fileName}"`,
    },
  });
});
