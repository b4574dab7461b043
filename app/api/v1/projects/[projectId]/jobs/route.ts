import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { listJobs } from '@/lib/jobs/store';

/** The project's recent jobs, newest first (the line list polls it while one is active). */
export const GET = route<{ projectId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  return Response.json({ jobs: await listJobs({ projectId: project.id }) });
});
