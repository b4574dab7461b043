/**
 * The results export: every line the table's filter shows (or all of them) with its inputs, the
 * recommendation, the chosen design, the governing criterion, each criterion's requirement,
 * temperatures, heat loss, annual figures and review state — as .xlsx (numbers as numbers, units in
 * the headers, filters, frozen header) or .csv. Values in the project's units; text that a
 * spreadsheet could read as a formula gets a leading apostrophe (the bill's rule, `safeText`).
 */
import ExcelJS from 'exceljs';
import { asc, eq, sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { lineDesigns, lineResults, lines, reviewItems, reviewRounds } from '@/db/schema';
import { safeText } from '@/lib/boq/workbook';
import { convert, formatterFor } from '@/lib/format';
import { catalogueOf } from '@/lib/lines/catalogue';
import { candidateNumbers, decidingLimits, type CandidateRow } from '@/lib/lines/deciding';
import { GEOMETRY_LABEL, PURPOSE_LABEL, isSurfaceGeometry, type Purpose } from '@/lib/lines/fields';
import type { LineFilter } from '@/lib/lines/filter';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { inputOf } from '@/lib/lines/result-row';
import { isResultStale, lineFilterSql } from '@/lib/lines/stale';
import { CRITERION_LABEL } from './sheet-model';
import { projectHeader, safeFilePart } from './sheets';

type Cell = string | number | boolean | null;
export interface ExportTable {
  headers: string[];
  rows: Cell[][];
  numeric: boolean[];
}

const CRITERIA = [
  'personnel',
  'condensation',
  'heatLossLimit',
  'processDrop',
  'freeze',
  'energyCode',
  'economic',
] as const;

/** The table: one row per line, ordered by tag. `filter` null means every line. */
export async function resultsTable({
  projectId,
  filter,
}: {
  projectId: string;
  filter: LineFilter | null;
}): Promise<ExportTable> {
  const { basis, revision } = await getDesignBasis({ projectId });
  const u = formatterFor(basis);
  const us = u.system === 'US';
  const inch = us || u.series === 'inch';
  const cat = catalogueOf(basis);
  const toT = (c: number | null | undefined) =>
    c === null || c === undefined ? null : round(us ? convert.cToF(c) : c, 2);
  const toTh = (mm: number | null | undefined) =>
    mm === null || mm === undefined ? null : inch ? round(convert.mmToIn(mm), 3) : round(mm, 1);
  const toL = (m: number | null | undefined) =>
    m === null || m === undefined ? null : round(us ? convert.mToFt(m) : m, 2);
  const toA = (m2: number | null | undefined) =>
    m2 === null || m2 === undefined ? null : round(us ? convert.m2ToFt2(m2) : m2, 2);
  const toD = (mm: number | null | undefined) =>
    mm === null || mm === undefined ? null : us ? round(convert.mmToIn(mm), 3) : round(mm, 1);
  const toQl = (w: number | null) => (w === null ? null : round(us ? convert.wPerMToBtuPerHFt(w) : w, 2));
  const toQa = (w: number | null) => (w === null ? null : round(us ? convert.wPerM2ToBtuPerHFt2(w) : w, 2));
  const toP = (w: number | null) =>
    w === null ? null : us ? round(convert.wToBtuPerH(w), 0) : round(w / 1000, 3);
  const toE = (mwh: number | null) => (mwh === null ? null : round(us ? convert.mwhToMMBtu(mwh) : mwh, 3));
  const tu = inch ? 'in' : 'mm';

  const where = filter ? lineFilterSql(projectId, filter, revision) : eq(lines.projectId, projectId);
  const rows = await db
    .select({ line: lines, result: lineResults, design: lineDesigns })
    .from(lines)
    .leftJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(where)
    .orderBy(asc(lines.tag));
  // The latest review decision per line, with its round's state.
  const reviewed = await db.execute<{
    line_id: string;
    disposition: string | null;
    status: string;
    number: number;
  }>(sql`
    select distinct on (i.line_id) i.line_id, i.disposition, r.status, r.number
    from ${reviewItems} i join ${reviewRounds} r on r.id = i.round_id
    where i.project_id = ${projectId} and i.line_id is not null
    order by i.line_id, r.number desc`);
  const review = new Map(reviewed.rows.map((r) => [r.line_id, r]));

  const headers = [
    'Tag',
    'Service',
    'Area',
    'Geometry',
    'NPS',
    `Outside diameter (${us ? 'in' : 'mm'})`,
    `Length (${u.units.length})`,
    `Surface area (${u.units.area})`,
    `Normal temperature (${u.units.temp})`,
    `Maximum temperature (${u.units.temp})`,
    'Purposes',
    'Location',
    'Accessible',
    'Material system',
    'Jacket',
    `Recommended (${tu})`,
    'Governing criterion',
    `Chosen (${tu})`,
    'Decision',
    'Below hard criterion',
    'Needs re-decision',
    ...CRITERIA.map((c) => `${CRITERION_LABEL[c]} requires (${tu})`),
    `Surface, heat-loss conditions (${u.units.temp})`,
    `Surface, personnel conditions (${u.units.temp})`,
    `Surface, condensation conditions (${u.units.temp})`,
    `Heat loss per length (${u.units.linearLoss})`,
    `Heat flux (${u.units.arealLoss})`,
    `Heat loss of the line incl. fittings (${u.units.power})`,
    `Annual energy (${u.units.energy}, at the recommendation)`,
    `Annual cost (${u.currency}, at the recommendation)`,
    'Annual CO2 (t, at the recommendation)',
    'Unmet criteria',
    'Stale',
    'Review',
  ];
  const out: Cell[][] = [];
  for (const { line, result, design } of rows) {
    const input = inputOf(line);
    const surface = isSurfaceGeometry(line.geometry);
    const cands = (result?.candidates ?? []) as CandidateRow[];
    const atMm = design?.thicknessMm ?? result?.recommendedMm ?? null;
    const row = cands.find((c) => c[0] === atMm) ?? null;
    let personnelC: number | null = null,
      condensationC: number | null = null;
    if (result && row) {
      const limits = decidingLimits(basis, input, result.jacketId);
      const [n] = candidateNumbers(basis, input, result.jacketId, [row], limits);
      personnelC = limits.personnelLimitC !== null ? n.personnelC : null;
      condensationC = limits.condensationNeedC !== null ? n.condensationC : null;
    }
    const extent = cands.length && cands[0][2] !== 0 && result ? result.bareHeatW / cands[0][2] : 0;
    const lineW =
      row && extent ? row[2] * extent + lineFittingsW(basis, line, row[2], cands[0][2], row[0] === 0) : null;
    const outcomes = (result?.outcomes ?? []) as { id: string; requiredMm: number | null }[];
    const rv = review.get(line.id);
    const jacket = cat.jackets.get(line.jacketId ?? '') ?? cat.jackets.get(result?.jacketId ?? '');
    out.push([
      line.tag,
      line.service,
      line.area,
      GEOMETRY_LABEL[line.geometry],
      line.nps,
      toD(line.outsideDiameterMm),
      toL(line.lengthM),
      toA(line.surfaceAreaM2),
      toT(line.normalTempC),
      toT(line.maxTempC),
      (line.purposes as Purpose[]).map((p) => PURPOSE_LABEL[p]).join(', '),
      line.outdoor ? 'Outdoor' : 'Indoor',
      line.accessible ? 'yes' : 'no',
      result?.systemLabel ?? null,
      jacket?.name ?? null,
      toTh(result?.recommendedMm),
      result?.governing ? (CRITERION_LABEL[result.governing] ?? result.governing) : null,
      toTh(design?.thicknessMm),
      design ? (design.source === 'manual' ? 'manual pick' : 'recommendation accepted') : 'undecided',
      design?.belowCriterion
        ? design.belowCriterion
            .split(',')
            .map((c) => CRITERION_LABEL[c] ?? c)
            .join(', ')
        : null,
      design?.needsRedecision ? 'yes' : 'no',
      ...CRITERIA.map((c) => {
        const o = outcomes.find((x) => x.id === c);
        return o ? toTh(o.requiredMm) : null;
      }),
      toT(row?.[3]),
      toT(personnelC),
      toT(condensationC),
      surface ? null : toQl(row?.[2] ?? null),
      surface ? toQa(row?.[2] ?? null) : null,
      toP(lineW),
      toE(result?.annualMWh ?? null),
      result?.annualCost === null || result?.annualCost === undefined ? null : round(result.annualCost, 2),
      result?.co2Tonnes === null || result?.co2Tonnes === undefined ? null : round(result.co2Tonnes, 3),
      (result?.unmet ?? []).map((c) => CRITERION_LABEL[c] ?? c).join(', ') || null,
      isResultStale(result, line, revision) ? 'yes' : 'no',
      rv
        ? `round ${rv.number} ${rv.status === 'signed-off' ? 'signed off' : 'open'}${rv.disposition ? `: ${rv.disposition}` : ''}`
        : 'not in a review',
    ]);
  }
  const numeric = headers.map((_, i) => out.some((r) => typeof r[i] === 'number'));
  return { headers, rows: out, numeric };
}

const round = (v: number, d: number) => {
  const f = 10 ** d;
  return Math.round(v * f) / f;
};

export async function resultsWorkbook(t: ExportTable, meta: { title: string }): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Lagwise';
  const ws = wb.addWorksheet('Results', { views: [{ state: 'frozen', ySplit: 1, xSplit: 1 }] });
  ws.addRow(t.headers.map(safeText));
  ws.getRow(1).font = { bold: true };
  ws.getRow(1).alignment = { wrapText: true, vertical: 'top' };
  for (const r of t.rows)
    ws.addRow(
      r.map((v) => (typeof v === 'string' ? safeText(v) : typeof v === 'boolean' ? (v ? 'yes' : 'no') : v)),
    );
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: t.headers.length } };
  t.headers.forEach((h, i) => {
    ws.getColumn(i + 1).width = Math.min(28, Math.max(10, h.length * 0.6 + 2));
  });
  const about = wb.addWorksheet('About');
  about.addRow([meta.title]);
  about.addRow([
    "Values are in the project's units, named in each header. Engineering estimates by published methods; verify material data with the manufacturer; safety decisions follow local codes and a qualified person.",
  ]);
  return Buffer.from(await wb.xlsx.writeBuffer());
}

