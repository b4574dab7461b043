import { route } from '@/lib/server/route';
import { getProjectAccess } from '@/db/queries/projects';
import { getJob } from '@/lib/jobs/store';

/** One job's state and progress counts. */
export const GET = route<{ projectId: string; jobId: string }>(async ({ user, params }) => {
  const { project } = await getProjectAccess({
    userId: user.id,
    projectId: params.projectId,
    action: 'lines.read',
  });
  return Response.json({ job: await getJob({ projectId: project.id, jobId: params.jobId }) });
});
