'use server';
import { revalidatePath } from 'next/cache';
import type { z } from 'zod';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction, type OrganizationFormCtx } from '@/lib/server/action';
import * as auth from '@/lib/auth/service';

// Members are organization-scoped: the wrapper checks the role on the organization named in the form.
type Ctx<K extends keyof typeof formSchemas> = OrganizationFormCtx<z.infer<(typeof formSchemas)[K]>>;

export const inviteAction = formAction({
  schema: formSchemas.invite,
  permission: 'members.manage',
  organizationIdField: 'organizationId',
  handler: async ({ user, input }: Ctx<'invite'>) => {
    await auth.inviteMember({ actorId: user.id, ...input });
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});

export const changeRoleAction = formAction({
  schema: formSchemas.changeRole,
  permission: 'members.manage',
  organizationIdField: 'organizationId',
  handler: async ({ input }: Ctx<'changeRole'>) => {
    await auth.changeMemberRole(input);
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});

export const removeMemberAction = formAction({
  schema: formSchemas.removeMember,
  permission: 'members.manage',
  organizationIdField: 'organizationId',
  handler: async ({ input }: Ctx<'removeMember'>) => {
    await auth.removeMember(input);
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});
