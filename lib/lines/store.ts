/**
 * Line-list persistence, free of Next.js (server actions, the seed, tests and benchmarks call it).
 * Every import is one transaction: all rows or none, the previous revision intact on any error.
 */
import { and, asc, count, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import { db, type Tx } from '@/db/client';
import {
  columnMappings,
  designBases,
  importDrafts,
  lineDesigns,
  lineListRevisions,
  lineResults,
  lines,
  type Line,
} from '@/db/schema';
import { AppError } from '@/lib/errors';
import { CALCULATION_VERSION, HARD_CRITERIA, type MaterialSystem } from '@/lib/thermal';
import { actorName, writeAudit } from '@/lib/audit';
import {
  DEFAULT_DESIGN_BASIS,
  designBasisSchema,
  type DesignBasis,
  type OwnJacket,
  type OwnMaterial,
} from './design-basis';
import { catalogueOf, ownId } from './catalogue';
import { diffLineLists, fieldChanges, THERMAL_FIELDS, type LineListDiff } from './diff';
import { suggestMapping, type ColumnMapping } from './mapping';
import { describeCsv, parseUpload, ParseError, viewSheet, type ParsedFile } from './parse';
import { HEADER_SCAN_ROWS } from './header';
import { inputHash, solveLine } from './solve-line';
import { validateSheet, type LineInput, type RowIssue, type UnknownValue } from './validate';
import { isResultStale, lineFilterSql, staleSql } from './stale';
import type { CandidateRow } from './deciding';
import { inputOf, resultContext, resultRow } from './result-row';
import type { SolvePool } from './solve-pool';

export { inputOf } from './result-row';
import type { LineFilter } from './filter';

export {
  acceptRecommendations,
  applyBulkAccept,
  previewBulkAccept,
  undoBulkAccept,
  type BulkItem,
  type BulkPreview,
} from './bulk-accept';

// ---------- design basis ----------

export async function getDesignBasis({
  projectId,
}: {
  projectId: string;
}): Promise<{ basis: DesignBasis; revision: number }> {
  const [row] = await db.select().from(designBases).where(eq(designBases.projectId, projectId));
  if (row) return { basis: designBasisSchema.parse(row.basis), revision: row.revision };
  await db.insert(designBases).values({ projectId, basis: DEFAULT_DESIGN_BASIS }).onConflictDoNothing();
  return { basis: DEFAULT_DESIGN_BASIS, revision: 1 };
}

/**
 * Runs `fn` in a transaction holding the project's design-basis row locked, with the stored basis
 * (the default row is created first when the project has none). Every basis write goes through it.
 */
async function withLockedBasis<T>(
  projectId: string,
  fn: (tx: Tx, row: { revision: number }, current: DesignBasis) => Promise<T>,
): Promise<T> {
  await getDesignBasis({ projectId });
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(designBases)
      .where(eq(designBases.projectId, projectId))
      .for('update');
    return fn(tx, row, designBasisSchema.parse(row.basis));
  });
}

/** Writes the basis in the locked transaction, bumping the revision when `bump`; returns the new revision. */
async function writeBasis(tx: Tx, projectId: string, userId: string, basis: DesignBasis, bump: boolean) {
  const [saved] = await tx
    .update(designBases)
    .set({
      basis,
      revision: bump ? sql`${designBases.revision} + 1` : sql`${designBases.revision}`,
      updatedBy: userId,
      updatedAt: new Date(),
    })
    .where(eq(designBases.projectId, projectId))
    .returning();
  return saved.revision;
}

export async function saveDesignBasis({
  projectId,
  userId,
  basis,
}: {
  projectId: string;
  userId: string;
  basis: DesignBasis;
}) {
  // jsonb does not keep key order, so compare with sorted keys.
  const canon = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.map(canon)
      : v && typeof v === 'object'
        ? Object.fromEntries(
            Object.keys(v)
              .sort()
              .map((k) => [k, canon((v as Record<string, unknown>)[k])]),
          )
        : v;
  const json = (v: unknown) => JSON.stringify(canon(v));
  return withLockedBasis(projectId, async (tx, row, current) => {
    // What changed, by section; the display unit system and the currency label change no result, so
    // they alone keep the revision (nothing goes stale).
    const changed = [...new Set([...Object.keys(current), ...Object.keys(basis)])].filter(
      (k) => json((current as Record<string, unknown>)[k]) !== json((basis as Record<string, unknown>)[k]),
    );
    if (!changed.length) return { revision: row.revision };
    const revision = await writeBasis(
      tx,
      projectId,
      userId,
      basis,
      changed.some((k) => k !== 'unitSystem' && k !== 'currency'),
    );
    await writeAudit(tx, [
      {
        projectId,
        actorId: userId,
        actorName: await actorName(userId),
        action: 'design basis saved',
        before: {
          revision: row.revision,
          ...Object.fromEntries(changed.map((k) => [k, (current as Record<string, unknown>)[k]])),
        },
        after: {
          revision,
          ...Object.fromEntries(changed.map((k) => [k, (basis as Record<string, unknown>)[k]])),
        },
      },
    ]);
    return { revision };
  });
}

