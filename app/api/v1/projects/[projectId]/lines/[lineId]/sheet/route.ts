import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { lineSheetPdf } from '@/lib/documents/sheets';
import { download } from '@/lib/documents/requests';

/** The calculation sheet of one line (PDF). */
export const GET = route<{ projectId: string; lineId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  const { buf, fileName } = await lineSheetPdf({ projectId: project.id, lineId: params.lineId });
  return download(buf, fileName, 'application/pdf');
});
