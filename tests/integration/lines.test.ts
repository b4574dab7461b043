import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, asc, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import ExcelJS from 'exceljs';
import { db, getPool } from '@/db/client';
import {
  auditLog,
  designBases,
  lineDesigns,
  lineListRevisions,
  lineResults,
  lines,
  projects,
} from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { getDesignBasis, saveDesignBasis } from '@/lib/lines/basis-store';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft, previewDraft } from '@/lib/lines/import-store';
import { pickDesign } from '@/lib/lines/picks-store';
import { listLines, solveProject } from '@/lib/lines/results-store';
import { getPickerOptions, lineTablePage, tableRowDeciding } from '@/lib/lines/picker';
import { worstMargin } from '@/lib/lines/margin';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';
import { expectAppError } from '../support/errors';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

type Row = (string | number | null)[];
const row = (tag: string, o: Partial<Record<string, string | number | null>> = {}): Row =>
  TEMPLATE_HEADERS.map((h) =>
    h in o
      ? o[h]!
      : ((
          {
            'Line tag': tag,
            Service: 'Test steam',
            Area: 'T1',
            Geometry: 'Horizontal pipe',
            NPS: '4',
            'Length (m)': 50,
            'Normal temp (°C)': 180,
            'Max temp (°C)': 190,
            Purpose: 'H,P',
            Location: 'Outdoor',
            Accessible: 'yes',
          } as Record<string, string | number>
        )[h] ?? null),
  );

let projectId = '',
  userId = '';

async function importRows(rows: Row[], fileName = 'list.xlsx') {
  const draft = await createDraft({ projectId, userId, fileName, bytes: await lineListWorkbook(rows) });
  const s = draft.sheets.find((x) => x.name === draft.defaultSheet)!;
  return {
    draft,
    sheet: s,
    commit: () =>
      commitDraft({
        projectId,
        draftId: draft.draftId,
        sheetName: s.name,
        mapping: s.suggested,
        userId,
      }),
  };
}

beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Line Tester',
    email: `lines.${randomUUID().slice(0, 8)}@example.com`,
    password: 'copper-riser-gasket',
    organizationName: 'Line Test Org',
  });
  userId = owner.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: 'LT-1', name: 'Line test' })
    .returning();
  projectId = p.id;
});
afterAll(async () => {
  await getPool().end();
});

describe('design basis reads', () => {
  it('reading a project that never saved a basis writes nothing; the first write creates it at revision 2', async () => {
    const [p] = await db
      .insert(projects)
      .values({
        organizationId: (await db.select().from(projects).where(eq(projects.id, projectId)))[0]
          .organizationId,
        code: 'LT-R',
        name: 'Read only',
      })
      .returning();
    const read = await getDesignBasis({ projectId: p.id });
    expect(read.revision).toBe(1);
    expect(read.basis).toEqual(DEFAULT_DESIGN_BASIS);
    expect(await db.select().from(designBases).where(eq(designBases.projectId, p.id))).toHaveLength(0);
    const saved = await saveDesignBasis({
      projectId: p.id,
      userId,
      basis: { ...DEFAULT_DESIGN_BASIS, dewPointMarginK: DEFAULT_DESIGN_BASIS.dewPointMarginK + 1 },
    });
    expect(saved.revision).toBe(2);
    expect((await getDesignBasis({ projectId: p.id })).revision).toBe(2);
  });
});