// ---------- the project's own materials and jackets (kept in the design basis) ----------

/**
 * Changes the basis under the row lock and bumps its revision (results computed before are stale),
 * with an audit entry. `change` returns the new basis (reading in the same transaction) or throws an
 * AppError with the reason.
 */
async function changeBasis(
  o: { projectId: string; userId: string; action: string; after: unknown },
  change: (b: DesignBasis, tx: Tx) => DesignBasis | Promise<DesignBasis>,
) {
  return withLockedBasis(o.projectId, async (tx, _row, current) => {
    const next = designBasisSchema.safeParse(await change(current, tx));
    if (!next.success) throw new AppError('invalid', next.error.issues.map((i) => i.message).join('; '));
    const revision = await writeBasis(tx, o.projectId, o.userId, next.data, true);
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        actorId: o.userId,
        actorName: await actorName(o.userId),
        action: o.action,
        after: o.after,
      },
    ]);
    return { revision, basis: next.data };
  });
}

export async function addOwnMaterial(o: {
  projectId: string;
  userId: string;
  material: Omit<OwnMaterial, 'id'>;
  pricePerM3?: number;
}) {
  let id = '';
  const r = await changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project material added',
      after: { name: o.material.name, source: o.material.source },
    },
    (b) => {
      if (b.ownMaterials.some((m) => m.name.toLowerCase() === o.material.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a material called "${o.material.name}".`);
      id = ownId(b, o.material.name);
      const prices =
        o.pricePerM3 === undefined
          ? b.prices
          : { ...b.prices, materialPerM3: { ...b.prices.materialPerM3, [id]: o.pricePerM3 } };
      return { ...b, ownMaterials: [...b.ownMaterials, { ...o.material, id }], prices };
    },
  );
  return { ...r, id };
}

export async function addOwnJacket(o: { projectId: string; userId: string; jacket: Omit<OwnJacket, 'id'> }) {
  let id = '';
  const r = await changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project jacket added',
      after: { name: o.jacket.name, emittance: o.jacket.emittance, source: o.jacket.source },
    },
    (b) => {
      if (b.ownJackets.some((j) => j.name.toLowerCase() === o.jacket.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a jacket called "${o.jacket.name}".`);
      id = ownId(b, o.jacket.name);
      return { ...b, ownJackets: [...b.ownJackets, { ...o.jacket, id }] };
    },
  );
  return { ...r, id };
}