/** RFC 4180 CSV, UTF-8 with a byte-order mark so spreadsheet programs read the units' symbols. */
export function resultsCsv(t: ExportTable): string {
  const esc = (v: Cell) => {
    if (v === null) return '';
    const s = typeof v === 'string' ? safeText(v) : typeof v === 'boolean' ? (v ? 'yes' : 'no') : String(v);
    return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  };
  return '\ufeff' + [t.headers, ...t.rows].map((r) => r.map(esc).join(',')).join('\r\n') + '\r\n';
}

export async function resultsExport({
  projectId,
  filter,
  format,
}: {
  projectId: string;
  filter: LineFilter | null;
  format: 'xlsx' | 'csv';
}) {
  const p = await projectHeader(projectId);
  const t = await resultsTable({ projectId, filter });
  const name = `${safeFilePart(p.project.code)}-results${filter && (filter.q || filter.area || filter.status) ? '-filtered' : ''}`;
  if (format === 'csv')
    return {
      body: Buffer.from(resultsCsv(t), 'utf8'),
      fileName: `${name}.csv`,
      type: 'text/csv; charset=utf-8',
      count: t.rows.length,
    };
  return {
    body: await resultsWorkbook(t, {
      title: `${p.project.code} · ${p.project.name} — results of ${t.rows.length} lines`,
    }),
    fileName: `${name}.xlsx`,
    type: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    count: t.rows.length,
  };
}
