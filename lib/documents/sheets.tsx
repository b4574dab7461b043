/**
 * Calculation sheets from the database: one line, a few filtered lines in one PDF while the browser
 * waits, or a batch of any size as a zip of one PDF per line, made by the worker.
 *
 * Why the batch is a zip of per-line PDFs rendered one at a time: react-pdf lays a document out as one
 * tree, and the "page n of m" footer makes it lay out the whole document again once the page count is
 * known, so time and memory grow faster than the line count (measured 2,058 s and 3.65 GB for 1,000
 * lines as one document). Rendering each line as its own document keeps memory at one sheet's layout
 * and the time linear; each sheet numbers its own pages, which is how a sheet is attached to a
 * specification. A merged single PDF would have to hold the whole output in memory again (no
 * streaming PDF writer merges), so the sheets are streamed into a zip (fflate, stored without
 * recompression: the PDFs are already deflated) written to a temporary file while its SHA-256 is
 * computed, then streamed to the object store.
 */
import { createHash } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { once } from 'node:events';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { Zip, ZipPassThrough } from 'fflate';
import { db } from '@/db/client';
import { lineDesigns, lineResults, lines, organizations, projects } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { putDocumentFile, type StoredDocument } from '@/lib/storage/documents';
import type { LineFilter } from '@/lib/lines/filter';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { isResultStale, lineFilterSql } from '@/lib/lines/stale';
import { renderPdf } from './pdf-kit';
import { SheetsDocument } from './sheet-pdf';
import { sheetModel, type SheetModel } from './sheet-model';

export { SHEETS_INLINE_LIMIT } from './limits';

export async function projectHeader(projectId: string) {
  const [p] = await db
    .select({ project: projects, organization: organizations.name })
    .from(projects)
    .innerJoin(organizations, eq(organizations.id, projects.organizationId))
    .where(eq(projects.id, projectId));
  if (!p) throw new AppError('not_found');
  return p;
}

/** File names keep letters, digits, dot, dash and underscore only. */
export const safeFilePart = (s: string) =>
  s
    .replace(/[^A-Za-z0-9._-]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80) || 'line';

/** Tags as a person reads them (1, 2, 10), the order of the line table (migration 0015). */
const tagOrder = sql`${lines.tagKey} collate "C"`;

/** The models of the given lines (or the filter's lines), ordered by tag. */
export async function sheetModels(o: {
  projectId: string;
  lineIds?: string[];
  filter?: LineFilter;
  now?: Date;
}): Promise<SheetModel[]> {
  const p = await projectHeader(o.projectId);
  const { basis, revision } = await getDesignBasis({ projectId: o.projectId });
  const where = o.lineIds
    ? and(eq(lines.projectId, o.projectId), inArray(lines.id, o.lineIds))
    : lineFilterSql(o.projectId, o.filter ?? {}, revision);
  const rows = await db
    .select({ line: lines, result: lineResults, design: lineDesigns })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(where)
    .orderBy(tagOrder);
  const now = o.now ?? new Date();
  return rows.map((r) =>
    sheetModel({
      organization: p.organization,
      project: p.project,
      basis,
      basisRevision: revision,
      line: r.line,
      result: r.result,
      design: r.design,
      stale: isResultStale(r.result, r.line, revision),
      generatedAt: now,
    }),
  );
}

export async function lineSheetPdf({ projectId, lineId }: { projectId: string; lineId: string }) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(lineId))
    throw new AppError('not_found');
  const models = await sheetModels({ projectId, lineIds: [lineId] });
  if (!models.length) throw new AppError('not_found');
  const p = await projectHeader(projectId);
  const buf = await renderPdf(() => (
    <SheetsDocument models={models} title={`${p.project.code} calculation sheet ${models[0].tag}`} />
  ));
  return {
    buf,
    fileName: `${safeFilePart(p.project.code)}-calculation-sheet-${safeFilePart(models[0].tag)}.pdf`,
    model: models[0],
  };
}

