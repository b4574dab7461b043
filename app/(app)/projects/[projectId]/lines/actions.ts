'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { ownAction, projectAction, projectFormDataAction } from '@/lib/server/action';
import { saveLineTableView } from '@/db/queries/preferences';
import { lineTableViewSchema } from '@/lib/preferences/line-table-view';
import { AppError } from '@/lib/errors';
import { MAX_UPLOAD_BYTES } from '@/lib/lines';
import { lineFilterSchema } from '@/lib/lines/filter';
import { readImportRequest } from '@/lib/lines/import-request';
import { applyBulkAccept, previewBulkAccept, undoBulkAccept } from '@/lib/lines/bulk-accept';
import { storeUpload } from '@/lib/lines/import-store';
import { pickDesign, pickVesselParts } from '@/lib/lines/picks-store';
import { enqueueJob } from '@/lib/jobs/store';

// The mapping step's request is read by readImportRequest in the handler (after the session and
// role checks), so every malformed part becomes a sentence about its field rather than schema text.
const draftInput = z.unknown();

/**
 * Upload: FormData with `file`. The request checks the size, keeps the file in the object store and
 * enqueues its reading ("read-upload"); the worker reads it (limits first) and the page follows the
 * job to the mapping step.
 */
export const uploadLineListAction = projectFormDataAction(
  'lines.edit',
  async ({ project, user, formData }) => {
    const file = formData.get('file');
    if (!(file instanceof File) || file.size === 0)
      throw new AppError('invalid', 'Choose a line-list file (.xlsx or .csv).', { file: ['Choose a file.'] });
    if (file.size > MAX_UPLOAD_BYTES)
      throw new AppError(
        'invalid',
        `The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is 20 MB.`,
        { file: ['File too large.'] },
      );
    const upload = await storeUpload({
      projectId: project.id,
      fileName: file.name,
      bytes: Buffer.from(await file.arrayBuffer()),
    });
    return enqueueJob({ projectId: project.id, userId: user.id, kind: 'read-upload', input: { ...upload } });
  },
  'The file could not be kept. Nothing was imported.',
);

/** The mapping step's check (every row validated, compared with the current list) runs in the worker. */
export const previewImportAction = projectAction('lines.edit', draftInput, async ({ project, user, input }) =>
  enqueueJob({
    projectId: project.id,
    userId: user.id,
    kind: 'check-import',
    input: { ...readImportRequest(input) },
  }),
);

/** Import + solve is a background job: the request records and enqueues it and returns the job. */
export const commitImportAction = projectAction(
  'lines.edit',
  draftInput,
  async ({ project, user, input }) => {
    const req = readImportRequest(input);
    return enqueueJob({ projectId: project.id, userId: user.id, kind: 'import-solve', input: { ...req } });
  },
);

export const solveLinesAction = projectAction(
  'lines.edit',
  z.object({ all: z.boolean().default(false) }),
  async ({ project, user, input }) =>
    enqueueJob({ projectId: project.id, userId: user.id, kind: 'solve-all', input: { all: input.all } }),
);

/** A batch of calculation sheets for exactly the table's filter, produced by the worker (a zip, one PDF per line). */
export const startSheetsBatchAction = projectAction(
  'lines.read',
  z.object({ filter: lineFilterSchema }),
  async ({ project, user, input }) =>
    enqueueJob({
      projectId: project.id,
      userId: user.id,
      kind: 'sheets-batch',
      input: { filter: { q: input.filter.q, area: input.filter.area, status: input.filter.status } },
    }),
);

export const pickThicknessAction = projectAction(
  'design.pick',
  z.object({
    lineId: z.uuid(),
    thicknessMm: z.number().min(0).max(2000),
    reason: z.string().max(500).optional(),
    expectedVersion: z.number().int().min(0),
  }),
  async ({ project, user, input }) => pickDesign({ projectId: project.id, userId: user.id, ...input }),
);

const partPick = z.object({ thicknessMm: z.number().min(0).max(2000), guarded: z.boolean().optional() });
/** A vessel picked part by part (lib/lines/vessel-pick.ts): shell and each head, a head may be guarded. */
export const pickVesselPartsAction = projectAction(
  'design.pick',
  z.object({
    lineId: z.uuid(),
    parts: z.object({ shell: partPick, top: partPick, bottom: partPick }),
    reason: z.string().max(500).optional(),
    expectedVersion: z.number().int().min(0),
  }),
  async ({ project, user, input }) => pickVesselParts({ projectId: project.id, userId: user.id, ...input }),
);

const bulkItems = z
  .array(z.object({ lineId: z.uuid(), version: z.number().int().min(0), thicknessMm: z.number().min(0) }), {
    error: 'The lines to accept are missing; press the button again.',
  })
  .max(100_000, { error: 'Too many lines at once; narrow the filter.' });

/** What "accept recommendation for the filtered lines" would change for the table's exact filter (reads only). */
export const previewBulkAcceptAction = projectAction(
  'design.pick',
  z.object({ filter: lineFilterSchema }),
  async ({ project, input }) => previewBulkAccept({ projectId: project.id, filter: input.filter }),
);

/** Applies exactly the lines the preview returned; refused when any of them moved since. */
export const applyBulkAcceptAction = projectAction(
  'design.pick',
  z.object({ filter: lineFilterSchema, items: bulkItems }),
  async ({ project, user, input }) => {
    const r = await applyBulkAccept({
      projectId: project.id,
      userId: user.id,
      filter: input.filter,
      items: input.items,
    });
    revalidatePath(`/projects/${project.id}/lines`);
    return r;
  },
);

export const undoBulkAcceptAction = projectAction(
  'design.pick',
  z.object({ bulkAcceptId: z.uuid({ error: 'That bulk accept is not known; reload the page.' }) }),
  async ({ project, user, input }) => {
    const r = await undoBulkAccept({
      projectId: project.id,
      userId: user.id,
      bulkAcceptId: input.bulkAcceptId,
    });
    revalidatePath(`/projects/${project.id}/lines`);
    return r;
  },
);

/**
 * The line table's hidden columns and row density, kept for the signed-in person (not the project): the
 * same view in every browser they sign in from. Key columns cannot be hidden (refused with a sentence).
 */
export const saveLineTableViewAction = ownAction(lineTableViewSchema, async ({ user, input }) =>
  saveLineTableView({ userId: user.id, view: input }),
);
