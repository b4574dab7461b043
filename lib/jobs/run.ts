/**
 * What the worker does with one job. Import + solve run in ONE transaction: the new revision, its
 * lines and their results commit together, so a crash (or a killed worker) leaves the previous
 * revision current and nothing half-done; pg-boss then hands the job out again (retry) and it starts
 * over from the stored draft.
 */
import { eq, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { jobs, sheetBatches } from '@/db/schema';
import { isAppError } from '@/lib/errors';
import { logUnexpected } from '@/lib/log';
import {
  commitDraft,
  type DraftChoice,
  previewDraft,
  readDraft,
  type StoredUpload,
} from '@/lib/lines/import-store';
import { dashboard, type WhatIf } from '@/lib/budget/store';
import { solveProject } from '@/lib/lines/results-store';
import { issueBill } from '@/lib/boq/store';
import type { ColumnMapping } from '@/lib/lines/mapping';
import type { SolvePool } from '@/lib/lines/solve-pool';
import { JOB_KIND_LABEL, QUEUES } from './queues';
import { sheetsBatchZip } from '@/lib/documents/sheets';
import type { LineFilter } from '@/lib/lines/filter';

const progress = (jobId: string) => async (done: number, total: number) => {
  await db.update(jobs).set({ done, total }).where(eq(jobs.id, jobId));
};

export async function runJob(jobId: string, o: { pool?: SolvePool | null } = {}): Promise<void> {
  const pool = o.pool ?? undefined;
  const [job] = await db
    .update(jobs)
    .set({ state: 'running', attempts: sql`${jobs.attempts} + 1`, startedAt: new Date(), error: null })
    .where(sql`${jobs.id} = ${jobId} and ${jobs.state} in ('queued', 'running')`)
    .returning();
  if (!job) return; // already finished (a retry after the result was committed)
  try {
    // The result and the job's "done" commit in the same transaction. A second runner of the same
    // job (pg-boss hands an expired job out again) waits on the job's lock, then sees it done.
    await db.transaction(async (tx) => {
      await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`job:${jobId}`}))`);
      const [now] = await tx.select({ state: jobs.state }).from(jobs).where(eq(jobs.id, jobId));
      if (now?.state !== 'running') return;
      let result: Record<string, unknown>;
      if (job.kind === 'import-solve') {
        const input = job.input as {
          draftId: string;
          sheetName: string;
          headerRow?: number;
          mapping: ColumnMapping;
        };
        const r = await commitDraft({ projectId: job.projectId, userId: job.createdBy ?? '', ...input, tx });
        const s = await solveProject({ projectId: job.projectId, tx, onProgress: progress(jobId), pool });
        result = {
          revision: r.revision,
          lineCount: r.lineCount,
          warningCount: r.warningCount,
          added: r.diff.added.length,
          changed: r.diff.changed.length,
          removed: r.diff.removed.length,
          solved: s.solved,
        };
      } else if (job.kind === 'read-upload') {
        // The mapping step's first answer: the upload read (limits first) into a draft.
        const summary = await readDraft({
          projectId: job.projectId,
          userId: job.createdBy ?? '',
          upload: job.input as unknown as StoredUpload,
          exec: tx,
        });
        result = { ...summary };
      } else if (job.kind === 'check-import') {
        // The mapping step's check: every row validated and compared with the current list; nothing written.
        const input = job.input as unknown as DraftChoice;
        result = { ...(await previewDraft({ ...input, projectId: job.projectId })) };
      } else if (job.kind === 'what-if') {
        // The budget's what-if totals, summed from the stored results; nothing saved.
        const d = await dashboard({ projectId: job.projectId, whatIf: job.input as WhatIf });
        result = { bare: d.bare, designed: d.designed, savings: d.savings, warnings: d.warnings };
      } else if (job.kind === 'sheets-batch') {
        // Calculation sheets of the filtered lines, one PDF per line in a zip kept in the object store.
        const input = job.input as { filter: LineFilter };
        const r = await sheetsBatchZip({
          projectId: job.projectId,
          filter: input.filter,
          key: (fileName) => `projects/${job.projectId}/sheet-batches/${jobId}/${fileName}`,
          onProgress: progress(jobId),
        });
        await tx
          .insert(sheetBatches)
          .values({
            jobId,
            projectId: job.projectId,
            fileName: r.fileName,
            lineCount: r.count,
            documentKey: r.document.key,
            documentSha256: r.document.sha256,
            documentBytes: r.document.bytes,
          })
          .onConflictDoNothing();
        result = { sheets: r.count, fileName: r.fileName, bytes: r.document.bytes };
      } else if (job.kind === 'issue-bill') {
        // Issued inside this transaction: a retry after a crash finds the job done, never a second issue.
        const issue = await issueBill({
          projectId: job.projectId,
          userId: job.createdBy ?? '',
          evenIfUnchanged: Boolean((job.input as { evenIfUnchanged?: boolean }).evenIfUnchanged),
          tx,
        });
        result = { number: issue.number, counted: issue.counted, pending: issue.pending };
      } else {
        const s = await solveProject({
          projectId: job.projectId,
          all: Boolean((job.input as { all?: boolean }).all),
          tx,
          onProgress: progress(jobId),
          pool,
        });
        result = { solved: s.solved };
      }
      await tx.update(jobs).set({ state: 'done', result, finishedAt: new Date() }).where(eq(jobs.id, jobId));
    });
  } catch (e) {
    if (isAppError(e)) {
      // The user's to fix (a changed draft, a validation problem): no retry, the sentence shown.
      await db
        .update(jobs)
        .set({ state: 'failed', error: e.message, finishedAt: new Date() })
        .where(sql`${jobs.id} = ${jobId} and ${jobs.state} <> 'done'`);
      return;
    }
    logUnexpected(`job ${job.kind}`, e);
    const last = job.attempts >= QUEUES[job.kind].retryLimit + 1;
    await db
      .update(jobs)
      .set(
        last
          ? {
              state: 'failed',
              finishedAt: new Date(),
              error: `${JOB_KIND_LABEL[job.kind]} stopped on our side after ${job.attempts} attempts; nothing was changed. Start it again; if it stops again, tell us.`,
            }
          : { state: 'queued', error: 'Stopped on our side; trying again. Nothing was changed.' },
      )
      .where(sql`${jobs.id} = ${jobId} and ${jobs.state} <> 'done'`);
    throw e; // pg-boss retries
  }
}

/**
 * Jobs whose worker vanished (killed mid-job) are retried by pg-boss when they expire; when the
 * retries are used up pg-boss fails them, and this marks our row failed with what to do.
 */
export async function markAbandonedJobs() {
  await db.execute(sql`update jobs set state = 'failed', finished_at = now(),
    error = 'This job stopped on our side and was not finished; nothing was changed. Start it again.'
    where state in ('queued', 'running') and id in (
      select (data->>'jobId')::uuid from pgboss.job where state = 'failed' and name in (${sql.join(
        Object.keys(QUEUES).map((q) => sql`${q}`),
        sql`, `,
      )}))`);
}
