'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { saveBudget } from '@/lib/budget/store';
import { enqueueJob } from '@/lib/jobs/store';

export const saveBudgetAction = projectAction(
  'budget.edit',
  z.unknown(),
  async ({ project, user, input }) => {
    const b = await saveBudget({ projectId: project.id, userId: user.id, budget: input });
    revalidatePath(`/projects/${project.id}/budget`);
    return b;
  },
);

/** What-if totals, summed by the worker from the saved results ("what-if" job); nothing is saved. */
export const whatIfAction = projectAction(
  'budget.read',
  z.object({
    energyPricePerKWh: z.number().min(0).max(10),
    hoursPerYear: z.number().min(0).max(8784),
    policy: z.enum(['chosen', 'recommended', 'economic-plus-one']),
  }),
  async ({ project, user, input }) =>
    enqueueJob({ projectId: project.id, userId: user.id, kind: 'what-if', input }),
);
