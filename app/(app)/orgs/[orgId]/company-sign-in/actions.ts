'use server';
import { revalidatePath } from 'next/cache';
import { parseWithZod } from '@conform-to/zod/v4';
import type { SubmissionResult } from '@conform-to/react';
import { validateRequest } from '@/lib/auth/session';
import { getOrganizationAccess } from '@/db/queries/projects';
import { AppError, isAppError } from '@/lib/errors';
import {
  saveSsoConfig,
  ssoConfigSchema,
  approveMembershipRequest,
  refuseMembershipRequest,
  requestDomainProof,
} from '@/lib/auth/sso';
import { formSchemas } from '@/lib/forms/schemas';
import { formAction } from '@/lib/server/action';
import { z } from 'zod';
import { logUnexpected } from '@/lib/log';

export async function saveCompanySignInAction(
  _prev: unknown,
  formData: FormData,
): Promise<SubmissionResult<string[]>> {
  const submission = parseWithZod(formData, { schema: ssoConfigSchema });
  const { user } = await validateRequest();
  if (!user)
    return submission.reply({
      formErrors: ['Your session has ended. Sign in again.'],
      hideFields: ['clientSecret'],
    });
  if (submission.status !== 'success') return submission.reply({ hideFields: ['clientSecret'] });
  try {
    await getOrganizationAccess({
      userId: user.id,
      organizationId: submission.value.organizationId,
      action: 'org.settings',
    });
    await saveSsoConfig({
      ...submission.value,
      newMemberRole: submission.value.newMemberRole ?? '',
      domains: submission.value.domains.join(' '),
    });
    revalidatePath(`/orgs/${submission.value.organizationId}/company-sign-in`);
    return { ...submission.reply({ hideFields: ['clientSecret'] }), status: 'success' };
  } catch (e) {
    if (isAppError(e))
      return submission.reply({
        formErrors: e.fields ? [] : [e.message],
        fieldErrors: e.fields,
        hideFields: ['clientSecret'],
      });
    logUnexpected('sso settings', e);
    return submission.reply({
      formErrors: ['Something went wrong on our side. Nothing was saved.'],
      hideFields: ['clientSecret'],
    });
  }
}

/** Mails the domain-proof link to the chosen administrative mailbox of a claimed domain (owners only). */
export const sendDomainProofAction = formAction({
  schema: formSchemas.domainProof,
  handler: async ({ user, input }) => {
    await getOrganizationAccess({
      userId: user.id,
      organizationId: input.organizationId,
      action: 'org.settings',
    });
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

export async function approveRequestAction(formData: FormData) {
  const parsed = requestInput.safeParse(Object.fromEntries(formData));
  if (!parsed.success) throw new AppError('invalid', 'Role: choose a role for the person.');
  const { user } = await validateRequest();
  if (!user) throw new AppError('unauthenticated');
  await getOrganizationAccess({
    userId: user.id,
    organizationId: parsed.data.organizationId,
    action: 'members.manage',
  });
  await approveMembershipRequest(parsed.data);
  revalidatePath(`/orgs/${parsed.data.organizationId}/members`);
}

/** Refusing sticks: the person's company sign-in does not file a new request until an owner invites them. */
export async function refuseRequestAction(formData: FormData) {
  const parsed = formSchemas.membershipRequest.safeParse(Object.fromEntries(formData));
  if (!parsed.success) throw new AppError('invalid', 'The request to refuse is missing; reload the page.');
  const { user } = await validateRequest();
  if (!user) throw new AppError('unauthenticated');
  await getOrganizationAccess({
    userId: user.id,
    organizationId: parsed.data.organizationId,
    action: 'members.manage',
  });
  await refuseMembershipRequest(parsed.data);
  revalidatePath(`/orgs/${parsed.data.organizationId}/members`);
}
