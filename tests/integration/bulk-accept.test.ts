import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '@/db/client';
import {
  auditLog,
  bulkAccepts,
  lineDesigns,
  lineResults,
  lines,
  projects,
  type LineDesign,
} from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { type BulkItem, applyBulkAccept, previewBulkAccept, undoBulkAccept } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { pickDesign } from '@/lib/lines/picks-store';
import { solveProject } from '@/lib/lines/results-store';
import type { LineFilter } from '@/lib/lines/filter';
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
            Service: 'Bulk steam',
            Area: 'A',
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
const id: Record<string, string> = {};

async function importRows(rows: Row[]) {
  const draft = await createDraft({
    projectId,
    userId,
    fileName: 'bulk.xlsx',
    bytes: await lineListWorkbook(rows),
  });
  const s = draft.sheets.find((x) => x.name === draft.defaultSheet)!;
  return commitDraft({
    projectId,
    draftId: draft.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId,
  });
}
async function designs(): Promise<Record<string, LineDesign>> {
  const r = await db
    .select({ tag: lines.tag, d: lineDesigns })
    .from(lineDesigns)
    .innerJoin(lines, eq(lines.id, lineDesigns.lineId))
    .where(eq(lines.projectId, projectId));
  return Object.fromEntries(r.map((x) => [x.tag, x.d]));
}
async function result(tag: string) {
  const [r] = await db.select().from(lineResults).where(eq(lineResults.lineId, id[tag]));
  return r;
}
const preview = (filter: LineFilter) => previewBulkAccept({ projectId, filter });
const apply = (filter: LineFilter, items: BulkItem[]) =>
  applyBulkAccept({ projectId, userId, filter, items });
/** The decision fields a restore must bring back exactly (the version moves on by design). */
const decision = ({ version: _v, ...d }: LineDesign) => {
  void _v;
  return d;
};

/*
 * Area A: B-1, B-2 undecided; B-3 a manual pick below the personnel criterion; B-4 accepted, then its
 * temperature changed (needs re-decision, solved again); B-5 undecided with a result from an older
 * calculation version (stale); B-6 the current recommendation accepted; B-7 an accepted
 * recommendation of an earlier result (another thickness). Area Other: C-1 undecided.
 */
beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Bulk Tester',
    email: `bulk.${randomUUID().slice(0, 8)}@example.com`,
    password: 'copper-riser-gasket',
    organizationName: 'Bulk Test Org',
  });
  userId = owner.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: 'BA-1', name: 'Bulk accept test' })
    .returning();
  projectId = p.id;
  const tags = ['B-1', 'B-2', 'B-3', 'B-4', 'B-5', 'B-6', 'B-7'];
  await importRows([...tags.map((t) => row(t)), row('C-1', { Area: 'Other' })]);
  await solveProject({ projectId });
  for (const l of await db.select().from(lines).where(eq(lines.projectId, projectId))) id[l.tag] = l.id;

  const rec = async (tag: string) => (await result(tag)).recommendedMm!;
  const cands = (await result('B-3')).candidates;
  const thinner = cands[1][0];
  expect(thinner).toBeLessThan(await rec('B-3'));
  const b3 = await pickDesign({
    projectId,
    lineId: id['B-3'],
    userId,
    thicknessMm: thinner,
    reason: 'Existing lagging reused',
    expectedVersion: 0,
  });
  expect(b3).toMatchObject({ source: 'manual', belowCriterion: 'personnel' });
  for (const t of ['B-4', 'B-6', 'B-7'])
    await pickDesign({
      projectId,
      lineId: id[t],
      userId,
      thicknessMm: await rec(t),
      expectedVersion: 0,
    });
  await importRows([
    ...tags.map((t) => row(t, t === 'B-4' ? { 'Normal temp (°C)': 170 } : {})),
    row('C-1', { Area: 'Other' }),
  ]);
  await solveProject({ projectId });
  // B-7 holds what an earlier solve recommended: another candidate.
  const rec7 = await rec('B-7');
  const other = (await result('B-7')).candidates.find((c) => c[0] > 0 && c[0] !== rec7)!;
  await db
    .update(lineDesigns)
    .set({
      thicknessMm: other[0],
      layers: other[1].map(([materialId, thicknessMm]) => ({ materialId, thicknessMm })),
    })
    .where(eq(lineDesigns.lineId, id['B-7']));
  // B-5's result was computed by an older calculation version: stale, though basis and inputs are current.
  await db.update(lineResults).set({ calcVersion: '2020.01-1' }).where(eq(lineResults.lineId, id['B-5']));
});
afterAll(async () => {
  await getPool().end();
});

