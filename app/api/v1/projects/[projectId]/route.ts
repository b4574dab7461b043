import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';

export const GET = route<{ projectId: string }>(async ({ user, params }) => {
  const { project, role, organizationName } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'project.view',
  });
  return Response.json({
    id: project.id,
    code: project.code,
    name: project.name,
    site: project.site,
    organizationName,
    role,
  });
});
