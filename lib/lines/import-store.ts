/**
 * Line-list revisions: an upload read into a draft (the original kept byte for byte in the object
 * store), its preview against the current list, and the import as the next revision in one
 * transaction (all rows or none, the previous revision intact on any error).
 */
import { randomUUID } from 'node:crypto';
import { and, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import { upsertRows } from '@/db/bulk';
import { db, type Tx } from '@/db/client';
import { columnMappings, importDrafts, lineDesigns, lineListRevisions, lines } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { getDocument, putDocument, safeFileName } from '@/lib/storage/documents';
import { getDesignBasis } from './basis-store';
import { canonicalJson } from './canonical-json';
import { catalogueOf } from './catalogue';
import { diffLineLists, fieldChanges, type LineListDiff, THERMAL_FIELDS } from './diff';
import { HEADER_SCAN_ROWS } from './header';
import { type ColumnMapping, suggestMapping } from './mapping';
import { describeCsv, ParseError, type ParsedFile, parseUpload, viewSheet } from './parse';
import { inputOf } from './result-row';
import { type RowIssue, type UnknownValue, validateSheet } from './validate';

/** Jacket ids and names (lower case) → id, for reading a line list's jacket column. */
async function jacketNames(projectId: string) {
  const m = new Map<string, string>();
  for (const j of catalogueOf((await getDesignBasis({ projectId })).basis).jackets.values()) {
    m.set(j.id, j.id);
    m.set(j.name.toLowerCase(), j.id);
  }
  return m;
}

export interface DraftSheet {
  name: string;
  hidden: boolean;
  /** The detected header row (1-based) and its names (a units row under it folded in). */
  headerRow: number;
  headers: string[];
  /** Lines below the detected header. */
  rowCount: number;
  /** The first non-empty rows as text, so the user can pick another header row in the browser. */
  topRows: { row: number; cells: (string | number | boolean | null)[] }[];
  /** Non-empty rows in the sheet, title rows included (the row count for another header row is derived from it). */
  gridRows: number;
  suggested: ColumnMapping;
}

export interface DraftSummary {
  draftId: string;
  fileName: string;
  sheets: DraftSheet[];
  /** The sheet to start on: the first visible one with data. */
  defaultSheet: string;
  /** CSV only: "Windows-1252, semicolon-separated" — how the file was read. */
  readAs: string | null;
  /** The project's remembered mapping (by header text), so a changed header row is suggested the same way. */
  remembered: { headers: string[]; mapping: ColumnMapping } | null;
}

/** The media type a line-list original is served with, by its file name. */
export function contentTypeOf(fileName: string): string {
  const ext = fileName.toLowerCase().split('.').pop();
  if (ext === 'xlsx') return 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';
  if (ext === 'csv') return 'text/csv';
  return 'application/octet-stream';
}

/** The original file of a line-list revision, as uploaded (checked against its SHA-256). */
export async function revisionOriginal({ projectId, number }: { projectId: string; number: number }) {
  const [r] = await db
    .select()
    .from(lineListRevisions)
    .where(and(eq(lineListRevisions.projectId, projectId), eq(lineListRevisions.number, number)));
  if (!r) throw new AppError('not_found', `Line-list revision ${number} does not exist.`);
  if (!r.originalKey || !r.originalSha256 || r.originalBytes === null)
    throw new AppError(
      'not_found',
      `Revision ${number} was imported before original files were kept; its file is not stored.`,
    );
  const buf = await getDocument({ key: r.originalKey, sha256: r.originalSha256, bytes: r.originalBytes });
  return { buf, fileName: r.fileName, contentType: contentTypeOf(r.fileName) };
}
/** Where an upload's original is kept before (and after) it is read: the object store's coordinates. */
export interface StoredUpload {
  draftId: string;
  fileName: string;
  key: string;
  sha256: string;
  bytes: number;
}

/**
 * Keeps an upload byte for byte in the object store (the revision history offers it for download)
 * and returns where; the web request does only this and leaves the reading to the worker
 * (`readDraft`, job "read-upload"), so a hostile file never costs the web process memory or time.
 */
export async function storeUpload({
  projectId,
  fileName,
  bytes,
}: {
  projectId: string;
  fileName: string;
  bytes: Buffer;
}): Promise<StoredUpload> {
  const draftId = randomUUID();
  const original = await putDocument(
    `projects/${projectId}/line-lists/${draftId}/${safeFileName(fileName)}`,
    bytes,
    contentTypeOf(fileName),
  );
  return { draftId, fileName, key: original.key, sha256: original.sha256, bytes: original.bytes };
}

/**
 * Reads a stored upload into a draft (the limits checked before anything is inflated, see
 * `parseUpload`), with the suggested mapping of each sheet. `exec` is the job's transaction.
 */
export async function readDraft({
  projectId,
  userId,
  upload,
  exec = db,
}: {
  projectId: string;
  userId: string;
  upload: StoredUpload;
  exec?: Tx | typeof db;
}): Promise<DraftSummary> {
  const bytes = await getDocument({ key: upload.key, sha256: upload.sha256, bytes: upload.bytes });
  let parsed: ParsedFile;
  try {
    parsed = await parseUpload(upload.fileName, bytes);
  } catch (e) {
    if (e instanceof ParseError) throw new AppError('invalid', e.message, { file: [e.message] });
    throw e;
  }
  const [remembered] = await exec
    .select()
    .from(columnMappings)
    .where(eq(columnMappings.projectId, projectId));
  const mem = remembered ? { headers: remembered.headers, mapping: remembered.mapping } : undefined;
  const [draft] = await exec
    .insert(importDrafts)
    .values({
      id: upload.draftId,
      projectId,
      createdBy: userId,
      fileName: upload.fileName,
      parsed,
      originalKey: upload.key,
      originalSha256: upload.sha256,
      originalBytes: upload.bytes,
    })
    .onConflictDoNothing()
    .returning({ id: importDrafts.id });
  if (!draft) throw new AppError('conflict', 'This upload was already read; upload the file again.');
  const sheets = parsed.sheets.map((stored): DraftSheet => {
    const s = viewSheet(stored);
    return {
      name: s.name,
      hidden: s.hidden,
      headerRow: s.headerRow,
      headers: s.headers,
      rowCount: s.rows.length,
      topRows: stored.grid.slice(0, HEADER_SCAN_ROWS + 1),
      gridRows: stored.grid.length,
      suggested: suggestMapping(s.headers, mem),
    };
  });
  const visible = sheets.find((s) => !s.hidden && s.rowCount > 0) ?? sheets[0];
  return {
    draftId: draft.id,
    fileName: upload.fileName,
    sheets,
    defaultSheet: visible.name,
    readAs: describeCsv(parsed),
    remembered: mem ?? null,
  };
}

/** Stores and reads an upload in one call (scripts, the seed, tests and benchmarks). */
export async function createDraft({
  projectId,
  userId,
  fileName,
  bytes,
}: {
  projectId: string;
  userId: string;
  fileName: string;
  bytes: Buffer;
}): Promise<DraftSummary> {
  const upload = await storeUpload({ projectId, fileName, bytes });
  return readDraft({ projectId, userId, upload });
}

/** The draft's row; without its parsed sheets (the bulk of it) when `withSheets` is false. */
async function loadDraft(projectId: string, draftId: string, { withSheets = true } = {}) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(draftId))
    throw new AppError('not_found', 'This upload is no longer available; upload the file again.');
  const { parsed, ...meta } = getTableColumns(importDrafts);
  const [d] = await db
    .select(withSheets ? { ...meta, parsed } : meta)
    .from(importDrafts)
    .where(and(eq(importDrafts.id, draftId), eq(importDrafts.projectId, projectId)));
  if (!d) throw new AppError('not_found', 'This upload is no longer available; upload the file again.');
  return d as typeof d & { parsed?: ParsedFile };
}

