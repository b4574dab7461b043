'use server';
import { revalidatePath } from 'next/cache';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction } from '@/lib/server/action';
import { getOrganizationAccess } from '@/db/queries/projects';
import * as auth from '@/lib/auth/service';

/** Members are organization-scoped: the role is checked on the organization named in the form. */
const assertOwner = (userId: string, organizationId: string) =>
  getOrganizationAccess({ userId, organizationId, action: 'members.manage' });

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
