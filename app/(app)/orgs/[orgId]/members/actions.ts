'use server';
import { revalidatePath } from 'next/cache';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction } from '@/lib/server/action';
import { getMembershipRole } from '@/db/queries/projects';
import { can } from '@/lib/auth/permissions';
import { AppError } from '@/lib/errors';
import * as auth from '@/lib/auth/service';

/** Members are organization-scoped: the role is checked on the organization named in the form. */
async function assertOwner(userId: string, organizationId: string) {
  const role = await getMembershipRole({ userId, organizationId });
  if (!role) throw new AppError('not_found');
  if (!can(role, 'members.manage')) throw new AppError('forbidden');
}

export const inviteAction = formAction({
  schema: formSchemas.invite,
  handler: async ({ user, input }) => {
    await assertOwner(user.id, input.organizationId);
    await auth.inviteMember({ actorId: user.id, ...input });
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});

export const changeRoleAction = formAction({
  schema: formSchemas.changeRole,
  handler: async ({ user, input }) => {
    await assertOwner(user.id, input.organizationId);
    await auth.changeMemberRole(input);
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});

export const removeMemberAction = formAction({
  schema: formSchemas.removeMember,
  handler: async ({ user, input }) => {
    await assertOwner(user.id, input.organizationId);
    await auth.removeMember(input);
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});