describe('accept recommendation for the filtered lines', () => {
  it('counts what it would change and leave alone for the exact filter, status included', async () => {
    const a = await preview({ area: 'A' });
    expect(a).toMatchObject({
      change: 3,
      newDecisions: 2,
      updated: 1,
      leftAlone: { manual: 1, redecide: 1, stale: 1, noRecommendation: 0, alreadyAccepted: 1 },
      leftAloneTotal: 4,
    });
    expect(a.items.map((i) => i.lineId).sort()).toEqual([id['B-1'], id['B-2'], id['B-7']].sort());
    expect(a.items.find((i) => i.lineId === id['B-7'])!.version).toBe(1);
    expect(a.items.find((i) => i.lineId === id['B-1'])).toEqual({
      lineId: id['B-1'],
      version: 0,
      thicknessMm: (await result('B-1')).recommendedMm,
    });

    // The defect: with Status "Manual pick" the table shows B-3 alone, and nothing may change.
    expect(await preview({ area: 'A', status: 'overridden' })).toMatchObject({
      change: 0,
      leftAlone: { manual: 1 },
      leftAloneTotal: 1,
      items: [],
    });
    expect(await preview({ status: 'redecide' })).toMatchObject({
      change: 0,
      leftAlone: { redecide: 1 },
      leftAloneTotal: 1,
    });
    // Undecided everywhere: B-1, B-2 and C-1 change, B-5 (stale) does not.
    const u = await preview({ status: 'undecided' });
    expect(u).toMatchObject({
      change: 3,
      newDecisions: 3,
      updated: 0,
      leftAlone: { stale: 1 },
      leftAloneTotal: 1,
    });
    expect(u.items.map((i) => i.lineId).sort()).toEqual([id['B-1'], id['B-2'], id['C-1']].sort());
    expect(await preview({ q: 'b-', status: 'undecided' })).toMatchObject({ change: 2, leftAloneTotal: 1 });
    expect(await preview({ status: 'stale' })).toMatchObject({
      change: 0,
      leftAlone: { stale: 1 },
      leftAloneTotal: 1,
    });
    expect((await preview({})).change).toBe(4);
  });

  it('refuses, writing nothing, when a counted line moved or another one would change', async () => {
    const before = await designs();
    const p = await preview({ area: 'A' });
    await expectAppError(
      apply(
        { area: 'A' },
        p.items.map((i) => (i.lineId === id['B-7'] ? { ...i, version: 0 } : i)),
      ),
      'conflict',
      /^1 line changed since the counts were shown .*Nothing was accepted/,
    );
    await expectAppError(
      apply(
        { area: 'A' },
        p.items.filter((i) => i.lineId !== id['B-2']),
      ),
      'conflict',
      /^1 line changed since/,
    );
    await expectAppError(apply({ area: 'A' }, [...p.items, p.items[0]]), 'invalid', /names a line twice/);
    // B-1 goes stale (solved by another calculation version) between the preview and the confirmation.
    const calc = (await result('B-1')).calcVersion;
    await db.update(lineResults).set({ calcVersion: '2020.01-1' }).where(eq(lineResults.lineId, id['B-1']));
    await expectAppError(apply({ area: 'A' }, p.items), 'conflict', /^1 line changed since/);
    await db.update(lineResults).set({ calcVersion: calc }).where(eq(lineResults.lineId, id['B-1']));
    expect(await designs()).toEqual(before);
    expect(await db.select().from(bulkAccepts).where(eq(bulkAccepts.projectId, projectId))).toHaveLength(0);
  });

  it('with a status filter, changes only the lines that filter shows', async () => {
    const before = await designs();
    const p = await preview({ q: 'B-', status: 'undecided' });
    const r = await apply({ q: 'B-', status: 'undecided' }, p.items);
    expect(r.accepted).toBe(2);
    const after = await designs();
    expect(Object.keys(after).sort()).toEqual([...Object.keys(before), 'B-1', 'B-2'].sort());
    for (const t of Object.keys(before)) expect(after[t]).toEqual(before[t]); // B-7 is outside the filter
    expect(after['B-1']).toMatchObject({
      source: 'recommended',
      thicknessMm: (await result('B-1')).recommendedMm,
      version: 1,
      reason: null,
      belowCriterion: null,
    });
    const undone = await undoBulkAccept({ projectId, userId, bulkAcceptId: r.bulkAcceptId! });
    expect(undone).toEqual({ restored: 2, changedSince: [], removed: [] });
    expect(await designs()).toEqual(before);
  });

  it('accepts the counted lines only, leaves manual picks and re-decisions untouched, and undo restores exactly', async () => {
    const before = await designs();
    const p = await preview({ area: 'A' });
    const r = await apply({ area: 'A' }, p.items);
    expect(r.accepted).toBe(3);
    // The same confirmation sent twice (a double click, a second tab): the second changes nothing.
    await expectAppError(
      apply({ area: 'A' }, p.items),
      'conflict',
      /^3 lines changed since the counts were shown/,
    );
    const after = await designs();
    expect(after['B-3']).toEqual(before['B-3']); // the manual pick, its reason and below-criterion mark
    expect(after['B-3']).toMatchObject({
      source: 'manual',
      reason: 'Existing lagging reused',
      belowCriterion: 'personnel',
    });
    expect(after['B-4']).toEqual(before['B-4']);
    expect(after['B-4'].needsRedecision).toBe(true);
    expect(after['B-6']).toEqual(before['B-6']);
    expect(after['B-5']).toBeUndefined();
    expect(after['C-1']).toBeUndefined();
    for (const t of ['B-1', 'B-2', 'B-7']) {
      const res = await result(t);
      expect(after[t]).toMatchObject({
        source: 'recommended',
        thicknessMm: res.recommendedMm,
        layers: res.layers,
        needsRedecision: false,
        decidedBy: userId,
      });
    }
    expect(after['B-1'].version).toBe(2); // its earlier, undone decision was version 1: never given out again
    expect(after['B-7'].version).toBe(before['B-7'].version + 1);

    const audit = await db
      .select()
      .from(auditLog)
      .where(
        and(
          eq(auditLog.projectId, projectId),
          inArray(auditLog.action, ['bulk accept', 'recommendation accepted']),
        ),
      )
      .orderBy(asc(auditLog.id));
    const mine = audit.filter((a) => (a.after as { bulkAcceptId?: string }).bulkAcceptId === r.bulkAcceptId);
    expect(mine.map((a) => a.tag ?? a.action).sort()).toEqual(['B-1', 'B-2', 'B-7', 'bulk accept']);
    expect(mine.find((a) => a.action === 'bulk accept')!.after).toMatchObject({
      filter: { area: 'A' },
      accepted: 3,
      leftAlone: { manual: 1, redecide: 1, stale: 1, alreadyAccepted: 1 },
    });
    expect(mine.find((a) => a.tag === 'B-7')!.before).toMatchObject({
      source: 'recommended',
      thicknessMm: before['B-7'].thicknessMm,
    });

    const u = await undoBulkAccept({ projectId, userId, bulkAcceptId: r.bulkAcceptId! });
    expect(u).toEqual({ restored: 3, changedSince: [], removed: [] });
    const restored = await designs();
    expect(Object.keys(restored).sort()).toEqual(Object.keys(before).sort());
    for (const t of Object.keys(before)) expect(decision(restored[t])).toEqual(decision(before[t]));
    expect(restored['B-7'].version).toBe(after['B-7'].version + 1);
    const undoAudit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.projectId, projectId), eq(auditLog.action, 'bulk accept undone')));
    expect(
      undoAudit
        .filter((a) => a.tag)
        .map((a) => a.tag)
        .sort(),
    ).toEqual(['B-1', 'B-1', 'B-2', 'B-2', 'B-7']); // this undo and the previous test's
    expect(
      undoAudit.find(
        (a) =>
          a.tag === 'B-7' && (a.after as { thicknessMm: number }).thicknessMm === before['B-7'].thicknessMm,
      ),
    ).toBeTruthy();

    await expectAppError(
      undoBulkAccept({ projectId, userId, bulkAcceptId: r.bulkAcceptId! }),
      'conflict',
      /already been undone/,
    );
    await expectAppError(
      undoBulkAccept({ projectId, userId, bulkAcceptId: randomUUID() }),
      'not_found',
      /does not exist/,
    );
    // A pick made against the accepted design (version 2) is refused; against "no decision" it continues the numbering.
    const rec = (await result('B-1')).recommendedMm!;
    await expectAppError(
      pickDesign({ projectId, lineId: id['B-1'], userId, thicknessMm: rec, expectedVersion: 2 }),
      'conflict',
      /Someone else changed/,
    );
    expect(
      (await pickDesign({ projectId, lineId: id['B-1'], userId, thicknessMm: rec, expectedVersion: 0 }))
        .version,
    ).toBe(3);
  });

  it('undo leaves a line decided again since as it is and names it', async () => {
    const p = await preview({ area: 'A' });
    expect(p).toMatchObject({ change: 2, leftAlone: { alreadyAccepted: 2 } }); // B-1 was accepted by hand just now
    const r = await apply({ area: 'A' }, p.items);
    const b2 = (await designs())['B-2'];
    const cands = (await result('B-2')).candidates.map((c) => c[0]);
    await pickDesign({
      projectId,
      lineId: id['B-2'],
      userId,
      thicknessMm: cands.at(-1)!,
      reason: 'Thicker for the jetty wind',
      expectedVersion: b2.version,
    });
    const u = await undoBulkAccept({ projectId, userId, bulkAcceptId: r.bulkAcceptId! });
    expect(u).toEqual({ restored: 1, changedSince: ['B-2'], removed: [] });
    expect((await designs())['B-2']).toMatchObject({
      source: 'manual',
      reason: 'Thicker for the jetty wind',
      thicknessMm: cands.at(-1),
    });
  });
});
