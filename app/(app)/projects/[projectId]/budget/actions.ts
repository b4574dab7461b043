'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { dashboard, saveBudget } from '@/lib/budget/store';

export const saveBudgetAction = projectAction(
  'budget.edit',
  z.unknown(),
  async ({ project, user, input }) => {
    const b = await saveBudget({ projectId: project.id, userId: user.id, budget: input });
    revalidatePath(`/projects/${project.id}/budget`);
    return b;
  },
);

/** What-if totals, computed on the server from the saved results; nothing is saved. */
export const whatIfAction = projectAction(
  'budget.read',
  z.object({
    energyPricePerKWh: z.number().min(0).max(10),
    hoursPerYear: z.number().min(0).max(8784),
    policy: z.enum(['chosen', 'recommended', 'economic-plus-one']),
  }),
  async ({ project, input }) => {
    const d = await dashboard({ projectId: project.id, whatIf: input });
    return { bare: d.bare, designed: d.designed, savings: d.savings, warnings: d.warnings };
  },
);
