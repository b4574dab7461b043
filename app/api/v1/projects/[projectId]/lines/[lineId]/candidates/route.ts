import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { getPickerOptions } from '@/lib/lines/picker';

/**
 * One line's thickness options, read when its picker opens (the table itself does not carry
 * them): each candidate's surface temperature under every applicable criterion's conditions and
 * the limits beside them.
 */
export const GET = route<{ projectId: string; lineId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  return Response.json(await getPickerOptions({ projectId: project.id, lineId: params.lineId }));
});