describe('line-list import on PostgreSQL', () => {
  it('imports a valid list with exactly the rows given, converted to SI', async () => {
    const { commit, sheet } = await importRows([
      row('L-100'),
      row('L-101', { NPS: '2', 'Normal temp (°C)': 6, 'Max temp (°C)': 8, Purpose: 'C', Location: 'Indoor' }),
      row('V-1', {
        Geometry: 'Vessel',
        NPS: null,
        'Length (m)': null,
        'Surface area (m2)': 30,
        'Height (m)': 4,
        'Normal temp (°C)': 95,
        'Max temp (°C)': 100,
      }),
    ]);
    expect(sheet.suggested.columns.tag).toBe(0);
    const r = await commit();
    expect(r).toMatchObject({ revision: 1, lineCount: 3 });
    expect(r.diff.added.sort()).toEqual(['L-100', 'L-101', 'V-1']);
    const stored = await db.select().from(lines).where(eq(lines.projectId, projectId));
    expect(stored).toHaveLength(3);
    const l100 = stored.find((l) => l.tag === 'L-100')!;
    expect(l100).toMatchObject({
      geometry: 'horizontal-pipe',
      nps: '4',
      outsideDiameterMm: 114.3,
      lengthM: 50,
      normalTempC: 180,
      maxTempC: 190,
      outdoor: true,
      accessible: true,
      purposes: ['heatConservation', 'personnelProtection'],
    });
    expect(stored.find((l) => l.tag === 'V-1')).toMatchObject({
      geometry: 'vessel',
      surfaceAreaM2: 30,
      heightM: 4,
      outsideDiameterMm: null,
    });
    expect(stored.find((l) => l.tag === 'L-101')!.outdoor).toBe(false);
  });

  it('solves and stores every line with what it was computed from', async () => {
    const s = await solveProject({ projectId });
    expect(s.solved).toBe(3);
    const results = await db.select().from(lineResults).where(eq(lineResults.projectId, projectId));
    expect(results).toHaveLength(3);
    const list = await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc' });
    const l100 = list.rows.find((r) => r.tag === 'L-100')!;
    expect(l100.recommendedMm).toBeGreaterThan(0);
    expect(['personnel', 'economic']).toContain(l100.governing);
    expect(l100.stale).toBe(false);
    expect(l100.surfaceTempC!).toBeLessThan(60);
    const cold = list.rows.find((r) => r.tag === 'L-101')!;
    expect(cold.governing).toBe('condensation');
    // Solving again touches nothing: nothing is stale.
    expect((await solveProject({ projectId })).solved).toBe(0);
  });

  it('refuses an erroneous revision whole: nothing written, the previous revision intact', async () => {
    const before = await db.select().from(lines).where(eq(lines.projectId, projectId));
    const { commit } = await importRows([
      row('L-100', { 'Normal temp (°C)': 999 }),
      row('L-100'),
      row('L-200', { 'Length (m)': 'long' }),
    ]);
    await expectAppError(
      commit(),
      'invalid',
      /Nothing was imported: 3 problems.*row 2, column K: The maximum temperature.*row 3, column A: Duplicate tag "L-100".*row 4, column G: Length must be a number/,
    );
    const after = await db.select().from(lines).where(eq(lines.projectId, projectId));
    expect(after.map((l) => [l.tag, l.normalTempC, l.revision]).sort()).toEqual(
      before.map((l) => [l.tag, l.normalTempC, l.revision]).sort(),
    );
    expect(
      await db.select().from(lineListRevisions).where(eq(lineListRevisions.projectId, projectId)),
    ).toHaveLength(1);
  });

  it('a revision updates by tag, shows the difference, keeps picks and marks changed lines for re-decision', async () => {
    await acceptRecommendations({ projectId, userId });
    const designs = await db.select().from(lineDesigns).where(eq(lineDesigns.projectId, projectId));
    expect(designs).toHaveLength(3);
    const { draft, sheet } = await importRows([
      row('L-100', { Service: 'Renamed steam' }),
      row('L-101', { NPS: '2', 'Normal temp (°C)': 4, 'Max temp (°C)': 8, Purpose: 'C', Location: 'Indoor' }),
      row('L-300'),
    ]);
    const preview = await previewDraft({
      projectId,
      draftId: draft.draftId,
      sheetName: sheet.name,
      mapping: sheet.suggested,
    });
    expect(preview.errorCount).toBe(0);
    expect(preview.diff.added).toEqual(['L-300']);
    expect(preview.diff.removed).toEqual(['V-1']);
    expect(preview.diff.changed).toEqual([
      { tag: 'L-100', changes: [{ field: 'service', from: 'Test steam', to: 'Renamed steam' }] },
      { tag: 'L-101', changes: [{ field: 'normalTempC', from: 6, to: 4 }] },
    ]);
    const r = await commitDraft({
      projectId,
      draftId: draft.draftId,
      sheetName: sheet.name,
      mapping: sheet.suggested,
      userId,
    });
    expect(r.revision).toBe(2);
    const now = await db
      .select({
        tag: lines.tag,
        needs: lineDesigns.needsRedecision,
        why: lineDesigns.redecisionReason,
        version: lines.inputVersion,
      })
      .from(lines)
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(eq(lines.projectId, projectId));
    const by = Object.fromEntries(now.map((x) => [x.tag, x]));
    expect(by['L-100']).toMatchObject({ needs: false, version: 1 }); // name change only: the pick survives
    expect(by['L-101']).toMatchObject({ needs: true, why: 'Revision 2 changed normalTempC', version: 2 });
    expect(by['L-300'].needs).toBeNull(); // new line, undecided
    expect(by['V-1']).toBeUndefined();
    await expectAppError(
      commitDraft({
        projectId,
        draftId: draft.draftId,
        sheetName: sheet.name,
        mapping: sheet.suggested,
        userId,
      }),
      'conflict',
      /already imported as revision 2/,
    );
    const stale = await listLines({
      projectId,
      page: 0,
      size: 10,
      sort: 'tag',
      dir: 'asc',
      status: 'stale',
    });
    expect(stale.rows.map((x) => x.tag).sort()).toEqual(['L-101', 'L-300']);
  });

  it('a design-basis change marks every result stale until solved again', async () => {
    await solveProject({ projectId });
    expect(
      (await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc', status: 'stale' })).total,
    ).toBe(0);
    const { revision } = await saveDesignBasis({
      projectId,
      userId,
      basis: { ...DEFAULT_DESIGN_BASIS, touchContactSeconds: 10 },
    });
    expect(revision).toBe(2);
    expect(
      (await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc', status: 'stale' })).total,
    ).toBe(3);
    expect((await solveProject({ projectId })).solved).toBe(3);
    // Display units alone change no result: the revision stays and nothing goes stale.
    const again = await saveDesignBasis({
      projectId,
      userId,
      basis: { ...DEFAULT_DESIGN_BASIS, touchContactSeconds: 10, unitSystem: 'US' },
    });
    expect(again.revision).toBe(2);
    expect(
      (await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc', status: 'stale' })).total,
    ).toBe(0);
    // Each save that changes something is in the audit trail with the sections before and after; saving the same again records nothing.
    await saveDesignBasis({
      projectId,
      userId,
      basis: { ...DEFAULT_DESIGN_BASIS, touchContactSeconds: 10, unitSystem: 'US' },
    });
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.projectId, projectId), eq(auditLog.action, 'design basis saved')))
      .orderBy(asc(auditLog.at));
    expect(audit).toHaveLength(2);
    expect(audit[0].before).toEqual({ revision: 1, touchContactSeconds: 5 });
    expect(audit[0].after).toEqual({ revision: 2, touchContactSeconds: 10 });
    expect(audit[1].after).toEqual({ revision: 2, unitSystem: 'US' });
  });

  it('picks: a reason for a manual pick, flagged below a hard criterion, and the second of two concurrent saves refused', async () => {
    const { rows } = await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc' });
    const l = rows.find((r) => r.tag === 'L-100')!;
    const cands = (await getPickerOptions({ projectId, lineId: l.id })).candidates.map((c) => c.mm);
    const v = l.designVersion ?? 0;
    await expectAppError(
      pickDesign({ projectId, lineId: l.id, userId, thicknessMm: cands[1], expectedVersion: v }),
      'invalid',
      /give a reason/,
    );
    await expectAppError(
      pickDesign({
        projectId,
        lineId: l.id,
        userId,
        thicknessMm: 33,
        reason: 'odd',
        expectedVersion: v,
      }),
      'invalid',
      /not a candidate/,
    );
    const first = await pickDesign({
      projectId,
      lineId: l.id,
      userId,
      thicknessMm: cands[1],
      reason: 'Existing lagging reused',
      expectedVersion: v,
    });
    expect(first.source).toBe('manual');
    expect(first.belowCriterion).toBe('personnel');
    await expectAppError(
      pickDesign({
        projectId,
        lineId: l.id,
        userId,
        thicknessMm: l.recommendedMm!,
        expectedVersion: v,
      }),
      'conflict',
      /Someone else changed this line/,
    );
    const [saved] = await db.select().from(lineDesigns).where(eq(lineDesigns.lineId, l.id));
    expect(saved).toMatchObject({
      thicknessMm: cands[1],
      reason: 'Existing lagging reused',
      belowCriterion: 'personnel',
      version: v + 1,
    });
    // The table row carries only the candidate at the chosen thickness (read in SQL from the stored
    // table), with the same deciding numbers and worst margin as the picker's full list.
    const after = (await listLines({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc' })).rows.find(
      (r) => r.tag === 'L-100',
    )!;
    expect(after.shownCandidate![0]).toBe(cands[1]);
    const picker = await getPickerOptions({ projectId, lineId: l.id });
    const { basis } = await getDesignBasis({ projectId });
    const deciding = await tableRowDeciding(
      basis,
      after as never,
      after.jacketId,
      after.shownCandidate,
      async () => {
        throw new Error('not needed');
      },
    );
    expect(deciding.shown).toEqual(picker.candidates.find((c) => c.mm === cands[1]));
    expect(deciding.limits).toEqual(picker.limits);
    expect(deciding.limits.personnelLimitC).toBe(55); // bare metal at the 10 s contact saved in the design-basis test above (ISO 13732-1, ≈55 °C read from the figure [R])
    expect(deciding.worstMargin).toEqual({
      criterion: 'personnel',
      marginK: 55 - deciding.shown!.personnelC!,
    });
    expect(deciding.worstMargin!.marginK).toBeLessThan(0);
    // What the route sends for that row: the same numbers, without the candidate table.
    const page = await lineTablePage({ projectId, page: 0, size: 10, sort: 'tag', dir: 'asc' });
    const sent = page.rows.find((r) => r.tag === 'L-100')!;
    expect(sent).toMatchObject({ personnelLimitC: 55, condensationNeedC: null, chosenMm: cands[1] });
    expect(sent.shown).toEqual({ ...deciding.shown, mm: undefined });
    // The worst margin is derived from what is sent (the browser does the same).
    expect(sent).not.toHaveProperty('worstMargin');
    expect(worstMargin(sent.shown!, sent)).toEqual(deciding.worstMargin);
    expect(Object.keys(sent)).not.toContain('candidates');
  });
});

describe('bad files get a clear message and store nothing', () => {
  const tryUpload = (fileName: string, bytes: Buffer) => createDraft({ projectId, userId, fileName, bytes });
  it('wrong type, corrupt, password-protected, old .xls, empty, too large; a Latin-1 CSV is decoded, not refused', async () => {
    await expectAppError(
      tryUpload('list.pdf', Buffer.from('%PDF-1.4')),
      'invalid',
      /as an \.xlsx workbook or a \.csv file/,
    );
    await expectAppError(
      tryUpload('list.xlsx', Buffer.from('this is not a zip')),
      'invalid',
      /not a valid \.xlsx workbook/,
    );
    await expectAppError(
      tryUpload(
        'list.xlsx',
        Buffer.concat([Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]), Buffer.alloc(512)]),
      ),
      'invalid',
      /password-protected/,
    );
    await expectAppError(
      tryUpload('list.xlsx', Buffer.concat([Buffer.from('PK\x03\x04'), Buffer.alloc(100)])),
      'invalid',
      /could not be read/,
    );
    await expectAppError(tryUpload('list.xls', Buffer.from('x')), 'invalid', /Old \.xls workbooks/);
    await expectAppError(tryUpload('list.csv', Buffer.alloc(0)), 'invalid', /empty/);
    const latin1 = await tryUpload(
      'list.csv',
      Buffer.from([0x54, 0x61, 0x67, 0x0a, 0x4c, 0x2d, 0xe9, 0x31, 0x0a]),
    );
    expect(latin1.readAs).toBe('Windows-1252, comma-separated');
    expect(latin1.sheets[0].topRows).toEqual([
      { row: 1, cells: ['Tag'] },
      { row: 2, cells: ['L-é1'] },
    ]);
    await expectAppError(
      tryUpload('list.xlsx', Buffer.alloc(60 * 1024 * 1024)),
      'invalid',
      /60\.0 MB; the limit is 20 MB/,
    );
  });
  it('an empty workbook and a header-only sheet', async () => {
    const wb = new ExcelJS.Workbook();
    wb.addWorksheet('Empty');
    await expectAppError(
      tryUpload('empty.xlsx', Buffer.from(await wb.xlsx.writeBuffer())),
      'invalid',
      /no sheet with data/,
    );
    const { draft, sheet } = await importRows([]);
    const p = await previewDraft({
      projectId,
      draftId: draft.draftId,
      sheetName: sheet.name,
      mapping: sheet.suggested,
    });
    expect(p.issues[0].message).toMatch(/has a header row but no lines/);
  });
  it('reads a CSV with a BOM, hidden sheets flagged, formula cells warned', async () => {
    const csv = await tryUpload(
      'list.csv',
      Buffer.from('\ufeffLine tag,Normal temp (°F),NPS,Length (ft)\nC-1,350,3,100\n', 'utf8'),
    );
    expect(csv.sheets[0].suggested.units).toMatchObject({ normalTemp: '°F', length: 'ft' });
    const wb = new ExcelJS.Workbook();
    const hidden = wb.addWorksheet('Old', { state: 'hidden' });
    hidden.addRow(['x']);
    hidden.addRow(['y']);
    const ws = wb.addWorksheet('Lines');
    ws.addRow(['Line tag', 'NPS', 'Length (m)', 'Normal temp (°C)']);
    ws.addRow(['F-1', '2', 10, { formula: '100+50', result: 150 }]);
    const d = await tryUpload('f.xlsx', Buffer.from(await wb.xlsx.writeBuffer()));
    expect(d.sheets.map((s) => [s.name, s.hidden])).toEqual([
      ['Old', true],
      ['Lines', false],
    ]);
    expect(d.defaultSheet).toBe('Lines');
    const s = d.sheets[1];
    const p = await previewDraft({
      projectId,
      draftId: d.draftId,
      sheetName: 'Lines',
      mapping: s.suggested,
    });
    expect(p.errorCount).toBe(0);
    expect(p.issues.map((i) => i.message)).toContain(
      'Cell D2 holds a formula; its last calculated value was used.',
    );
  });
});
