'use server';
import { revalidatePath } from 'next/cache';
import { parseWithZod } from '@conform-to/zod/v4';
import type { SubmissionResult } from '@conform-to/react';
import { validateRequest } from '@/lib/auth/session';
import { getOrganizationAccess } from '@/db/queries/projects';
import { AppError, isAppError } from '@/lib/errors';
import { saveSsoConfig, ssoConfigSchema, approveMembershipRequest } from '@/lib/auth/sso';
import { z } from 'zod';
import { logUnexpected } from '@/lib/log';


export async function saveCompanySignInAction(_prev: unknown, formData: FormData): Promise<SubmissionResult<string[]>> {
  const submission = parseWithZod(formData, { schema: ssoConfigSchema });
  const { user } = await validateRequest();
  if (!user) return submission.reply({ formErrors: ['Your session has ended. Sign in again.'], hideFields: ['clientSecret'] });
  if (submission.status !== 'success') return submission.reply({ hideFields: ['clientSecret'] });
  try {
    await getOrganizationAccess({ userId: user.id, organizationId: submission.value.organizationId, action: 'org.settings' });
    await saveSsoConfig({ ...submission.value, newMemberRole: submission.value.newMemberRole ?? '', domains: submission.value.domains.join(' ') });
    revalidatePath(`/orgs/${submission.value.organizationId}/company-sign-in`);
    return { ...submission.reply({ hideFields: ['clientSecret'] }), status: 'success' };
  } catch (e) {
    if (isAppError(e)) return submission.reply({ formErrors: e.fields ? [] : [e.message], fieldErrors: e.fields, hideFields: ['clientSecret'] });
    logUnexpected('sso settings', e);
    return submission.reply({ formErrors: ['Something went wrong on our side. Nothing was saved.'], hideFields: ['clientSecret'] });
  }
}

export async function approveRequestAction(formData: FormData) {
  const input = z.object({ organizationId: z.uuid(), userId: z.string().min(1), role: z.enum(['owner', 'engineer', 'reviewer', 'contractor']) }).parse(Object.fromEntries(formData));
  const { user } = await validateRequest();
  if (!user) throw new AppError('unauthenticated');
  await getOrganizationAccess({ userId: user.id, organizationId: input.organizationId, action: 'members.manage' });
  await approveMembershipRequest(input);
  revalidatePath(`/orgs/${input.organizationId}/members`);
}
