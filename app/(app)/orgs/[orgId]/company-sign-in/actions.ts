'use server';
import { revalidatePath } from 'next/cache';
import {
  saveSsoConfig,
  ssoConfigSchema,
  approveMembershipRequest,
  refuseMembershipRequest,
  requestDomainProof,
} from '@/lib/auth/sso';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction, organizationFormAction, type OrganizationFormCtx } from '@/lib/server/action';
import { z } from 'zod';

/** The organization's company sign-in settings (owners only); the client secret is never echoed back. */
export const saveCompanySignInAction = formAction({
  schema: ssoConfigSchema,
  permission: 'org.settings',
  organizationIdField: 'organizationId',
  resetForm: false,
  hideFields: ['clientSecret'],
  handler: async ({ input }: OrganizationFormCtx<z.infer<typeof ssoConfigSchema>>) => {
    await saveSsoConfig({
      ...input,
      newMemberRole: input.newMemberRole ?? '',
      domains: input.domains.join(' '),
    });
    revalidatePath(`/orgs/${input.organizationId}/company-sign-in`);
  },
});

/** Mails the domain-proof link to the chosen administrative mailbox of a claimed domain (owners only). */
export const sendDomainProofAction = formAction({
  schema: formSchemas.domainProof,
  permission: 'org.settings',
  organizationIdField: 'organizationId',
  handler: async ({ user, input }: OrganizationFormCtx<z.infer<typeof formSchemas.domainProof>>) => {
    const r = await requestDomainProof({ ...input, actorId: user.id });
    revalidatePath(`/orgs/${input.organizationId}/company-sign-in`);
    return r;
  },
});

const requestInput = z.object({
  organizationId: z.uuid(),
  userId: z.string().min(1),
  role: z.enum(['owner', 'engineer', 'reviewer', 'contractor']),
});

export const approveRequestAction = organizationFormAction({
  schema: requestInput,
  permission: 'members.manage',
  invalid: 'Role: choose a role for the person.',
  handler: async ({ input }) => {
    await approveMembershipRequest(input);
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});

/** Refusing sticks: the person's company sign-in does not file a new request until an owner invites them. */
export const refuseRequestAction = organizationFormAction({
  schema: formSchemas.membershipRequest,
  permission: 'members.manage',
  invalid: 'The request to refuse is missing; reload the page.',
  handler: async ({ input }) => {
    await refuseMembershipRequest(input);
    revalidatePath(`/orgs/${input.organizationId}/members`);
  },
});
