/** Calculation sheets from the database: one line, or every line of the line table's filter in one PDF. */
import { and, asc, eq, inArray } from 'drizzle-orm';
import { db } from '@/db/client';
import { lineDesigns, lineResults, lines, organizations, projects } from '@/db/schema';
import { AppError } from '@/lib/errors';
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
    .orderBy(asc(lines.tag));
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
