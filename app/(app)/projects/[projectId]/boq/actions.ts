'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { enqueueJob } from '@/lib/jobs/store';
import { billFactorsInput, saveBillFactors } from '@/lib/boq/factors';
import { unchangedSince } from '@/lib/boq/store';
import { AppError } from '@/lib/errors';

/**
 * Issuing counts every line of the project and keeps the workbook: a background job; the page
 * follows its progress. A revision identical to the last is refused here unless confirmed (the job
 * checks again inside its transaction).
 */
export const issueBillAction = projectAction(
  'boq.issue',
  z.object({ evenIfUnchanged: z.boolean().default(false) }),
  async ({ project, user, input }) => {
    if (!input.evenIfUnchanged) {
      const same = await unchangedSince({ projectId: project.id });
      if (same !== null)
        throw new AppError(
          'conflict',
          `Nothing changed since issue ${same}: this revision would be identical. Confirm to issue it anyway.`,
        );
    }
    const job = await enqueueJob({
      projectId: project.id,
      userId: user.id,
      kind: 'issue-bill',
      input: { evenIfUnchanged: input.evenIfUnchanged },
    });
    return { jobId: job.id };
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
