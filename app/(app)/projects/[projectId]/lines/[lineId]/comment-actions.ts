'use server';
import { z } from 'zod';
import { addComment } from '@/lib/comments/store';
import { projectAction } from '@/lib/server/action';

const RELOAD = 'This page is out of date; reload it and post again.';

/** A comment on a line, or a reply to one of its comments; answers the line's threads. */
export const addLineCommentAction = projectAction(
  'comments.write',
  z.object({
    lineId: z.uuid({ error: RELOAD }),
    parentId: z.uuid({ error: RELOAD }).nullable().default(null),
    body: z.string({ error: 'Write the comment before posting it.' }),
  }),
  async ({ project, user, input }) =>
    addComment({
      projectId: project.id,
      lineId: input.lineId,
      userId: user.id,
      body: input.body,
      parentId: input.parentId,
    }),
);