/** Every line the filter selects, one sheet each, in one PDF; `onProgress` after the data and after rendering. */
export async function sheetsBatchPdf(o: {
  projectId: string;
  filter: LineFilter;
  max?: number;
  onProgress?: (done: number, total: number) => Promise<void> | void;
}) {
  const models = await sheetModels({ projectId: o.projectId, filter: o.filter });
  if (!models.length)
    throw new AppError('invalid', 'No line matches this filter, so there is no calculation sheet to print.');
  if (o.max !== undefined && models.length > o.max) {
    throw new AppError(
      'invalid',
      `This filter selects ${models.length} lines; at most ${o.max} sheets are printed at once here. Narrow the filter (area, status or search) or print them as a background batch.`,
    );
  }
  await o.onProgress?.(0, models.length);
  const p = await projectHeader(o.projectId);
  const buf = await renderPdf(() => (
    <SheetsDocument models={models} title={`${p.project.code} calculation sheets`} />
  ));
  await o.onProgress?.(models.length, models.length);
  return {
    buf,
    count: models.length,
    fileName: `${safeFilePart(p.project.code)}-calculation-sheets-${models.length}-lines.pdf`,
  };
}

/** Lines rendered between two progress reports (and models held in memory at once). */
const BATCH_CHUNK = 25;

/**
 * A batch of calculation sheets of any size, for the worker: one PDF per line (rendered one at a time),
 * streamed into a zip on disk and from there into the object store under `key(fileName)`.
 */
export async function sheetsBatchZip(o: {
  projectId: string;
  filter?: LineFilter;
  lineIds?: string[];
  key: (fileName: string) => string;
  onProgress?: (done: number, total: number) => Promise<void> | void;
  now?: Date;
}): Promise<{ document: StoredDocument; count: number; fileName: string }> {
  const p = await projectHeader(o.projectId);
  const { revision } = await getDesignBasis({ projectId: o.projectId });
  const where = o.lineIds
    ? and(eq(lines.projectId, o.projectId), inArray(lines.id, o.lineIds))
    : lineFilterSql(o.projectId, o.filter ?? {}, revision);
  const ids = (
    await db
      .select({ id: lines.id })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(where)
      .orderBy(tagOrder)
  ).map((r) => r.id);
  if (!ids.length)
    throw new AppError('invalid', 'No line matches this filter, so there is no calculation sheet to print.');
  const total = ids.length;
  await o.onProgress?.(0, total);
  const now = o.now ?? new Date();
  const fileName = `${safeFilePart(p.project.code)}-calculation-sheets-${total}-lines.zip`;
  const dir = await mkdtemp(path.join(tmpdir(), 'lagwise-sheets-'));
  const file = path.join(dir, fileName);
  try {
    const out = createWriteStream(file);
    const hash = createHash('sha256');
    let bytes = 0;
    let failed: Error | null = null;
    out.on('error', (e) => {
      failed = e; // a full disk: the next sheet stops the batch with it
    });
    const zip = new Zip((err, chunk, final) => {
      if (err) {
        failed = err;
        return;
      }
      hash.update(chunk);
      bytes += chunk.length;
      out.write(chunk);
      if (final) out.end();
    });
    const used = new Set<string>();
    let done = 0;
    for (let i = 0; i < total; i += BATCH_CHUNK) {
      const models = await sheetModels({
        projectId: o.projectId,
        lineIds: ids.slice(i, i + BATCH_CHUNK),
        now,
      });
      for (const m of models) {
        const buf = await renderPdf(() => (
          <SheetsDocument models={[m]} title={`${p.project.code} calculation sheet ${m.tag}`} />
        ));
        const base = `${safeFilePart(p.project.code)}-calculation-sheet-${safeFilePart(m.tag)}`;
        let name = `${base}.pdf`;
        // Two tags may reduce to one file name ("A/1", "A-1"): number the later ones.
        for (let k = 2; used.has(name); k++) name = `${base}-${k}.pdf`;
        used.add(name);
        const entry = new ZipPassThrough(name);
        entry.mtime = now;
        zip.add(entry);
        entry.push(buf, true);
        if (failed) throw failed;
        // Disk slower than rendering: wait rather than buffer the whole zip in memory.
        if (out.writableNeedDrain) await once(out, 'drain');
      }
      done += models.length;
      await o.onProgress?.(done, total);
    }
    zip.end();
    if (failed) throw failed;
    if (!out.writableFinished) await once(out, 'finish');
    const document = await putDocumentFile(o.key(fileName), file, 'application/zip', {
      sha256: hash.digest('hex'),
      bytes,
    });
    return { document, count: total, fileName };
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}