/**
 * The draft's sheet validated against the mapping. The check step's answer is kept in this process
 * (one at a time, `keep`) and taken by the import of the same draft, sheet, header row, mapping and
 * jackets: a draft's sheets never change once read, so the import need not read and validate
 * 10,000 rows again (~0.3 s). Another process, or anything changed, validates afresh.
 */
async function validatedSheet(choice: Omit<DraftChoice, 'projectId'> & { projectId: string }, keep: boolean) {
  const jackets = await jacketNames(choice.projectId);
  const key = canonicalJson([
    choice.projectId,
    choice.draftId,
    choice.sheetName,
    choice.headerRow ?? null,
    choice.mapping,
    [...jackets],
  ]);
  const kept = lastValidation.current;
  lastValidation.current = undefined;
  if (kept?.key === key) {
    if (keep) lastValidation.current = kept;
    return kept;
  }
  const d = await loadDraft(choice.projectId, choice.draftId);
  const sheet = sheetOf(d.parsed!, choice.sheetName, choice.headerRow);
  const found = { key, headers: sheet.headers, v: validateSheet(sheet, choice.mapping, jackets) };
  if (keep) lastValidation.current = found;
  return found;
}
const lastValidation: {
  current?: { key: string; headers: string[]; v: ReturnType<typeof validateSheet> };
} = {};

