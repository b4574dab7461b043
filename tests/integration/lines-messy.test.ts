/**
 * The messy corpus imported into PostgreSQL through the same store calls the mapping step makes:
 * what is suggested, what the questions are, what is stored (exact rows, SI values), what is refused
 * whole, and that answers are remembered for the next revision.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asc, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '@/db/client';
import { columnMappings, importDrafts, lineListRevisions, lines, projects } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft, previewDraft } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import { expectAppError } from '../support/errors';
import {
  bomCommaCsv,
  equipmentWorkbook,
  problemsWorkbook,
  semicolon1252Csv,
  tabUtf16Csv,
  titleRowsWorkbook,
  unitsRowWorkbook,
} from '../fixtures/messy-lines';

let userId = '',
  orgId = '';
async function newProject(code: string) {
  const [p] = await db.insert(projects).values({ organizationId: orgId, code, name: code }).returning();
  return p.id;
}
const stored = async (projectId: string) =>
  (await db.select().from(lines).where(eq(lines.projectId, projectId)).orderBy(asc(lines.tag))).map((l) => ({
    tag: l.tag,
    geometry: l.geometry,
    nps: l.nps,
    od: l.outsideDiameterMm,
    lengthM: l.lengthM === null ? null : +l.lengthM.toFixed(3),
    areaM2: l.surfaceAreaM2 === null ? null : +l.surfaceAreaM2.toFixed(3),
    heightM: l.heightM === null ? null : +l.heightM.toFixed(3),
    tempC: +l.normalTempC.toFixed(2),
    purposes: l.purposes,
    outdoor: l.outdoor,
    service: l.service,
  }));

beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Messy Tester',
    email: `messy.${randomUUID().slice(0, 8)}@example.com`,
    password: 'flange-gasket-rack-7',
    organizationName: 'Messy Org',
  });
  userId = owner.userId;
  orgId = owner.organizationId;
});
afterAll(async () => {
  await getPool().end();
});

describe('a US client workbook with title rows, its own location words and an equipment sheet', () => {
  let projectId = '';
  it('suggests the header row and the mapping, asks two questions, imports nothing until they are answered', async () => {
    projectId = await newProject('MESSY-US');
    const d = await createDraft({
      projectId,
      userId,
      fileName: 'unit40.xlsx',
      bytes: await titleRowsWorkbook(),
    });
    expect(d.defaultSheet).toBe('Line designation');
    expect(d.readAs).toBeNull();
    const s = d.sheets.find((x) => x.name === d.defaultSheet)!;
    expect([s.headerRow, s.rowCount, s.gridRows]).toEqual([4, 4, 7]);
    expect(s.topRows.map((r) => r.row)).toEqual([1, 2, 4, 5, 6, 8, 9]);
    expect(s.suggested.columns).toEqual({
      tag: 0,
      service: 1,
      nps: 2,
      length: 3,
      normalTemp: 4,
      maxTemp: 5,
      purposes: 6,
      location: 7,
      notes: 9,
    });
    expect(d.sheets.map((x) => [x.name, x.hidden, x.headerRow, x.rowCount])).toEqual([
      ['Line designation', false, 4, 4],
      ['Rev B (old)', true, 1, 1],
      ['Equipment', false, 3, 2],
    ]);

    const choice = {
      projectId,
      draftId: d.draftId,
      sheetName: s.name,
      headerRow: s.headerRow,
      mapping: s.suggested,
    };
    const p = await previewDraft(choice);
    expect(p.unknownValues.map((u) => [u.value, u.count])).toEqual([
      ['Pipe rack', 2],
      ['Platform', 1],
    ]);
    expect(p.errorCount).toBe(2);
    await expectAppError(
      commitDraft({ ...choice, userId }),
      'invalid',
      /^Nothing was imported: 2 problems to fix first \(row 5, column H: Indoor \/ outdoor "Pipe rack" in 2 rows \(5, 9\)/,
    );
    expect(await db.select().from(lines).where(eq(lines.projectId, projectId))).toEqual([]);
    expect(
      await db.select().from(lineListRevisions).where(eq(lineListRevisions.projectId, projectId)),
    ).toEqual([]);

    const answered = {
      ...choice,
      mapping: { ...s.suggested, values: { location: { 'pipe rack': 'outdoor', platform: 'outdoor' } } },
    };
    const p2 = await previewDraft(answered);
    expect([p2.errorCount, p2.warningCount, p2.lineCount, p2.unknownValues]).toEqual([0, 1, 4, []]);
    const r = await commitDraft({ ...answered, userId });
    expect(r).toMatchObject({ revision: 1, lineCount: 4 });
    expect(await stored(projectId)).toEqual([
      {
        tag: '40-CD-301',
        geometry: 'horizontal-pipe',
        nps: '3/4',
        od: 26.7,
        lengthM: 18.288,
        areaM2: null,
        heightM: null,
        tempC: 121.11,
        purposes: ['heatConservation', 'personnelProtection'],
        outdoor: true,
        service: 'Condensate',
      },
      {
        tag: '40-CW-201',
        geometry: 'horizontal-pipe',
        nps: '4',
        od: 114.3,
        lengthM: 60.96,
        areaM2: null,
        heightM: null,
        tempC: 6.67,
        purposes: ['condensationControl'],
        outdoor: false,
        service: 'Chilled water',
      },
      {
        tag: '40-ST-101',
        geometry: 'horizontal-pipe',
        nps: '3',
        od: 88.9,
        lengthM: 36.576,
        areaM2: null,
        heightM: null,
        tempC: 148.89,
        purposes: ['heatConservation'],
        outdoor: true,
        service: 'LP steam',
      },
      {
        tag: '40-ST-102',
        geometry: 'horizontal-pipe',
        nps: '1-1/2',
        od: 48.3,
        lengthM: 24.384,
        areaM2: null,
        heightM: null,
        tempC: 148.89,
        purposes: ['personnelProtection'],
        outdoor: true,
        service: 'LP steam',
      },
    ]);
    const [mem] = await db.select().from(columnMappings).where(eq(columnMappings.projectId, projectId));
    expect(mem.headers).toEqual([
      'Line No.',
      'Service',
      'Size (in)',
      'Length (ft)',
      'Oper. Temp (°F)',
      'Design Temp (°F)',
      'Insul. Purpose',
      'Location',
      'Paint system',
      'Remarks',
    ]);
    expect((mem.mapping as { values: unknown }).values).toEqual({
      location: { 'pipe rack': 'outdoor', platform: 'outdoor' },
    });
  });

  it('the next revision of the same workbook asks nothing: the answers were remembered with the mapping', async () => {
    const d = await createDraft({
      projectId,
      userId,
      fileName: 'unit40-revD.xlsx',
      bytes: await titleRowsWorkbook(),
    });
    const s = d.sheets.find((x) => x.name === d.defaultSheet)!;
    expect(s.suggested.values).toEqual({ location: { 'pipe rack': 'outdoor', platform: 'outdoor' } });
    const p = await previewDraft({
      projectId,
      draftId: d.draftId,
      sheetName: s.name,
      headerRow: s.headerRow,
      mapping: s.suggested,
    });
    expect([p.errorCount, p.unknownValues.length, p.lineCount, p.diff.unchanged]).toEqual([0, 0, 4, 4]);
  });

  it('the equipment sheet imports vessels by area and height (ft² and ft converted)', async () => {
    const eqProject = await newProject('MESSY-EQ');
    const d = await createDraft({
      projectId: eqProject,
      userId,
      fileName: 'unit40.xlsx',
      bytes: await titleRowsWorkbook(),
    });
    const s = d.sheets.find((x) => x.name === 'Equipment')!;
    expect(s.suggested).toMatchObject({
      columns: {
        tag: 0,
        service: 1,
        geometry: 2,
        surfaceArea: 3,
        height: 4,
        normalTemp: 5,
        purposes: 6,
        location: 7,
      },
      units: { surfaceArea: 'ft²', height: 'ft', normalTemp: '°F' },
    });
    await commitDraft({
      projectId: eqProject,
      draftId: d.draftId,
      sheetName: 'Equipment',
      headerRow: 3,
      mapping: { ...s.suggested, values: { location: { platform: 'outdoor' } } },
      userId,
    });
    expect(await stored(eqProject)).toEqual([
      {
        tag: '40-D-02',
        geometry: 'vessel',
        nps: null,
        od: null,
        lengthM: null,
        areaM2: 20,
        heightM: 3.048,
        tempC: 148.89,
        purposes: ['heatConservation', 'personnelProtection'],
        outdoor: true,
        service: 'Flash drum',
      },
      {
        tag: '40-V-01',
        geometry: 'vessel',
        nps: null,
        od: null,
        lengthM: null,
        areaM2: 100,
        heightM: 6.096,
        tempC: 110,
        purposes: ['heatConservation', 'personnelProtection'],
        outdoor: true,
        service: 'Deaerator',
      },
    ]);
  });

  it('a header row the user picks replaces the detected one; an empty row is refused with a sentence', async () => {
    const pid = await newProject('MESSY-HDR');
    const d = await createDraft({
      projectId: pid,
      userId,
      fileName: 'unit40.xlsx',
      bytes: await titleRowsWorkbook(),
    });
    const s = d.sheets[0];
    // Row 2 (the revision row) as header: nothing maps, so the required fields are named.
    const p = await previewDraft({
      projectId: pid,
      draftId: d.draftId,
      sheetName: s.name,
      headerRow: 2,
      mapping: { columns: {}, units: {} },
    });
    expect(p.issues.map((i) => i.message)).toEqual([
      'No column is mapped to "Line / equipment tag", "Normal operating temperature" and a size ("Nominal size (NPS or DN)" or "Outside diameter" for pipes, "Surface area" or "Vessel shell outside diameter" for vessels, "Surface area" for flat surfaces), which are required. Choose the columns in the mapping.',
    ]);
    await expectAppError(
      previewDraft({
        projectId: pid,
        draftId: d.draftId,
        sheetName: s.name,
        headerRow: 3,
        mapping: s.suggested,
      }),
      'invalid',
      'Row 3 of sheet "Line designation" is empty or beyond its end; choose a row with the column names as the header row.',
    );
  });
});

describe('an equipment list by shell dimensions', () => {
  it("imports vessels and a tank with computed areas once the client's head word is answered, and solves them", async () => {
    const pid = await newProject('MESSY-SHELL');
    const d = await createDraft({
      projectId: pid,
      userId,
      fileName: 'equipment.xlsx',
      bytes: await equipmentWorkbook(),
    });
    const s = d.sheets[0];
    expect([s.headerRow, s.rowCount]).toEqual([3, 4]);
    const choice = {
      projectId: pid,
      draftId: d.draftId,
      sheetName: s.name,
      headerRow: 3,
      mapping: s.suggested,
    };
    expect((await previewDraft(choice)).unknownValues.map((u) => [u.field, u.value])).toEqual([
      ['headType', 'Dished'],
    ]);
    await commitDraft({
      ...choice,
      mapping: { ...s.suggested, values: { headType: { dished: 'torispherical' } } },
      userId,
    });
    expect((await stored(pid)).map((l) => [l.tag, l.geometry, l.areaM2, l.heightM, l.tempC])).toEqual([
      ['40-C-201', 'vessel', 40.841, 12, 180],
      ['40-D-401', 'vessel', 18.325, 3, 150],
      ['40-T-301', 'vessel', 330.02, 8, 80],
      ['40-V-101', 'vessel', 46.371, 2, 120],
    ]);
    expect((await solveProject({ projectId: pid })).solved).toBe(4);
  });
});

describe('CSV files as they come', () => {
  it('a German Windows-1252 semicolon CSV with decimal commas imports once "Rohrbrücke" is answered', async () => {
    const pid = await newProject('MESSY-DE');
    const d = await createDraft({
      projectId: pid,
      userId,
      fileName: 'isolierliste.csv',
      bytes: semicolon1252Csv(),
    });
    expect(d.readAs).toBe('Windows-1252, semicolon-separated');
    const s = d.sheets[0];
    expect([s.headerRow, s.rowCount]).toEqual([4, 4]);
    expect(s.suggested.units).toMatchObject({ nps: 'DN', length: 'm', normalTemp: '°C' });
    const choice = {
      projectId: pid,
      draftId: d.draftId,
      sheetName: 'CSV',
      headerRow: 4,
      mapping: s.suggested,
    };
    const p = await previewDraft(choice);
    expect(p.unknownValues.map((u) => [u.field, u.value, u.rows])).toEqual([['location', 'Rohrbrücke', [8]]]);
    await commitDraft({
      ...choice,
      mapping: { ...s.suggested, values: { location: { rohrbrücke: 'outdoor' } } },
      userId,
    });
    expect((await stored(pid)).map((l) => [l.tag, l.nps, l.lengthM, l.tempC, l.outdoor, l.service])).toEqual([
      ['F-3001', '6', 80, 10, true, 'Löschwasser'],
      ['K-2001', '4', 40, 6, false, 'Kaltwasser'],
      ['S-1001', '3', 12.5, 165.5, true, 'Dampf 6 bar'],
      ['S-1002', '2', 1250, 165.5, false, 'Dampf 6 bar'],
    ]);
  });

  it('a French tab-separated UTF-16 export and a Spanish UTF-8 BOM CSV import without questions', async () => {
    const fr = await newProject('MESSY-FR');
    const d = await createDraft({ projectId: fr, userId, fileName: 'liste.csv', bytes: tabUtf16Csv() });
    expect(d.readAs).toBe('UTF-16LE, tab-separated');
    await commitDraft({
      projectId: fr,
      draftId: d.draftId,
      sheetName: 'CSV',
      mapping: d.sheets[0].suggested,
      userId,
    });
    expect(
      (await stored(fr)).map((l) => [
        l.tag,
        l.nps,
        l.lengthM,
        l.tempC,
        l.purposes.join('+'),
        l.outdoor,
        l.service,
      ]),
    ).toEqual([
      ['G-20', '3', 30, 7, 'condensationControl', false, 'Eau glacée'],
      ['V-10', '4', 25, 180, 'heatConservation', true, 'Vapeur'],
      ['V-11', '1', 8, 180, 'personnelProtection', false, 'Vapeur'],
    ]);
    const es = await newProject('MESSY-ES');
    const e = await createDraft({
      projectId: es,
      userId,
      fileName: 'lineas.csv',
      bytes: bomCommaCsv(),
    });
    expect(e.readAs).toBe('UTF-8 with BOM, comma-separated');
    await commitDraft({
      projectId: es,
      draftId: e.draftId,
      sheetName: 'CSV',
      mapping: e.sheets[0].suggested,
      userId,
    });
    const rows = await db.select().from(lines).where(eq(lines.projectId, es)).orderBy(asc(lines.tag));
    expect(
      rows.map((l) => [
        l.tag,
        l.service,
        l.nps,
        +l.lengthM!.toFixed(2),
        +l.normalTempC.toFixed(2),
        l.accessible,
      ]),
    ).toEqual([
      ['L-500', 'Vapor, baja presión', '2', 381, 148.89, true],
      ['L-501', 'Condensado', '1-1/2', 27.43, 104.44, false],
    ]);
  });
});

describe('a pipe without its length yet', () => {
  it('imports as incomplete: solved per metre, left out of the budget totals and the bill', async () => {
    const pid = await newProject('MESSY-TBD');
    const csv = Buffer.from(
      'Line,NPS,Length (m),Temp (°C),Purpose\nT-1,4,50,180,H\nT-2,4,TBD,180,H\nT-3,2,,180,H\n',
    );
    const d = await createDraft({ projectId: pid, userId, fileName: 'tbd.csv', bytes: csv });
    const choice = { projectId: pid, draftId: d.draftId, sheetName: 'CSV', mapping: d.sheets[0].suggested };
    const p = await previewDraft(choice);
    expect(p.issues.map((i) => `${i.row} ${i.column} ${i.severity}: ${i.message}`)).toEqual([
      '3 C warning: Length "TBD": the line imports as incomplete — solved per metre, left out of the heat-loss totals and the bill until a revision gives its length.',
      '4 C warning: No length: the line imports as incomplete — solved per metre, left out of the heat-loss totals and the bill until a revision gives its length.',
    ]);
    await commitDraft({ ...choice, userId });
    expect((await stored(pid)).map((l) => [l.tag, l.lengthM])).toEqual([
      ['T-1', 50],
      ['T-2', null],
      ['T-3', null],
    ]);
    expect((await solveProject({ projectId: pid })).solved).toBe(3);
    await acceptRecommendations({ projectId: pid, userId });
    const { dashboard } = await import('@/lib/budget/store');
    const dash = await dashboard({ projectId: pid });
    expect([dash.lineCount, dash.incompleteCount]).toEqual([1, 2]);
    const { collectBillLines } = await import('@/lib/boq/store');
    const bill = await collectBillLines({ projectId: pid });
    expect(bill.map((b) => [b.tag, b.status]).sort()).toEqual([
      ['T-1', { counted: true }],
      ['T-2', { counted: false, reason: 'no length yet (incomplete line)' }],
      ['T-3', { counted: false, reason: 'no length yet (incomplete line)' }],
    ]);
  });
});

describe('refusals name row, column and value, and never half-write', () => {
  it('reducer, blank temperature and duplicate tag refuse the whole file', async () => {
    const pid = await newProject('MESSY-BAD');
    const ok = await createDraft({
      projectId: pid,
      userId,
      fileName: 'units.xlsx',
      bytes: await unitsRowWorkbook(),
    });
    await commitDraft({
      projectId: pid,
      draftId: ok.draftId,
      sheetName: 'Lines',
      mapping: ok.sheets[0].suggested,
      userId,
    });
    const before = await stored(pid);
    expect(before.map((l) => [l.tag, l.nps, l.lengthM, l.tempC])).toEqual([
      ['U-1', '2', 30.48, 100],
      ['U-2', '6', 10, 200],
    ]);
    const d = await createDraft({
      projectId: pid,
      userId,
      fileName: 'problems.xlsx',
      bytes: await problemsWorkbook(),
    });
    await expectAppError(
      commitDraft({
        projectId: pid,
        draftId: d.draftId,
        sheetName: 'Lines',
        mapping: d.sheets[0].suggested,
        userId,
      }),
      'invalid',
      'Nothing was imported: 3 problems to fix first (row 4, column B: "2x1" is a reducer (two sizes); give the line one size, or split it into a line per size.; row 5, column D: The normal operating temperature is empty.; row 7, column A: Duplicate tag "P-3": also in row 6.).',
    );
    expect(await stored(pid)).toEqual(before);
    expect(
      await db.select().from(lineListRevisions).where(eq(lineListRevisions.projectId, pid)),
    ).toHaveLength(1);
    const [draft] = await db.select().from(importDrafts).where(eq(importDrafts.id, d.draftId));
    expect(draft.importedRevision).toBeNull();
  });

  it('unreadable files get a sentence', async () => {
    const pid = await newProject('MESSY-UNREAD');
    await expectAppError(
      createDraft({ projectId: pid, userId, fileName: 'renamed.csv', bytes: await unitsRowWorkbook() }),
      'invalid',
      /spreadsheet workbook renamed to \.csv/,
    );
    await expectAppError(
      createDraft({
        projectId: pid,
        userId,
        fileName: 'quotes.csv',
        bytes: Buffer.from('Tag,Temp\nA-0,100\n"A-1,150\nA-2,160\n'),
      }),
      'invalid',
      'This CSV file could not be read: a quoted field in row 3 is not closed, so the rest of the file would run into one cell. Check the quotes in that row and upload again.',
    );
  });
});
