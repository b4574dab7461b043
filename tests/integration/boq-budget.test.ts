import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import ExcelJS from 'exceljs';
import { and, eq } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { lineResults, lines, projects } from '@/db/schema';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { lineTracing } from '@/lib/lines/tracing';
import * as auth from '@/lib/auth/service';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import * as boq from '@/lib/boq/store';
import { currentBillFactors, saveBillFactors } from '@/lib/boq/factors';
import { projectProgress } from '@/lib/lines/progress';
import * as budget from '@/lib/budget/store';
import { expectAppError } from '../support/errors';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

const row = (tag: string, o: Record<string, string | number | null> = {}) =>
  TEMPLATE_HEADERS.map((h) =>
    h in o
      ? o[h]
      : ((
          {
            'Line tag': tag,
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
          } as Record<string, string | number>
        )[h] ?? null),
  );

let projectId = '',
  userId = '';
async function importRows(rows: (string | number | null)[][]) {
  const d = await createDraft({
    projectId,
    userId,
    fileName: 'b.xlsx',
    bytes: await lineListWorkbook(rows),
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
}
async function readBook(n: number) {
  const { buf } = await boq.issueWorkbook({ projectId, number: n });
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(buf as unknown as ArrayBuffer);
  return wb;
}

beforeAll(async () => {
  const o = await auth.signUp({
    name: 'Bill Owner',
    email: `boq.${randomUUID().slice(0, 8)}@example.com`,
    password: 'annular-volume-check',
    organizationName: 'BOQ Org',
  });
  userId = o.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: o.organizationId, code: 'BQ-1', name: 'Bill test' })
    .returning();
  projectId = p.id;
  await importRows([
    row('N-1'),
    // Marked traced in the line list (the template's "Heat tracing" column).
    row('N-2', { Area: 'South', NPS: '2', 'Length (m)': 50, 'Heat tracing': 'yes' }),
    row('=CMD|calc', { Service: '@SUM(A1)', 'Length (m)': 20 }),
  ]);
});
afterAll(async () => {
  await getPool().end();
});

