/**
 * The line table's reads kept in the process (lib/lines/table-read-cache.ts): a pick, a solve, an
 * import, a design-basis save and a write from another connection show on the very next request; a
 * value read while its project changed is not kept; with the LISTEN connection down nothing is read
 * from the cache.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { Client } from 'pg';
import { db, getPool } from '@/db/client';
import { lines, projects } from '@/db/schema';
import { env } from '@/lib/env';
import * as auth from '@/lib/auth/service';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { pickDesign } from '@/lib/lines/picks-store';
import { getPickerOptions, lineTablePage } from '@/lib/lines/picker';
import { solveProject } from '@/lib/lines/results-store';
import type { LineQuery } from '@/lib/lines/results-store';
import {
  stopTableReadCache,
  TABLE_READ_LISTENER,
  tableReadCacheStats,
  tableReads,
} from '@/lib/lines/table-read-cache';
import { getDesignBasisShared, saveDesignBasis } from '@/lib/lines/basis-store';
import { lineListWorkbook, TEMPLATE_HEADERS } from '../../seed/line-list';

type Row = (string | number | null)[];
const row = (tag: string, tempC: number): Row =>
  TEMPLATE_HEADERS.map(
    (h) =>
      (
        ({
          'Line tag': tag,
          Service: 'Order test',
          Area: 'A1',
          Geometry: 'Horizontal pipe',
          NPS: '2',
          'Length (m)': 10,
          'Normal temp (°C)': tempC,
          'Max temp (°C)': tempC + 5,
          Purpose: 'H,P',
          Location: 'Outdoor',
          Accessible: 'yes',
        }) as Record<string, string | number>
      )[h] ?? null,
  );

let projectId = '',
  userId = '';
/** Another connection, as another process (the worker, a second web process) would write. */
let other: Client;

async function importRows(rows: Row[]) {
  const d = await createDraft({
    projectId,
    userId,
    fileName: 'order.xlsx',
    bytes: await lineListWorkbook(rows),
  });
  const s = d.sheets.find((x) => x.name === d.defaultSheet)!;
  return commitDraft({ projectId, draftId: d.draftId, sheetName: s.name, mapping: s.suggested, userId });
}

const q = (o: Partial<LineQuery> = {}): LineQuery => ({
  projectId,
  page: 0,
  size: 100,
  sort: 'normalTempC',
  dir: 'asc',
  ...o,
});
const tagsOf = async (o: Partial<LineQuery> = {}) => (await lineTablePage(q(o))).rows.map((r) => r.tag);

beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Order Tester',
    email: `order.${randomUUID().slice(0, 8)}@example.com`,
    password: 'flange-bolt-torque-7',
    organizationName: 'Order Test Org',
  });
  userId = owner.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: 'OC-1', name: 'Order cache' })
    .returning();
  projectId = p.id;
  await importRows([row('P-1', 150), row('P-2', 120), row('P-3', 90), row('P-4', 60)]);
  await solveProject({ projectId });
  other = new Client({ connectionString: env.databaseUrl() });
  await other.connect();
});
afterAll(async () => {
  await other.end();
  await stopTableReadCache();
  await getPool().end();
});

