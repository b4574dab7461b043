'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { projectAction, type ActionResult } from '@/lib/server/action';
import { validateRequest } from '@/lib/auth/session';
import { getProjectAccess } from '@/db/queries/projects';
import { AppError, isAppError } from '@/lib/errors';
import { MAX_UPLOAD_BYTES } from '@/lib/lines';
import { readImportRequest } from '@/lib/lines/import-request';
import type { DraftSummary } from '@/lib/lines/store';
import * as store from '@/lib/lines/store';

// The mapping step's request is read by readImportRequest in the handler (after the session and
// role checks), so every malformed part becomes a sentence about its field rather than schema text.
const draftInput = z.unknown();

/** Upload: FormData with `file`. Checked for size before parsing; nothing is stored but the parsed draft. */
export async function uploadLineListAction(projectId: string, formData: FormData): Promise<ActionResult<DraftSummary>> {
  try {
    const { user } = await validateRequest();
    if (!user) throw new AppError('unauthenticated', 'Your session has ended. Sign in again.');
    await getProjectAccess({ userId: user.id, projectId, action: 'lines.edit' });
    const file = formData.get('file');
    if (!(file instanceof File) || file.size === 0) throw new AppError('invalid', 'Choose a line-list file (.xlsx or .csv).', { file: ['Choose a file.'] });
    if (file.size > MAX_UPLOAD_BYTES) throw new AppError('invalid', `The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is 20 MB.`, { file: ['File too large.'] });
    const bytes = Buffer.from(await file.arrayBuffer());
    return { ok: true, data: await store.createDraft({ projectId, userId: user.id, fileName: file.name, bytes }) };
  } catch (e) {
    if (isAppError(e)) return { ok: false, error: e.message, fields: e.fields };
    console.error('[upload] unexpected', e);
    return { ok: false, error: 'The file could not be read. Nothing was imported.' };
  }
}

export const previewImportAction = projectAction('lines.edit', draftInput, async ({ project, input }) =>
  store.previewDraft({ projectId: project.id, ...readImportRequest(input) }));

export const commitImportAction = projectAction('lines.edit', draftInput, async ({ project, user, input }) => {
  const r = await store.commitDraft({ projectId: project.id, ...readImportRequest(input), userId: user.id });
  const solved = await store.solveProject({ projectId: project.id });
  revalidatePath(`/projects/${project.id}/lines`);
  return { ...r, solved: solved.solved };
});

export const solveLinesAction = projectAction('lines.edit', z.object({ all: z.boolean().default(false) }), async ({ project, input }) => {
  const r = await store.solveProject({ projectId: project.id, all: input.all });
  revalidatePath(`/projects/${project.id}/lines`);
  return r;
});

export const pickThicknessAction = projectAction('design.pick', z.object({
  lineId: z.uuid(), thicknessMm: z.number().min(0).max(2000), reason: z.string().max(500).optional(), expectedVersion: z.number().int().min(0),
}), async ({ project, user, input }) => store.pickDesign({ projectId: project.id, userId: user.id, ...input }));

export const acceptRecommendationsAction = projectAction('design.pick', z.object({ q: z.string().max(100).optional(), area: z.string().max(200).optional() }),
  async ({ project, user, input }) => store.acceptRecommendations({ projectId: project.id, userId: user.id, q: input.q || undefined, area: input.area || undefined }));
