'use server';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { enqueueJob } from '@/lib/jobs/store';

/** Issuing counts every line of the project: a background job; the page follows its progress. */
export const issueBillAction = projectAction('boq.issue', z.object({}), async ({ project, user }) => {
  const job = await enqueueJob({ projectId: project.id, userId: user.id, kind: 'issue-bill', input: {} });
  return { jobId: job.id };
});
