import 'server-only';
import { notFound } from 'next/navigation';
import { requireUser } from '@/lib/auth/session';
import { getOrganizationAccess, getProjectAccess } from '@/db/queries/projects';
import { can, type Action } from '@/lib/auth/permissions';
import { isAppError } from '@/lib/errors';

/** For project pages: the signed-in user, the project and their role; 404 for a project they cannot see. */
export async function loadProject(projectId: string, action: Action = 'project.view') {
  const { user } = await requireUser();
  const access = await orNotFound(getProjectAccess({ userId: user.id, projectId }));
  return { user, ...access, allowed: can(access.role, action) };
}

/** For organization pages: the user and their role; 404 outside their organizations. */
export async function loadOrganization(organizationId: string, action: Action) {
  const { user } = await requireUser();
  const { role } = await orNotFound(getOrganizationAccess({ userId: user.id, organizationId }));
  return { user, role, allowed: can(role, action) };
}

/** Awaits a lookup and turns its `not_found` into the 404 page. */
export async function orNotFound<T>(p: Promise<T>): Promise<T> {
  try {
    return await p;
  } catch (e) {
    if (isAppError(e) && e.code === 'not_found') notFound();
    throw e;
  }
}