describe('bill of quantities on PostgreSQL', () => {
  it('refuses to issue with no decided line', async () => {
    await expectAppError(boq.issueBill({ projectId, userId }), 'invalid', /nothing to issue/);
  });

  it('issues two revisions; both workbooks read back with the right cells and the delta', async () => {
    await acceptRecommendations({ projectId, userId, area: 'North' });
    const first = await boq.issueBill({ projectId, userId });
    expect(first).toMatchObject({ number: 1, counted: 2, pending: 1 });
    const wb1 = await readBook(1);
    expect(wb1.worksheets.map((w) => w.name)).toEqual([
      'Summary',
      'Fittings',
      'Removable covers',
      'Jacketing',
      'Accessories',
      'Vessels and flat',
      'Line schedule',
      'Change from previous',
      'Notes',
    ]);
    const sum1 = wb1.getWorksheet('Summary')!;
    expect(sum1.getRow(1).values).toEqual([
      undefined,
      'Material',
      'Product form',
      'Layer',
      'Size',
      'Thickness (mm)',
      'Length incl. waste (m)',
      'Outer-face area (m²)',
      'Volume (m³)',
      'Material at design-basis price (EUR)',
    ]);
    expect(sum1.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 });
    expect(sum1.autoFilter).toBeTruthy();
    const lengths1 = sum1.getColumn(6).values.slice(2) as number[];
    // North lines only: 100 m + 2 elbows × 0.6 m and 20 m + 2 × 0.6 m, with 5 % waste (common-practice factors).
    expect(lengths1.reduce((a, b) => a + b, 0)).toBeCloseTo((101.2 + 21.2) * 1.05, 2);
    expect(typeof lengths1[0]).toBe('number');
    const sched = wb1.getWorksheet('Line schedule')!;
    const tags = sched.getColumn(1).values.slice(2) as string[];
    expect(tags).toContain("'=CMD|calc"); // written as text, never as a formula
    const injected = sched.getRow(tags.indexOf("'=CMD|calc") + 2).getCell(1);
    expect(injected.type).toBe(ExcelJS.ValueType.String);
    expect(sched.getRow(tags.indexOf('N-2') + 2).getCell(9).value).toBe('pending: no thickness chosen');
    const notes = wb1.getWorksheet('Notes')!;
    expect(notes.getCell('B4').value).toBe(1);
    expect(String(notes.getCell('A17').value)).toBe('Basis of factors');

    await acceptRecommendations({ projectId, userId, area: 'South' });
    const second = await boq.issueBill({ projectId, userId });
    expect(second).toMatchObject({ number: 2, counted: 3, pending: 0 });
    const wb2 = await readBook(2);
    const lengths2 = wb2.getWorksheet('Summary')!.getColumn(6).values.slice(2) as number[];
    expect(lengths2.reduce((a, b) => a + b, 0)).toBeCloseTo((101.2 + 21.2 + 51.2) * 1.05, 2);
    const delta = wb2.getWorksheet('Change from previous')!;
    const rows = delta.getSheetValues().slice(2).filter(Boolean) as unknown[][];
    const nps2 = rows.find((r) => String(r[2]).includes('NPS 2') && r[3] === 'length m')!;
    expect(nps2[4]).toBe(0);
    expect(nps2[5]).toBeCloseTo(51.2 * 1.05, 2);
    const { delta: d } = await boq.getIssue({ projectId, number: 2 });
    expect(d.some((x) => x.sheet === 'jackets' && x.change > 0)).toBe(true);
    // The first issue is unchanged by the second.
    expect((await readBook(1)).getWorksheet('Summary')!.getColumn(6).values.slice(2)).toEqual(lengths1);
    await expectAppError(boq.getIssue({ projectId, number: 3 }), 'not_found', /only issued revisions/);
  });

  it('warns that nothing changed since issue 2, refuses an identical issue until confirmed, and counts covers', async () => {
    expect(await boq.unchangedSince({ projectId })).toBe(2);
    await expectAppError(
      boq.issueBill({ projectId, userId }),
      'conflict',
      'Nothing changed since issue 2: this revision would be identical. Confirm to issue it anyway.',
    );
    expect((await boq.listIssues({ projectId })).map((i) => i.number)).toEqual([2, 1]);
    const third = await boq.issueBill({ projectId, userId, evenIfUnchanged: true });
    expect(third.number).toBe(3);
    // The overview's counts per step: 3 lines, all solved and decided, none flagged (out of reach, hot only), 3 billed in issue 3.
    expect(await projectProgress({ projectId })).toEqual({
      lines: 3,
      solved: 3,
      decided: 3,
      flagged: 0,
      signedOff: 0,
      billed: 3,
      lastIssue: 3,
    });
    // A project factor changes the bill: no longer identical.
    await saveBillFactors({
      projectId,
      userId,
      factors: {
        ...(await currentBillFactors({ projectId })),
        bandSpacingM: {
          value: 0.45,
          source: 'Client specification C-110, clause 4.2 (invented for the test)',
        },
      },
    });
    expect(await boq.unchangedSince({ projectId })).toBe(null);
    const q = await boq.previewBill({ projectId });
    // N-1: 100 m + 2 elbows × 0.6 m = 101.2 m of jacket → ⌈101.2 / 0.45⌉ = 225 bands.
    const bands = q.accessories!.filter((a) => a.item === 'Jacket bands' && a.unit === 'count');
    expect(bands.reduce((a, b) => a + b.quantity, 0)).toBe(
      Math.ceil(101.2 / 0.45) + Math.ceil((20 + 1.2) / 0.45) + Math.ceil((50 + 1.2) / 0.45),
    );
    expect(q.factors.accessories!.bandSpacingM.source).toBe(
      'Client specification C-110, clause 4.2 (invented for the test)',
    );
  });
});

