'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import * as review from '@/lib/review/store';
import { DISPOSITIONS } from '@/lib/review/dispositions';

export const requestReviewAction = projectAction(
  'review.request',
  z.object({ area: z.string().max(200).optional(), note: z.string().max(1000).optional() }),
  async ({ project, user, input }) => {
    const r = await review.requestReview({
      projectId: project.id,
      userId: user.id,
      area: input.area || undefined,
      note: input.note ?? '',
    });
    revalidatePath(`/projects/${project.id}/review`);
    return {
      roundId: r.round.id,
      number: r.round.number,
      lines: r.lines,
      carried: r.carried,
      notified: r.notified,
    };
  },
);

export const disposeAction = projectAction(
  'review.dispose',
  z.object({
    roundId: z.uuid(),
    itemIds: z.array(z.uuid()).min(1, { error: 'Choose at least one line.' }),
    disposition: z.enum(DISPOSITIONS, { error: 'Choose a disposition.' }),
    comment: z.string().max(2000).optional(),
    requiredMm: z.number().min(0).max(2000).optional(),
  }),
  async ({ project, user, input }) => {
    const r = await review.dispose({ projectId: project.id, userId: user.id, ...input });
    revalidatePath(`/projects/${project.id}/review/${input.roundId}`);
    return r;
  },
);

export const signOffAction = projectAction(
  'review.signoff',
  z.object({ roundId: z.uuid() }),
  async ({ project, user, input }) => {
    const r = await review.signOff({ projectId: project.id, roundId: input.roundId, userId: user.id });
    revalidatePath(`/projects/${project.id}/review`, 'layout');
    return r;
  },
);
