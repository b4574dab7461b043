'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { issueBill } from '@/lib/boq/store';

export const issueBillAction = projectAction('boq.issue', z.object({}), async ({ project, user }) => {
  const issue = await issueBill({ projectId: project.id, userId: user.id });
  revalidatePath(`/projects/${project.id}/boq`);
  return { number: issue.number, counted: issue.counted, pending: issue.pending };
});