describe('the line table reads kept in the process', () => {
  it('keeps an order, a basis and rows once read and serves the next request from them', async () => {
    expect(await tagsOf()).toEqual(['P-4', 'P-3', 'P-2', 'P-1']);
    expect(tableReadCacheStats().listening).toBe(true);
    let reads = 0;
    const read = async () => {
      reads++;
      return { ids: ['x'], total: 1 };
    };
    await (await tableReads())!.get(projectId, 'probe', read);
    expect(await (await tableReads())!.get(projectId, 'probe', read)).toEqual({ ids: ['x'], total: 1 });
    expect(reads).toBe(1);
    // The order, the basis, the rows and the probe.
    expect(tableReadCacheStats().entries).toBeGreaterThanOrEqual(4);
    let rowReads = 0;
    const rows = async (ids: readonly string[]) => {
      rowReads += ids.length;
      return new Map(ids.map((id) => [id, `row ${id}`]));
    };
    const cache = (await tableReads())!;
    expect([...(await cache.many(projectId, 'probe rows', ['a', 'b'], rows, 1)).keys()]).toEqual(['a', 'b']);
    const again = await cache.many(projectId, 'probe rows', ['b', 'c'], rows, 1);
    expect([again.get('b'), again.get('c')]).toEqual(['row b', 'row c']);
    expect(rowReads).toBe(3); // a, b, then only c
  });

  it('a pick shows on the next request (filter "Undecided" and "Manual pick")', async () => {
    expect((await lineTablePage(q({ status: 'undecided' }))).total).toBe(4);
    expect(await tagsOf({ status: 'overridden' })).toEqual([]);
    const [p3] = await db.select().from(lines).where(eq(lines.tag, 'P-3'));
    const opts = await getPickerOptions({ projectId, lineId: p3.id });
    const page = await lineTablePage(q());
    const rec = page.rows.find((r) => r.tag === 'P-3')!.recommendedMm;
    const alt = opts.candidates.find((c) => c.mm !== rec && c.mm > 0 && c.ok)!;
    await pickDesign({
      projectId,
      lineId: p3.id,
      userId,
      thicknessMm: alt.mm,
      reason: 'stock on site',
      expectedVersion: 0,
    });
    const undecided = await lineTablePage(q({ status: 'undecided' }));
    expect(undecided.total).toBe(3);
    expect(undecided.rows.map((r) => r.tag)).toEqual(['P-4', 'P-2', 'P-1']);
    expect(await tagsOf({ status: 'overridden' })).toEqual(['P-3']);
    // The row itself (kept per line) shows the pick too.
    const p3row = (await lineTablePage(q())).rows.find((r) => r.tag === 'P-3')!;
    expect(p3row).toMatchObject({ chosenMm: alt.mm, source: 'manual', designVersion: 1 });
    expect(p3row.shown!.heatFlow).toBe(alt.heatFlow);
  });

  it('an import and the solve after it show on the next request (order, total, stale filter)', async () => {
    expect(await tagsOf({ status: 'stale' })).toEqual([]);
    // P-1 becomes the coldest, P-5 is new.
    await importRows([row('P-1', 40), row('P-2', 120), row('P-3', 90), row('P-4', 60), row('P-5', 200)]);
    expect(await tagsOf()).toEqual(['P-1', 'P-4', 'P-3', 'P-2', 'P-5']);
    expect(await tagsOf({ status: 'stale' })).toEqual(['P-1', 'P-5']);
    await solveProject({ projectId });
    expect(await tagsOf({ status: 'stale' })).toEqual([]);
    // Sorted by a result column: the hottest line loses the most heat per metre (same pipe size).
    const byLoss = await tagsOf({ sort: 'heatFlowPerUnit', dir: 'desc' });
    expect(byLoss[0]).toBe('P-5');
    expect(byLoss).toHaveLength(5);
  });

  it('a design-basis save shows on the next request, also one that keeps the revision', async () => {
    const before = await getDesignBasisShared({ projectId, reads: await tableReads() });
    expect(before.basis.unitSystem).toBe('SI');
    expect(await getDesignBasisShared({ projectId, reads: await tableReads() })).toBe(before);
    // The display units alone keep the revision (nothing goes stale), yet the page must follow them.
    await saveDesignBasis({ projectId, userId, basis: { ...before.basis, unitSystem: 'US' } });
    const after = await getDesignBasisShared({ projectId, reads: await tableReads() });
    expect(after.basis.unitSystem).toBe('US');
    expect(after.revision).toBe(before.revision);
    await saveDesignBasis({
      projectId,
      userId,
      basis: { ...after.basis, dewPointMarginK: after.basis.dewPointMarginK + 1 },
    });
    expect((await getDesignBasisShared({ projectId, reads: await tableReads() })).revision).toBe(
      before.revision + 1,
    );
    // Every line is stale after the revision changed: the stale filter (keyed by revision) says so.
    expect(await tagsOf({ status: 'stale' })).toHaveLength(5);
    await solveProject({ projectId });
    expect(await tagsOf({ status: 'stale' })).toEqual([]);
  });

  it('a write from another connection shows on the next request', async () => {
    expect(await tagsOf({ area: 'B7' })).toEqual([]);
    expect((await lineTablePage(q())).rows.find((r) => r.tag === 'P-2')!.area).toBe('A1');
    await other.query(`update lines set area = 'B7' where project_id = $1 and tag = 'P-2'`, [projectId]);
    expect(await tagsOf({ area: 'B7' })).toEqual(['P-2']);
    expect((await lineTablePage(q())).rows.find((r) => r.tag === 'P-2')!.area).toBe('B7');
    await other.query(`delete from lines where project_id = $1 and tag = 'P-4'`, [projectId]);
    expect(await tagsOf()).toEqual(['P-1', 'P-3', 'P-2', 'P-5']);
  });

  it('does not keep an order read while its project changed', async () => {
    let reads = 0;
    const read = async () => {
      reads++;
      if (reads === 1) {
        // The project changes (and its notification arrives) while this read is under way.
        await other.query(`update lines set service = 'changed' where project_id = $1 and tag = 'P-1'`, [
          projectId,
        ]);
        await new Promise((r) => setTimeout(r, 200));
      }
      return { ids: [`read ${reads}`], total: 1 };
    };
    expect((await (await tableReads())!.get(projectId, 'racing', read))?.ids).toEqual(['read 1']);
    expect((await (await tableReads())!.get(projectId, 'racing', read))?.ids).toEqual(['read 2']);
    expect((await (await tableReads())!.get(projectId, 'racing', read))?.ids).toEqual(['read 2']);
    expect(reads).toBe(2);
  });

  it('keeps nothing while the LISTEN connection is down, and listens again after', async () => {
    await tagsOf();
    // Cut the listener off from the server side, as a restart or a network fault would.
    const { rows } = await other.query(
      'select pid from pg_stat_activity where application_name = $1 and datname = current_database()',
      [TABLE_READ_LISTENER],
    );
    expect(rows.length).toBeGreaterThanOrEqual(1);
    for (const r of rows) await other.query('select pg_terminate_backend($1)', [r.pid]);
    await new Promise((r) => setTimeout(r, 300));
    expect(tableReadCacheStats()).toMatchObject({ listening: false, entries: 0 });
    // Without the listener the page is read from PostgreSQL, and so is correct.
    await other.query(`update lines set normal_temp_c = 10 where project_id = $1 and tag = 'P-5'`, [
      projectId,
    ]);
    expect(await tagsOf()).toEqual(['P-5', 'P-1', 'P-3', 'P-2']);
    expect(await tableReads()).toBeNull();
    // After the retry pause it listens again and keeps orders.
    await new Promise((r) => setTimeout(r, 2_200));
    expect(await tagsOf()).toEqual(['P-5', 'P-1', 'P-3', 'P-2']);
    expect(tableReadCacheStats().listening).toBe(true);
    await other.query(`update lines set normal_temp_c = 300 where project_id = $1 and tag = 'P-5'`, [
      projectId,
    ]);
    expect(await tagsOf()).toEqual(['P-1', 'P-3', 'P-2', 'P-5']);
  });
});
