'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { issueBill } from '@/lib/boq/store';
import { billFactorsInput, saveBillFactors } from '@/lib/boq/factors';

export const issueBillAction = projectAction(
  'boq.issue',
  z.object({ evenIfUnchanged: z.boolean().default(false) }),
  async ({ project, user, input }) => {
    const issue = await issueBill({
      projectId: project.id,
      userId: user.id,
      evenIfUnchanged: input.evenIfUnchanged,
    });
    revalidatePath(`/projects/${project.id}/boq`);
    return { number: issue.number, counted: issue.counted, pending: issue.pending };
  },
);

/** The project's accessory factors with their sources (the next issue uses them; issued bills keep theirs). */
export const saveBillFactorsAction = projectAction(
  'boq.issue',
  billFactorsInput,
  async ({ project, user, input }) => {
    const r = await saveBillFactors({ projectId: project.id, userId: user.id, factors: input });
    revalidatePath(`/projects/${project.id}/boq`);
    return r;
  },
);
