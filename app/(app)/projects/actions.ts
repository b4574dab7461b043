'use server';
import { redirect } from 'next/navigation';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction } from '@/lib/server/action';
import { createProject, getOrganizationAccess } from '@/db/queries/projects';

const create = formAction({
  schema: formSchemas.createProject,
  handler: async ({ user, input }) => {
    await getOrganizationAccess({
      userId: user.id,
      organizationId: input.organizationId,
      action: 'project.create',
    });
    return createProject(input);
  },
});

export async function createProjectAction(prev: unknown, fd: FormData) {
  const r = await create(prev, fd);
  if (r.status === 'success' && r.data) redirect(`/projects/${(r.data as { id: string }).id}`);
  return r;
}