describe('heat-loss budget', () => {
  it('totals equal the sum of the saved line results', async () => {
    const d = await budget.dashboard({ projectId, whatIf: { policy: 'recommended' } });
    const results = await db.select().from(lineResults).where(eq(lineResults.projectId, projectId));
    const sumKW = results.reduce((s, r) => s + (r.totalHeatW ?? 0), 0) / 1000;
    // Straight runs are the saved results; fittings and supports come on top (equivalent lengths).
    expect(d.straightKW).toBeCloseTo(sumKW, 6);
    expect(d.fittingsKW).toBeGreaterThan(0);
    expect(d.designed.kW).toBeCloseTo(sumKW + d.fittingsKW, 6);
    expect(d.bare.kW).toBeCloseTo(results.reduce((s, r) => s + r.bareHeatW, 0) / 1000 + d.bareFittingsKW, 6);
    expect(d.bareFittingsKW).toBeGreaterThan(d.fittingsKW);
    expect(d.savings.kW).toBeCloseTo(d.bare.kW - d.designed.kW, 9);
    expect(d.designed.mwhPerYear).toBeCloseTo((d.designed.kW * d.hours) / 1000, 9);
    expect(d.areas.map((a) => a.area)).toEqual(['North', 'South']);
    expect(d.top[0].designedKW).toBeGreaterThanOrEqual(d.top[d.top.length - 1].designedKW);
  });
  it("heat tracing: a traced line's required W/m is its stored loss × safety factor + fittings, and the totals are the sum of the lines [X hand calculation]", async () => {
    const { basis } = await getDesignBasis({ projectId });
    const rows = await db
      .select({ line: lines, result: lineResults })
      .from(lines)
      .innerJoin(lineResults, eq(lineResults.lineId, lines.id))
      .where(eq(lines.projectId, projectId));
    const n2 = rows.find((r) => r.line.tag === 'N-2')!;
    expect(n2.line.heatTraced).toBe(true);
    expect(rows.filter((r) => r.result.tracing !== null).map((r) => r.line.tag)).toEqual(['N-2']);
    const t = n2.result.tracing!;
    // An H line marked traced holds the project's maintain temperature (5 °C default) in the freeze conditions.
    expect(t).toMatchObject({
      reason: 'line-list',
      maintainC: 5,
      airC: basis.conditions.freeze.airC,
      windMs: basis.conditions.freeze.windMs,
    });
    const mm = n2.result.recommendedMm!;
    const q = t.lossByMm.find(([x]) => x === mm)![1];
    expect(q).toBeGreaterThan(0);
    // By hand: 2 elbows and 0.33 supports per metre over 50 m as equivalent lengths of insulated pipe
    // (the project's fittings), × the safety factor (1.2 default, common practice).
    const f = basis.fittings;
    const eqM = 2 * f.elbowM + f.supportsPerM * 50 * f.supportM;
    const requiredW = basis.heatTracing.safetyFactor * (q * 50 + eqM * q);
    const duty = lineTracing(basis, n2.line, t, mm)!;
    expect(duty.requiredWPerM).toBeCloseTo(requiredW / 50, 9);
    expect(duty.requiredWPerM).toBeCloseTo(1.2 * q * (1 + eqM / 50), 9);
    // Tracer: the run + 2 elbows × 0.3 m + 16.5 supports × 0.3 m (common-practice allowances).
    expect(duty.tracerM).toBeCloseTo(50 + 2 * 0.3 + 0.33 * 50 * 0.3, 9);
    const d = await budget.dashboard({ projectId, whatIf: { policy: 'recommended' } });
    expect(d.tracing.lines).toBe(1);
    expect(d.tracing.kW).toBeCloseTo(requiredW / 1000, 9);
    expect(d.tracing.areas).toHaveLength(1);
    expect(d.tracing.areas[0].area).toBe('South');
    expect(d.tracing.areas[0].kW).toBeCloseTo(requiredW / 1000, 9);
    expect(d.tracing.tracerM).toBeCloseTo(duty.tracerM!, 9);
    // Tracing is electrical duty beside the heat-loss budget, not inside it.
    const sumKW = rows.reduce((s, r) => s + (r.result.totalHeatW ?? 0), 0) / 1000;
    expect(d.designed.kW).toBeCloseTo(sumKW + d.fittingsKW, 6);
  });

  it('the issued bill has the traced line on its own "Heat tracing" sheet', async () => {
    const wb = await readBook(2);
    const ws = wb.getWorksheet('Heat tracing')!;
    expect(ws).toBeTruthy();
    const head = ws.getRow(1).values as unknown[];
    const col = (h: string) => head.indexOf(h);
    const r2 = ws.getRow(2);
    expect(r2.getCell(1).value).toBe('N-2');
    expect(r2.getCell(col('Pipe run (m)')).value).toBe(50);
    expect(r2.getCell(col('Tracer length (m)')).value).toBeCloseTo(50 + 0.6 + 4.95, 3);
    const { basis } = await getDesignBasis({ projectId });
    const [n2] = await db
      .select({ line: lines, result: lineResults })
      .from(lines)
      .innerJoin(lineResults, eq(lineResults.lineId, lines.id))
      .where(and(eq(lines.projectId, projectId), eq(lines.tag, 'N-2')));
    const duty = lineTracing(basis, n2.line, n2.result.tracing, n2.result.recommendedMm)!;
    expect(r2.getCell(col('Required tracer output (W/m)')).value).toBeCloseTo(duty.requiredWPerM, 3);
    // kW to 0.1 W (4 decimals) in the sheet.
    const kW = r2.getCell(col('Duty (kW electrical)')).value as number;
    expect(Math.abs(kW - duty.requiredW / 1000)).toBeLessThanOrEqual(0.000051);
  });

  it('flags an area over its allocation, and the what-if policy changes the totals without saving', async () => {
    const base = await budget.dashboard({ projectId });
    const north = base.areas.find((a) => a.area === 'North')!;
    await budget.saveBudget({
      projectId,
      userId,
      budget: {
        totalKW: 100,
        totalMWhPerYear: 900,
        allocations: [
          { area: 'North', kW: north.designedKW * 0.5 },
          { area: 'South', kW: 10 },
        ],
      },
    });
    const d = await budget.dashboard({ projectId });
    expect(d.areas.find((a) => a.area === 'North')!.over).toBe(true);
    expect(d.warnings[0]).toMatch(/^North: .* kW designed against .* kW allocated/);
    const thicker = await budget.dashboard({ projectId, whatIf: { policy: 'economic-plus-one' } });
    expect(thicker.designed.kW).toBeLessThan(d.designed.kW);
    const pricier = await budget.dashboard({ projectId, whatIf: { energyPricePerKWh: d.price * 2 } });
    expect(pricier.designed.costPerYear).toBeCloseTo(d.designed.costPerYear * 2, 6);
    expect((await budget.getBudget({ projectId }))!.totalKW).toBe(100);
  });
  it('refuses non-numeric and negative entries by field', async () => {
    await expectAppError(
      budget.saveBudget({
        projectId,
        userId,
        budget: { totalKW: 'lots', totalMWhPerYear: 10, allocations: [] },
      }),
      'invalid',
      /Total budget must be a number/,
    );
    await expectAppError(
      budget.saveBudget({
        projectId,
        userId,
        budget: { totalKW: 50, totalMWhPerYear: 10, allocations: [{ area: 'North', kW: -5 }] },
      }),
      'invalid',
      /Allocation cannot be negative/,
    );
    await expectAppError(
      budget.saveBudget({
        projectId,
        userId,
        budget: {
          totalKW: 5,
          totalMWhPerYear: 10,
          allocations: [
            { area: 'North', kW: 4 },
            { area: 'South', kW: 4 },
          ],
        },
      }),
      'invalid',
      /more than the 5 kW budget/,
    );
    expect((await budget.getBudget({ projectId }))!.totalKW).toBe(100);
  });
});
