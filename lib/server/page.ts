import 'server-only';
import { notFound } from 'next/navigation';
import { requireUser } from '@/lib/auth/session';
import { getProjectAccess } from '@/db/queries/projects';
import { can, type Action } from '@/lib/auth/permissions';
import { isAppError } from '@/lib/errors';

/** For project pages: the signed-in user, the project and their role; 404 for a project they cannot see. */
export async function loadProject(projectId: string, action: Action = 'project.view') {
  const { user } = await requireUser();
  try {
    const access = await getProjectAccess({ userId: user.id, projectId });
    return { user, ...access, allowed: can(access.role, action) };
  } catch (e) {
    if (isAppError(e) && e.code === 'not_found') notFound();
    throw e;
  }
}