/** The sheet seen from the chosen header row (the detected one when none is given). */
function sheetOf(parsed: ParsedFile, sheetName: string, headerRow?: number) {
  if (!Array.isArray(parsed?.sheets) || parsed.sheets.some((x) => !Array.isArray(x.grid)))
    throw new AppError(
      'not_found',
      'This upload was read by an earlier version of Lagwise; upload the file again.',
    );
  const s = parsed.sheets.find((x) => x.name === sheetName);
  if (!s)
    throw new AppError('invalid', `The workbook has no sheet "${sheetName}".`, {
      sheet: ["Choose one of the workbook's sheets."],
    });
  if (headerRow !== undefined && !s.grid.some((r) => r.row === headerRow)) {
    throw new AppError(
      'invalid',
      `Row ${headerRow} of sheet "${sheetName}" is empty or beyond its end; choose a row with the column names as the header row.`,
      { headerRow: ['Choose a row with the column names.'] },
    );
  }
  return viewSheet(s, headerRow);
}

/** A stored line as the engine's and the diff's input. */
export interface Preview {
  issues: RowIssue[];
  errorCount: number;
  warningCount: number;
  lineCount: number;
  diff: LineListDiff;
  previousRevision: number;
  /** Values the file uses that need an answer in the mapping step. */
  unknownValues: UnknownValue[];
}

export interface DraftChoice {
  projectId: string;
  draftId: string;
  sheetName: string;
  headerRow?: number;
  mapping: ColumnMapping;
}

export async function previewDraft({
  projectId,
  draftId,
  sheetName,
  headerRow,
  mapping,
}: DraftChoice): Promise<Preview> {
  const { v } = await validatedSheet({ projectId, draftId, sheetName, headerRow, mapping }, true);
  const current = await db.select().from(lines).where(eq(lines.projectId, projectId));
  const [rev] = await db
    .select({ n: sql<number>`coalesce(max(${lineListRevisions.number}), 0)` })
    .from(lineListRevisions)
    .where(eq(lineListRevisions.projectId, projectId));
  return {
    issues: v.issues,
    errorCount: v.errorCount,
    warningCount: v.warningCount,
    lineCount: v.lines.length,
    diff: diffLineLists(current.map(inputOf), v.lines),
    previousRevision: Number(rev.n),
    unknownValues: v.unknownValues,
  };
}

const CHUNK = 1000;

/**
 * Imports the draft as the next revision, in one transaction: lines updated by tag, added, removed;
 * a pick or decision survives unless a thermal input of its line changed, in which case the line
 * is marked for re-decision with the reason.
 */
