'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction } from '@/lib/server/action';
import { issueReport } from '@/lib/documents/report-store';

const schema = z.object({
  note: z
    .string({ error: 'Revision note: write it as text.' })
    .max(300, { error: 'Revision note: at most 300 characters.' })
    .default(''),
});

export const issueReportAction = projectAction('report.issue', schema, async ({ project, user, input }) => {
  const r = await issueReport({ projectId: project.id, userId: user.id, note: input.note });
  revalidatePath(`/projects/${project.id}/report`);
  return { number: r.number };
});
