/**
 * The deliverables read back: calculation sheets and the design report as PDFs (text extracted with
 * pdfjs-dist) against the stored results and the budget, issued report revisions byte for byte,
 * the results export round trip (exceljs), and the batch of sheets run as a worker job. Issued reports
 * and batches live in the object store (the test fake); the database keeps key, size and SHA-256.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomUUID } from 'node:crypto';
import ExcelJS from 'exceljs';
import { and, eq } from 'drizzle-orm';
import { unzipSync } from 'fflate';
import { Pool } from 'pg';
import { db, getPool } from '@/db/client';
import { designReports, jobs, lineDesigns, lineResults, lines, projects, sheetBatches } from '@/db/schema';
import { env } from '@/lib/env';
import { getDocument } from '@/lib/storage/documents';
import { moveLegacyDocuments } from '@/lib/storage/move-legacy';
import * as auth from '@/lib/auth/service';
import { getDesignBasis, saveDesignBasis } from '@/lib/lines/basis-store';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { listLines, solveProject } from '@/lib/lines/results-store';
import * as budget from '@/lib/budget/store';
import { formatterFor } from '@/lib/format';
import type { CandidateRow } from '@/lib/lines/deciding';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import { lineSheetPdf, sheetsBatchPdf } from '@/lib/documents/sheets';
import { draftReport, getReportPdf, issueReport, listReports } from '@/lib/documents/report-store';
import { resultsCsv, resultsExport, resultsTable } from '@/lib/documents/results-export';
import { runJob } from '@/lib/jobs/run';
import { expectAppError } from '../support/errors';
import { pdfPages, pdfText } from '../support/pdf';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

const row = (tag: string, o: Record<string, string | number | null> = {}) =>
  TEMPLATE_HEADERS.map((h) =>
    h in o
      ? o[h]
      : ((
          {
            'Line tag': tag,
            Service: 'Steam',
            Area: 'North',
            Geometry: 'Horizontal pipe',
            NPS: '4',
            'Length (m)': 100,
            'Normal temp (°C)': 150,
            'Max temp (°C)': 160,
            Purpose: 'H',
            Location: 'Outdoor',
            Accessible: 'no',
            Elbows: 2,
            Valves: 1,
          } as Record<string, string | number>
        )[h] ?? null),
  );

let projectId = '';
let userId = '';

beforeAll(async () => {
  const o = await auth.signUp({
    name: 'Docs Engineer',
    email: `docs.${randomUUID().slice(0, 8)}@example.com`,
    password: 'lagging-sheet-check-7',
    organizationName: 'Docs Org',
  });
  userId = o.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: o.organizationId, code: 'DOC-1', name: 'Documents test', site: 'Test site' })
    .returning();
  projectId = p.id;
  const d = await createDraft({
    projectId,
    userId,
    fileName: 'd.xlsx',
    bytes: await lineListWorkbook([
      row('N-1'),
      row('N-2', { NPS: '2', 'Length (m)': 50, 'Normal temp (°C)': 250, 'Max temp (°C)': 260 }),
      row('S-1', { Area: 'South', 'Length (m)': 40 }),
      row('=CMD|calc', { Service: '@SUM(A1)', Area: 'South', 'Length (m)': 20 }),
    ]),
  });
  const s = d.sheets[0];
  await commitDraft({
    projectId,
    draftId: d.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId,
  });
  await solveProject({ projectId });
  await acceptRecommendations({ projectId, userId, area: 'North' });
  await budget.saveBudget({
    projectId,
    userId,
    budget: { totalKW: 40, totalMWhPerYear: 300, allocations: [{ area: 'North', kW: 25 }] },
  });
});
afterAll(async () => {
  await getPool().end();
});

async function stored(tag: string) {
  const [r] = await db
    .select({ line: lines, result: lineResults, design: lineDesigns })
    .from(lines)
    .innerJoin(lineResults, eq(lineResults.lineId, lines.id))
    .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
    .where(and(eq(lines.projectId, projectId), eq(lines.tag, tag)));
  return r;
}

describe('calculation sheet', () => {
  it('states the stored numbers of the line: thickness, heat flow, line total with fittings, surface and annual figures', async () => {
    const { line, result, design } = await stored('N-1');
    const { basis } = await getDesignBasis({ projectId });
    const u = formatterFor(basis);
    const cands = result.candidates as CandidateRow[];
    const at = cands.find((c) => c[0] === design!.thicknessMm)!;
    const extent = result.bareHeatW / cands[0][2];
    expect(extent).toBeCloseTo(100, 6); // the 100 m run
    const lineW = at[2] * extent + lineFittingsW(basis, line, at[2], cands[0][2], at[0] === 0);
    const { buf, fileName } = await lineSheetPdf({ projectId, lineId: line.id });
    expect(fileName).toBe('DOC-1-calculation-sheet-N-1.pdf');
    expect(buf.subarray(0, 5).toString()).toBe('%PDF-');
    const text = await pdfText(buf);
    expect(text).toContain('Insulation calculation sheet');
    expect(text).toContain('Line N-1');
    expect(text).toContain(`Chosen ${u.thickness(design!.thicknessMm)}`);
    expect(text).toContain(u.heatFlowPerUnit(at[2], false));
    expect(text).toContain(`Line total ${u.power(lineW)}`);
    expect(text).toContain(`Heat-loss conditions ${u.temp(at[3])}`);
    expect(text).toContain(`${u.energy(result.annualMWh)} a year`);
    expect(text).toContain(`Calculation version ${result.calcVersion}`);
    expect(text).toMatch(/Page 1 of \d/);
    expect(text).toContain('Burns: a surface that stays above the touch limit');
  });

  it('prints the filtered lines as one PDF, one sheet each, and refuses an empty filter with a sentence', async () => {
    const r = await sheetsBatchPdf({ projectId, filter: { area: 'North' } });
    expect(r.count).toBe(2);
    const pages = await pdfPages(r.buf);
    expect(
      pages.filter((p) => p.includes('Insulation calculation sheet')).map((p) => /Line (\S+)/.exec(p)?.[1]),
    ).toEqual(['N-1', 'N-2']);
    await expectAppError(
      sheetsBatchPdf({ projectId, filter: { area: 'Nowhere' } }),
      'invalid',
      /No line matches this filter/,
    );
    await expectAppError(
      sheetsBatchPdf({ projectId, filter: {}, max: 3 }),
      'invalid',
      /selects 4 lines; at most 3 sheets/,
    );
  });

  it('runs a batch of sheets as a worker job: one PDF per line in a zip kept in the object store', async () => {
    const [job] = await db
      .insert(jobs)
      .values({ projectId, kind: 'sheets-batch', createdBy: userId, input: { filter: { area: 'South' } } })
      .returning();
    await runJob(job.id);
    const [done] = await db.select().from(jobs).where(eq(jobs.id, job.id));
    expect(done).toMatchObject({ state: 'done', done: 2, total: 2 });
    expect(done.result).toMatchObject({ sheets: 2, fileName: 'DOC-1-calculation-sheets-2-lines.zip' });
    const [b] = await db.select().from(sheetBatches).where(eq(sheetBatches.jobId, job.id));
    expect(b.pdf).toBeNull();
    expect(b.documentKey).toBe(
      `projects/${projectId}/sheet-batches/${job.id}/DOC-1-calculation-sheets-2-lines.zip`,
    );
    const zip = await getDocument({
      key: b.documentKey!,
      sha256: b.documentSha256!,
      bytes: b.documentBytes!,
    });
    expect(createHash('sha256').update(zip).digest('hex')).toBe(b.documentSha256);
    const files = unzipSync(new Uint8Array(zip));
    // Tag order as a person reads it ("=CMD|calc" sorts before "S-1" in "C" collation: '=' < 'S').
    expect(Object.keys(files)).toEqual([
      'DOC-1-calculation-sheet-CMD-calc.pdf',
      'DOC-1-calculation-sheet-S-1.pdf',
    ]);
    const s1 = await pdfText(Buffer.from(files['DOC-1-calculation-sheet-S-1.pdf']));
    expect(s1).toContain('Line S-1');
    expect(s1).not.toContain('Line =CMD|calc');
    // Each sheet numbers its own pages.
    expect(s1).toMatch(/Page 1 of \d/);
    expect(await pdfText(Buffer.from(files['DOC-1-calculation-sheet-CMD-calc.pdf']))).toContain(
      'Line =CMD|calc',
    );
  });
});

describe('design report', () => {
  it('states the budget page totals: designed and bare heat loss, the budget and the area allocation', async () => {
    const dash = await budget.dashboard({ projectId });
    const { basis } = await getDesignBasis({ projectId });
    const u = formatterFor(basis);
    const { buf } = await draftReport({ projectId, userId });
    const text = await pdfText(buf);
    expect(text).toContain('DRAFT (not issued)');
    expect(text).toContain(`Designed heat loss ${u.power(dash.designed.kW * 1000)}`);
    expect(text).toContain(`Bare heat loss ${u.power(dash.bare.kW * 1000)}`);
    expect(text).toContain(`Designed total ${u.power(dash.designed.kW * 1000)}`);
    expect(text).toContain(`Budget ${u.power(40_000)}`);
    const north = dash.areas.find((a) => a.area === 'North')!;
    // The area row: lines, decided, flagged, bare, designed, allocation (kW without the unit).
    const kw = (v: number) => u.power(v * 1000).replace(/ kW$/, '');
    expect(text).toContain(`North 2 2 0 ${kw(north.bareKW)} ${kw(north.designedKW)} ${kw(25)}`);
    expect(text).toContain(`Total 4 2 0 ${kw(dash.bare.kW)} ${kw(dash.designed.kW)} ${kw(40)}`);
    expect(text).toContain('Churchill–Bernstein');
    expect(text).toContain('Freezing: stagnant water lines freeze');
  });

  it('issues numbered revisions kept byte for byte after the project changes', async () => {
    const r1 = await issueReport({ projectId, userId, note: 'For review' });
    const r2 = await issueReport({ projectId, userId });
    expect([r1.number, r2.number]).toEqual([1, 2]);
    const one = await getReportPdf({ projectId, number: 1 });
    expect(one.fileName).toBe('DOC-1-design-report-rev-1.pdf');
    expect(createHash('sha256').update(one.buf).digest('hex')).toBe(r1.sha256);
    const text = await pdfText(one.buf);
    expect(text).toContain('Revision 1');
    expect(text).toContain('For review');
    // The project moves on: another area decided, the budget changed; revision 1 stays as issued.
    await acceptRecommendations({ projectId, userId, area: 'South' });
    await budget.saveBudget({
      projectId,
      userId,
      budget: { totalKW: 60, totalMWhPerYear: 300, allocations: [] },
    });
    const again = await getReportPdf({ projectId, number: 1 });
    expect(Buffer.compare(Buffer.from(again.buf), Buffer.from(one.buf))).toBe(0);
    // Read from the object store, not the database: the row holds key, size and SHA-256 only.
    const [row] = await db
      .select()
      .from(designReports)
      .where(and(eq(designReports.projectId, projectId), eq(designReports.number, 1)));
    expect(row.pdf).toBeNull();
    expect(row.documentKey).toBe(`projects/${projectId}/reports/${row.id}/DOC-1-design-report-rev-1.pdf`);
    const fromStore = await getDocument({
      key: row.documentKey!,
      sha256: row.sha256,
      bytes: row.documentBytes!,
    });
    expect(Buffer.compare(fromStore, Buffer.from(one.buf))).toBe(0);
    const r3 = await issueReport({ projectId, userId });
    expect(await pdfText((await getReportPdf({ projectId, number: 3 })).buf)).toContain(
      `Budget ${formatterFor((await getDesignBasis({ projectId })).basis).power(60_000)}`,
    );
    expect((await listReports({ projectId })).map((r) => r.number)).toEqual([3, 2, 1]);
    expect(r3.summary.decided).toBe(4);
    await expectAppError(getReportPdf({ projectId, number: 9 }), 'not_found', /revision 9 does not exist/);
    await expectAppError(
      issueReport({ projectId, userId, note: 'x'.repeat(301) }),
      'invalid',
      /at most 300 characters/,
    );
  });

  it('serves a revision issued before the object store from its column, and moves it there byte for byte', async () => {
    const pdf = Buffer.from('%PDF-1.4 legacy report kept in the database\n%%EOF\n');
    const sha256 = createHash('sha256').update(pdf).digest('hex');
    const [legacy] = await db
      .insert(designReports)
      .values({
        projectId,
        number: 50,
        issuedBy: userId,
        basisRevision: 1,
        calcVersion: 'legacy',
        summary: {},
        sha256,
        pdf,
      })
      .returning({ id: designReports.id });
    expect(Buffer.compare((await getReportPdf({ projectId, number: 50 })).buf, pdf)).toBe(0);
    const owner = new Pool({ connectionString: env.databaseOwnerUrl(), max: 1 });
    try {
      const r = await moveLegacyDocuments(owner);
      expect(r).toEqual({ moved: 1, refused: [] });
      expect(await moveLegacyDocuments(owner)).toEqual({ moved: 0, refused: [] });
    } finally {
      await owner.end();
    }
    const [row] = await db.select().from(designReports).where(eq(designReports.id, legacy.id));
    expect(row).toMatchObject({ pdf: null, documentBytes: pdf.length, sha256 });
    expect(row.documentKey).toBe(`projects/${projectId}/reports/${legacy.id}/design-report-rev-50.pdf`);
    expect(Buffer.compare((await getReportPdf({ projectId, number: 50 })).buf, pdf)).toBe(0);
  });
});

describe('results export', () => {
  it('exports exactly the filtered lines as .xlsx: numbers as numbers, units in headers, filter, frozen header, formula-safe text', async () => {
    const listed = await listLines({
      projectId,
      area: 'South',
      page: 0,
      size: 100,
      sort: 'tag',
      dir: 'asc',
    });
    const x = await resultsExport({ projectId, filter: { area: 'South' }, format: 'xlsx' });
    expect(x.count).toBe(listed.total);
    expect(x.fileName).toBe('DOC-1-results-filtered.xlsx');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(x.body as unknown as ArrayBuffer);
    const ws = wb.getWorksheet('Results')!;
    const headers = (ws.getRow(1).values as unknown[]).slice(1) as string[];
    for (const h of [
      'Normal temperature (°C)',
      'Length (m)',
      'Chosen (mm)',
      'Heat loss per length (W/m)',
      'Heat loss of the line incl. fittings (kW)',
      'Governing criterion',
      'Review',
    ])
      expect(headers).toContain(h);
    expect(ws.autoFilter).toBeTruthy();
    expect(ws.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 });
    expect(ws.rowCount).toBe(1 + listed.total);
    const col = (h: string) => headers.indexOf(h) + 1;
    const tags = [2, 3].map((r) => ws.getRow(r).getCell(col('Tag')).value);
    // A tag or service a spreadsheet would run as a formula is written as text with a leading apostrophe.
    expect(tags).toEqual(["'=CMD|calc", 'S-1']);
    expect(ws.getRow(2).getCell(col('Service')).value).toBe("'@SUM(A1)");
    const s1 = ws.getRow(3);
    expect(s1.getCell(col('Normal temperature (°C)')).value).toBe(150);
    expect(s1.getCell(col('Length (m)')).value).toBe(40);
    const { result } = await stored('S-1');
    const chosen = s1.getCell(col('Chosen (mm)')).value;
    expect(typeof chosen).toBe('number');
    const hf = s1.getCell(col('Heat loss per length (W/m)')).value as number;
    const at = (result.candidates as CandidateRow[]).find((c) => c[0] === chosen)!;
    expect(hf).toBeCloseTo(at[2], 2);
  });

  it('exports everything when asked, and as CSV the same table', async () => {
    const all = await resultsTable({ projectId, filter: null });
    expect(all.rows.map((r) => r[0])).toEqual(['=CMD|calc', 'N-1', 'N-2', 'S-1']);
    const csv = resultsCsv(all);
    const rows = csv
      .replace(/^\ufeff/, '')
      .trim()
      .split('\r\n');
    expect(rows).toHaveLength(5);
    expect(rows[1].startsWith("'=CMD|calc,'@SUM(A1),South,")).toBe(true);
  });

  it('writes US customary projects in °F and ft (NIST SP 811: t/°F = 1.8·t/°C + 32, 1 ft = 0.3048 m exactly)', async () => {
    const { basis } = await getDesignBasis({ projectId });
    await saveDesignBasis({ projectId, userId, basis: { ...basis, unitSystem: 'US' } });
    const t = await resultsTable({ projectId, filter: { q: 'N-1' } });
    const h = (name: string) => t.headers.indexOf(name);
    expect(t.rows[0][h('Normal temperature (°F)')]).toBe(302); // 150 °C
    expect(t.rows[0][h('Length (ft)')]).toBeCloseTo(328.08, 2); // 100 m
    await saveDesignBasis({ projectId, userId, basis });
  });
});