/** Changes a project material's data in place (same id, so the bands and designs that use it follow). */
export async function updateOwnMaterial(o: {
  projectId: string;
  userId: string;
  id: string;
  material: Omit<OwnMaterial, 'id'>;
  pricePerM3?: number;
}) {
  return changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project material changed',
      after: { id: o.id, name: o.material.name, source: o.material.source },
    },
    (b) => {
      const i = b.ownMaterials.findIndex((m) => m.id === o.id);
      if (i < 0)
        throw new AppError('not_found', 'That project material does not exist (it may have been removed).');
      if (b.ownMaterials.some((m) => m.id !== o.id && m.name.toLowerCase() === o.material.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a material called "${o.material.name}".`);
      const materialPerM3 = { ...b.prices.materialPerM3 };
      if (o.pricePerM3 === undefined) delete materialPerM3[o.id];
      else materialPerM3[o.id] = o.pricePerM3;
      const ownMaterials = b.ownMaterials.map((m, j) => (j === i ? { ...o.material, id: o.id } : m));
      return { ...b, ownMaterials, prices: { ...b.prices, materialPerM3 } };
    },
  );
}

/** Changes a project jacket in place. */
export async function updateOwnJacket(o: {
  projectId: string;
  userId: string;
  id: string;
  jacket: Omit<OwnJacket, 'id'>;
}) {
  return changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project jacket changed',
      after: { id: o.id, name: o.jacket.name, emittance: o.jacket.emittance, source: o.jacket.source },
    },
    (b) => {
      const i = b.ownJackets.findIndex((j) => j.id === o.id);
      if (i < 0)
        throw new AppError('not_found', 'That project jacket does not exist (it may have been removed).');
      if (b.ownJackets.some((j) => j.id !== o.id && j.name.toLowerCase() === o.jacket.name.toLowerCase()))
        throw new AppError('conflict', `The project already has a jacket called "${o.jacket.name}".`);
      return { ...b, ownJackets: b.ownJackets.map((j, k) => (k === i ? { ...o.jacket, id: o.id } : j)) };
    },
  );
}

/** Removes a project entry; refused while a material band, a line's jacket or a chosen design uses it. */
export async function removeOwnEntry(o: { projectId: string; userId: string; id: string }) {
  return changeBasis(
    {
      projectId: o.projectId,
      userId: o.userId,
      action: 'project material or jacket removed',
      after: { id: o.id },
    },
    async (b, tx) => {
      const cat = catalogueOf(b);
      const name = cat.own.has(o.id) ? (cat.materials.get(o.id) ?? cat.jackets.get(o.id))!.name : null;
      if (!name)
        throw new AppError(
          'not_found',
          'That project material or jacket does not exist (it may have been removed already).',
        );
      const bands = b.systems
        .map((s, i) =>
          s.outerId === o.id || s.innerId === o.id || s.flatOuterId === o.id || s.jacketId === o.id
            ? i + 1
            : 0,
        )
        .filter(Boolean);
      if (bands.length)
        throw new AppError(
          'conflict',
          `"${name}" is used by material band ${bands.join(', ')} of the specification; choose another there first.`,
        );
      const [{ n: designs }] = await tx
        .select({ n: count() })
        .from(lineDesigns)
        .where(
          and(
            eq(lineDesigns.projectId, o.projectId),
            sql`${lineDesigns.layers} @> ${JSON.stringify([{ materialId: o.id }])}::jsonb`,
          ),
        );
      if (designs > 0)
        throw new AppError(
          'conflict',
          `"${name}" is in ${designs} chosen line design${designs === 1 ? '' : 's'}; choose those thicknesses again before removing it.`,
        );
      const [{ n: overrides }] = await tx
        .select({ n: count() })
        .from(lines)
        .where(and(eq(lines.projectId, o.projectId), eq(lines.jacketId, o.id)));
      if (overrides > 0)
        throw new AppError(
          'conflict',
          `"${name}" is the jacket override of ${overrides} line${overrides === 1 ? '' : 's'} in the line list.`,
        );
      const materialPerM3 = { ...b.prices.materialPerM3 };
      delete materialPerM3[o.id];
      return {
        ...b,
        ownMaterials: b.ownMaterials.filter((m) => m.id !== o.id),
        ownJackets: b.ownJackets.filter((j) => j.id !== o.id),
        prices: { ...b.prices, materialPerM3 },
      };
    },
  );
}

// ---------- upload, mapping, preview, import ----------

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
  let parsed: ParsedFile;
  try {
    parsed = await parseUpload(fileName, bytes);
  } catch (e) {
    if (e instanceof ParseError) throw new AppError('invalid', e.message, { file: [e.message] });
    throw e;
  }
  const [remembered] = await db.select().from(columnMappings).where(eq(columnMappings.projectId, projectId));
  const mem = remembered
    ? { headers: remembered.headers as string[], mapping: remembered.mapping as ColumnMapping }
    : undefined;
  const [draft] = await db
    .insert(importDrafts)
    .values({ projectId, createdBy: userId, fileName, parsed })
    .returning({ id: importDrafts.id });
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
    fileName,
    sheets,
    defaultSheet: visible.name,
    readAs: describeCsv(parsed),
    remembered: mem ?? null,
  };
}

async function loadDraft(projectId: string, draftId: string) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(draftId))
    throw new AppError('not_found', 'This upload is no longer available; upload the file again.');
  const [d] = await db
    .select()
    .from(importDrafts)
    .where(and(eq(importDrafts.id, draftId), eq(importDrafts.projectId, projectId)));
  if (!d) throw new AppError('not_found', 'This upload is no longer available; upload the file again.');
  return d;
}

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
  const d = await loadDraft(projectId, draftId);
  const v = validateSheet(
    sheetOf(d.parsed as ParsedFile, sheetName, headerRow),
    mapping,
    await jacketNames(projectId),
  );
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
  const d = await loadDraft(projectId, draftId);
  if (d.importedRevision)
    throw new AppError('conflict', `This upload was already imported as revision ${d.importedRevision}.`);
  const sheet = sheetOf(d.parsed as ParsedFile, sheetName, headerRow);
  const v = validateSheet(sheet, mapping, await jacketNames(projectId));
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
      await tx
        .insert(lines)
        .values(chunk)
        .onConflictDoUpdate({
          target: [lines.projectId, lines.tag],
          set: Object.fromEntries(
            [
              'service',
              'area',
              'geometry',
              'nps',
              'outside_diameter_mm',
              'length_m',
              'surface_area_m2',
              'height_m',
              'normal_temp_c',
              'max_temp_c',
              'steam_pressure_bar_g',
              'flow_kg_per_s',
              'fluid_cp_kj_per_kg_k',
              'elbows',
              'tees',
              'valves',
              'flanges',
              'purposes',
              'outdoor',
              'accessible',
              'access_height_m',
              'jacket_id',
              'notes',
              'input_version',
              'revision',
            ].map((c) => [camel(c), sql.raw(`excluded.${c}`)]),
          ),
        });
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
    for (const c of changedIds) {
      await tx
        .update(lineDesigns)
        .set({ needsRedecision: true, redecisionReason: `Revision ${number} changed ${c.why}` })
        .where(eq(lineDesigns.lineId, c.id));
    }
    await tx.insert(lineListRevisions).values({
      projectId,
      number,
      fileName: d.fileName,
      sheetName,
      lineCount: v.lines.length,
      diff,
      createdBy: userId,
    });
    await tx
      .insert(columnMappings)
      .values({ projectId, headers: sheet.headers, mapping })
      .onConflictDoUpdate({
        target: columnMappings.projectId,
        set: { headers: sheet.headers, mapping, updatedAt: new Date() },
      });
    await tx.update(importDrafts).set({ importedRevision: number }).where(eq(importDrafts.id, draftId));
    return { revision: number, diff, lineCount: v.lines.length, warningCount: v.warningCount };
  });
}

function camel(snake: string) {
  return snake.replace(/_([a-z0-9])/g, (_, c) => c.toUpperCase());
}

// ---------- solve ----------

/** Solves the project's lines (only the stale ones unless `all`), storing each result with what it was computed from. */
export async function solveProject({
  projectId,
  all = false,
  tx: outer,
  onProgress,
  pool,
}: {
  projectId: string;
  all?: boolean;
  /** The import + solve job's transaction: the new lines and their results become visible together. */
  tx?: Tx;
  /** Called after each chunk is solved and written (lines done, lines to do). */
  onProgress?: (done: number, total: number) => Promise<void>;
  /** Worker threads to solve on (the job worker's); without it the lines are solved in this thread. */
  pool?: SolvePool;
}) {
  const { basis, revision } = await getDesignBasis({ projectId });
  const staleCond = all ? sql`true` : staleSql(revision);
  const todo = await (outer ?? db)
    .select({ line: lines })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .where(and(eq(lines.projectId, projectId), staleCond));
  const ctx = resultContext({ basis, revision, projectId });
  let solveMs = 0;
  // Solved and written a chunk at a time, so only one chunk of results is held in memory.
  await (outer ?? db).transaction(async (tx) => {
    // With a pool (the job worker), chunks are solved on worker threads a few at a time and written
    // in order as they come back; without one, in this thread.
    const chunks: Line[][] = [];
    for (let i = 0; i < todo.length; i += SOLVE_CHUNK)
      chunks.push(todo.slice(i, i + SOLVE_CHUNK).map((t) => t.line));
    const solveChunk = (c: Line[]) =>
      pool
        ? pool.solve({ basis, revision, projectId, lines: c })
        : Promise.resolve(c.map((l) => resultRow(ctx, l)));
    const ahead = pool ? pool.threads * 2 : 1;
    const inFlight = chunks.slice(0, ahead).map(solveChunk);
    let done = 0;
    for (let i = 0; i < chunks.length; i++) {
      const t0 = Date.now();
      const results = await inFlight[i];
      if (i + ahead < chunks.length) inFlight.push(solveChunk(chunks[i + ahead]));
      solveMs += Date.now() - t0;
      done += results.length;
      await tx
        .insert(lineResults)
        .values(results)
        .onConflictDoUpdate({
          target: lineResults.lineId,
          set: Object.fromEntries(
            Object.keys(results[0])
              .filter((k) => k !== 'lineId')
              .map((k) => [
                k,
                sql.raw(`excluded.${(RESULT_COLUMNS as Record<string, { name: string }>)[k].name}`),
              ]),
          ),
        });
      if (onProgress) await onProgress(done, todo.length);
    }
  });
  return { solved: todo.length, solveMs, basisRevision: revision };
}

const SOLVE_CHUNK = 250;
const RESULT_COLUMNS = getTableColumns(lineResults);

// ---------- reading ----------

export type LineSort =
  | 'tag'
  | 'area'
  | 'normalTempC'
  | 'outsideDiameterMm'
  | 'recommendedMm'
  | 'heatFlowPerUnit'
  | 'surfaceTempC'
  | 'governing';
export interface LineQuery extends LineFilter {
  projectId: string;
  page: number;
  size: number;
  sort: LineSort;
  dir: 'asc' | 'desc';
}

export async function listLines(o: LineQuery) {
  const { revision } = await getDesignBasis({ projectId: o.projectId });
  const stale = staleSql(revision);
  const where = [lineFilterSql(o.projectId, o, revision)];
  const sortCol = {
    tag: lines.tag,
    area: lines.area,
    normalTempC: lines.normalTempC,
    outsideDiameterMm: lines.outsideDiameterMm,
    recommendedMm: lineResults.recommendedMm,
    heatFlowPerUnit: lineResults.heatFlowPerUnit,
    surfaceTempC: lineResults.surfaceTempC,
    governing: lineResults.governing,
  }[o.sort];
  // Only the columns the table shows: the candidate table (the bulk of a result) is read by
  // lib/lines/picker.ts when a picker opens.
  const base = db
    .select({
      id: lines.id,
      tag: lines.tag,
      service: lines.service,
      area: lines.area,
      geometry: lines.geometry,
      nps: lines.nps,
      outsideDiameterMm: lines.outsideDiameterMm,
      normalTempC: lines.normalTempC,
      recommendedMm: lineResults.recommendedMm,
      governing: lineResults.governing,
      heatFlowPerUnit: lineResults.heatFlowPerUnit,
      surfaceTempC: lineResults.surfaceTempC,
      unmet: lineResults.unmet,
      solved: sql<boolean>`${lineResults.lineId} is not null`,
      jacketId: lineResults.jacketId,
      // The facts that decide which limits apply, and the one candidate at the chosen (or else the
      // recommended) thickness for the worst-margin column; the full candidate table stays in the
      // database until a picker asks for it.
      outdoor: lines.outdoor,
      accessible: lines.accessible,
      maxTempC: lines.maxTempC,
      purposes: lines.purposes,
      shownCandidate: sql<CandidateRow | null>`jsonb_path_query_first(${lineResults.candidates}, 'strict $[*] ? (@[0] == $mm)', jsonb_build_object('mm', coalesce(${lineDesigns.thicknessMm}, ${lineResults.recommendedMm})))`,
      chosenMm: lineDesigns.thicknessMm,
      source: lineDesigns.source,
      belowCriterion: lineDesigns.belowCriterion,
      needsRedecision: lineDesigns.needsRedecision,
      designVersion: lineDesigns.version,
      stale,
    })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(and(...where));
  const [rows, [{ total }]] = await Promise.all([
    base
      .orderBy(
        o.dir === 'asc' ? sql`${sortCol} asc nulls last` : sql`${sortCol} desc nulls last`,
        asc(lines.tag),
      )
      .limit(o.size)
      .offset(o.page * o.size),
    db
      .select({ total: count() })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(and(...where)),
  ]);
  return { rows, total, page: o.page, size: o.size };
}

export async function listAreas({ projectId }: { projectId: string }) {
  const r = await db
    .selectDistinct({ area: lines.area })
    .from(lines)
    .where(eq(lines.projectId, projectId))
    .orderBy(asc(lines.area));
  return r.map((x) => x.area);
}

export async function getLine({ projectId, lineId }: { projectId: string; lineId: string }) {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(lineId))
    throw new AppError('not_found');
  const [row] = await db
    .select({ line: lines, result: lineResults, design: lineDesigns })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(and(eq(lines.id, lineId), eq(lines.projectId, projectId)));
  if (!row) throw new AppError('not_found');
  const { revision } = await getDesignBasis({ projectId });
  const stale = isResultStale(row.result, row.line, revision);
  return { ...row, stale };
}

export async function listRevisions({ projectId }: { projectId: string }) {
  return db
    .select()
    .from(lineListRevisions)
    .where(eq(lineListRevisions.projectId, projectId))
    .orderBy(desc(lineListRevisions.number));
}

// ---------- design picks ----------

const HARD: ReadonlySet<string> = HARD_CRITERIA;

/**
 * Saves the chosen thickness for a line. `expectedVersion` is the design version the user saw
 * (0 when there was none); a different stored version means someone else saved first.
 */
export async function pickDesign(o: {
  projectId: string;
  lineId: string;
  userId: string;
  thicknessMm: number;
  reason?: string;
  expectedVersion: number;
}) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ line: lines, result: lineResults })
      .from(lines)
      .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
      .where(and(eq(lines.id, o.lineId), eq(lines.projectId, o.projectId)))
      .for('update', { of: lines });
    if (!row) throw new AppError('not_found');
    if (!row.result) throw new AppError('conflict', 'Solve the line before choosing its thickness.');
    const cand = (row.result.candidates as CandidateRow[]).find((c) => c[0] === o.thicknessMm);
    if (!cand)
      throw new AppError(
        'invalid',
        `${o.thicknessMm} mm is not a candidate of this line's material system.`,
        { thicknessMm: ['Choose one of the candidate thicknesses.'] },
      );
    const below = (row.result.outcomes as { id: string; requiredMm: number | null }[])
      .filter((x) => HARD.has(x.id) && x.requiredMm !== null && o.thicknessMm < x.requiredMm!)
      .map((x) => x.id);
    const manual = o.thicknessMm !== row.result.recommendedMm;
    if (below.length && !o.reason?.trim())
      throw new AppError(
        'invalid',
        `This thickness is below what ${below.join(' and ')} requires; give a reason to keep it.`,
        { reason: ['A reason is required for a pick below a hard criterion.'] },
      );
    if (manual && !o.reason?.trim())
      throw new AppError('invalid', 'Give a reason for choosing another thickness than the recommendation.', {
        reason: ['A reason is required for a manual pick.'],
      });
    const [existing] = await tx
      .select()
      .from(lineDesigns)
      .where(eq(lineDesigns.lineId, o.lineId))
      .for('update');
    if ((existing?.version ?? 0) !== o.expectedVersion)
      throw new AppError(
        'conflict',
        "Someone else changed this line's design while you were looking at it. Reload to see their choice, then decide again.",
      );
    const values = {
      lineId: o.lineId,
      projectId: o.projectId,
      thicknessMm: o.thicknessMm,
      layers: cand[1].map(([materialId, thicknessMm]) => ({ materialId, thicknessMm })),
      source: manual ? ('manual' as const) : ('recommended' as const),
      reason: o.reason?.trim() || null,
      belowCriterion: below.length ? below.join(',') : null,
      needsRedecision: false,
      redecisionReason: null,
      decidedBy: o.userId,
      decidedAt: new Date(),
      version: (existing?.version ?? row.line.lastDesignVersion) + 1,
    };
    if (existing) await tx.update(lineDesigns).set(values).where(eq(lineDesigns.lineId, o.lineId));
    else await tx.insert(lineDesigns).values(values);
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        lineId: o.lineId,
        tag: row.line.tag,
        actorId: o.userId,
        actorName: await actorName(o.userId),
        action: 'design pick',
        before: existing
          ? { thicknessMm: existing.thicknessMm, source: existing.source, reason: existing.reason }
          : null,
        after: {
          thicknessMm: values.thicknessMm,
          source: values.source,
          reason: values.reason,
          belowCriterion: values.belowCriterion,
        },
      },
    ]);
    return { version: values.version, source: values.source, belowCriterion: values.belowCriterion };
  });
}
