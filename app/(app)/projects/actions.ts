'use server';
import { redirect } from 'next/navigation';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction } from '@/lib/server/action';
import { createProject, getMembershipRole } from '@/db/queries/projects';
import { can } from '@/lib/auth/permissions';
import { AppError } from '@/lib/errors';

const create = formAction({
  schema: formSchemas.createProject,
  handler: async ({ user, input }) => {
    const role = await getMembershipRole({ userId: user.id, organizationId: input.organizationId });
    if (!role) throw new AppError('not_found');
    if (!can(role, 'project.create')) throw new AppError('forbidden');
    return createProject(input);
  },
});

export async function createProjectAction(prev: unknown, fd: FormData) {
  const r = await create(prev, fd);
  if (r.status === 'success' && r.data) redirect(`/projects/${(r.data as { id: string }).id}`);
  return r;
}