/** Imports a validated draft. Inside `tx` (the import + solve job) it is a savepoint of that transaction. */
export async function commitDraft({
  projectId,
  draftId,
  sheetName,
  headerRow,
  mapping,
  userId,
  tx: outer,
}: DraftChoice & { userId: string; tx?: Tx }) {
  const d = await loadDraft(projectId, draftId, { withSheets: false });
  if (d.importedRevision)
    throw new AppError('conflict', `This upload was already imported as revision ${d.importedRevision}.`);
  const { v, headers } = await validatedSheet({ projectId, draftId, sheetName, headerRow, mapping }, false);
  if (v.errorCount > 0) {
    const first = v.issues
      .filter((i) => i.severity === 'error')
      .slice(0, 5)
      .map((i) => `row ${i.row}${i.column ? `, column ${i.column}` : ''}: ${i.message}`);
    throw new AppError(
      'invalid',
      `Nothing was imported: ${v.errorCount} problem${v.errorCount === 1 ? '' : 's'} to fix first (${first.join('; ')}${v.errorCount > 5 ? '; …' : ''}).`,
    );
  }
  return (outer ?? db).transaction(async (tx) => {
    // Serialise imports of one project.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${projectId}))`);
    const current = await tx.select().from(lines).where(eq(lines.projectId, projectId));
    const byTag = new Map(current.map((l) => [l.tag.toUpperCase(), l]));
    const [rev] = await tx
      .select({ n: sql<number>`coalesce(max(${lineListRevisions.number}), 0)` })
      .from(lineListRevisions)
      .where(eq(lineListRevisions.projectId, projectId));
    const number = Number(rev.n) + 1;
    const diff = diffLineLists(current.map(inputOf), v.lines);

    const rows = v.lines.map((l) => {
      const old = byTag.get(l.tag.toUpperCase());
      const thermal = old
        ? fieldChanges(inputOf(old), l).filter((c) => THERMAL_FIELDS.includes(c.field))
        : [];
      const { sourceRow: _row, ...input } = l;
      void _row;
      return {
        ...input,
        projectId,
        revision: number,
        inputVersion: old ? old.inputVersion + (thermal.length ? 1 : 0) : 1,
        _thermal: thermal,
        _old: old,
      };
    });
    for (let i = 0; i < rows.length; i += CHUNK) {
      const chunk = rows.slice(i, i + CHUNK).map(({ _thermal, _old, ...r }) => {
        void _thermal;
        void _old;
        return r;
      });
      // Updated by tag: every imported field, the input version and the revision (db/bulk.ts).
      await upsertRows(tx, lines, chunk, { target: ['projectId', 'tag'] });
    }
    const removedIds = current
      .filter((l) => diff.removed.some((t) => t.toUpperCase() === l.tag.toUpperCase()))
      .map((l) => l.id);
    for (let i = 0; i < removedIds.length; i += CHUNK)
      await tx.delete(lines).where(inArray(lines.id, removedIds.slice(i, i + CHUNK)));
    // Decisions on lines whose thermal inputs changed must be taken again.
    const changedIds = rows
      .filter((r) => r._old && r._thermal.length)
      .map((r) => ({ id: r._old!.id, why: r._thermal.map((c) => c.field).join(', ') }));
    // One statement per chunk, not one per line (a revision may change thousands of lines).
    for (let i = 0; i < changedIds.length; i += CHUNK) {
      const marks = changedIds
        .slice(i, i + CHUNK)
        .map((c) => ({ id: c.id, reason: `Revision ${number} changed ${c.why}` }));
      await tx.execute(sql`update ${lineDesigns} set needs_redecision = true, redecision_reason = v.reason
        from json_to_recordset(${JSON.stringify(marks)}::json) as v(id uuid, reason text)
        where ${lineDesigns.lineId} = v.id`);
    }
    await tx.insert(lineListRevisions).values({
      projectId,
      number,
      fileName: d.fileName,
      sheetName,
      lineCount: v.lines.length,
      diff,
      createdBy: userId,
      originalKey: d.originalKey,
      originalSha256: d.originalSha256,
      originalBytes: d.originalBytes,
    });
    await tx
      .insert(columnMappings)
      .values({ projectId, headers, mapping })
      .onConflictDoUpdate({
        target: columnMappings.projectId,
        set: { headers, mapping, updatedAt: new Date() },
      });
    await tx.update(importDrafts).set({ importedRevision: number }).where(eq(importDrafts.id, draftId));
    return { revision: number, diff, lineCount: v.lines.length, warningCount: v.warningCount };
  });
}

export async function listRevisions({ projectId }: { projectId: string }) {
  return db
    .select()
    .from(lineListRevisions)
    .where(eq(lineListRevisions.projectId, projectId))
    .orderBy(desc(lineListRevisions.number));
}
