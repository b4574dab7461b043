import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { getLineCandidates } from '@/lib/lines/store';

/** One line's thickness options, read when its picker opens (the table itself does not carry them). */
export const GET = route<{ projectId: string; lineId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({ userId: user.id, projectId: params.projectId, action: 'lines.read' });
  return Response.json({ candidates: await getLineCandidates({ projectId: project.id, lineId: params.lineId }) });
});
