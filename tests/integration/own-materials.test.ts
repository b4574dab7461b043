/**
 * A project's own materials and jackets on real PostgreSQL: added with their data source, chosen in
 * the specification, used by the solver, named in the bill, protected from removal while in use.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { db, getPool } from '@/db/client';
import { auditLog, lineDesigns, lineResults, lines, projects } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import {
  addOwnJacket,
  addOwnMaterial,
  getDesignBasis,
  removeOwnEntry,
  saveDesignBasis,
  updateOwnMaterial,
} from '@/lib/lines/basis-store';
import { acceptRecommendations } from '@/lib/lines/bulk-accept';
import { commitDraft, createDraft, previewDraft } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import { collectBillLines } from '@/lib/boq/store';
import { compileConductivity, solveSteady } from '@/lib/thermal';
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
            Service: 'Hot oil',
            Area: 'U2',
            Geometry: 'Horizontal pipe',
            NPS: '6',
            'Length (m)': 40,
            'Normal temp (°C)': 240,
            'Max temp (°C)': 250,
            Purpose: 'H,P',
            Location: 'Outdoor',
            Accessible: 'yes',
          } as Record<string, string | number>
        )[h] ?? null),
  );

let projectId = '',
  userId = '';
// An invented product for the test: a low-conductivity pipe section (values for the scenario only).
const product = {
  name: 'Test microporous section',
  productForm: 'pipe-section' as const,
  kPoints: [
    [300, 0.03],
    [50, 0.021],
    [150, 0.024],
  ] as [number, number][],
  minServiceC: -50,
  maxServiceC: 650,
  densityKgPerM3: 250,
  specificHeatJPerKgK: 900,
  thicknessesMm: [20, 30, 40, 50, 60],
  maxLayerMm: 60,
  maxLayers: 3,
  source: 'Scenario data for tests',
};

beforeAll(async () => {
  const owner = await auth.signUp({
    name: 'Spec Writer',
    email: `own.${randomUUID().slice(0, 8)}@example.com`,
    password: 'calcium-lagging-7731',
    organizationName: 'Own Materials Org',
  });
  userId = owner.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: owner.organizationId, code: 'OM-1', name: 'Own materials' })
    .returning();
  projectId = p.id;
  const draft = await createDraft({
    projectId,
    userId,
    fileName: 'list.xlsx',
    bytes: await lineListWorkbook([
      row('HO-1'),
      row('HO-2', { Jacket: 'Dimpled stainless' }),
      row('HO-3', { Jacket: 'no such finish' }),
    ]),
  });
  const s = draft.sheets.find((x) => x.name === draft.defaultSheet)!;
  await commitDraft({
    projectId,
    draftId: draft.draftId,
    sheetName: s.name,
    mapping: s.suggested,
    userId,
  });
});
afterAll(async () => {
  await getPool().end();
});

describe('project materials and jackets', () => {
  let materialId = '',
    jacketId = '';

  it('adds a material with its source and price: new revision, audit entry, the table kept sorted by temperature', async () => {
    const before = await getDesignBasis({ projectId });
    const r = await addOwnMaterial({ projectId, userId, material: product, pricePerM3: 2400 });
    materialId = r.id;
    expect(materialId).toBe('own-test-microporous-section');
    expect(r.revision).toBe(before.revision + 1);
    const { basis } = await getDesignBasis({ projectId });
    expect(basis.ownMaterials).toHaveLength(1);
    expect(basis.ownMaterials[0]).toMatchObject({ id: materialId, source: 'Scenario data for tests' });
    expect(basis.prices.materialPerM3[materialId]).toBe(2400);
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.projectId, projectId), eq(auditLog.action, 'project material added')));
    expect(audit).toHaveLength(1);
  });

  it('refuses a second material of the same name and bad data, changing nothing', async () => {
    const { revision } = await getDesignBasis({ projectId });
    await expectAppError(
      addOwnMaterial({ projectId, userId, material: { ...product, name: 'TEST MICROPOROUS SECTION' } }),
      'conflict',
      /already has a material called/,
    );
    await expectAppError(
      addOwnMaterial({ projectId, userId, material: { ...product, name: 'Other', minServiceC: 700 } }),
      'invalid',
      /highest service temperature must be above the lowest/,
    );
    await expectAppError(
      addOwnMaterial({
        projectId,
        userId,
        material: { ...product, name: 'Other', kPoints: [[100, 0]] },
      }),
      'invalid',
      /between 0 and 5/,
    );
    expect((await getDesignBasis({ projectId })).revision).toBe(revision);
  });

  it('adds a jacket; a line list then names it in its jacket column, and an unknown jacket is warned about', async () => {
    const r = await addOwnJacket({
      projectId,
      userId,
      jacket: { name: 'Dimpled stainless', emittance: 0.3, metal: true, source: 'Scenario data for tests' },
    });
    jacketId = r.id;
    expect(jacketId).toBe('own-dimpled-stainless');
    const draft = await createDraft({
      projectId,
      userId,
      fileName: 'list-rev2.xlsx',
      bytes: await lineListWorkbook([
        row('HO-1'),
        row('HO-2', { Jacket: 'Dimpled stainless' }),
        row('HO-3', { Jacket: 'no such finish' }),
      ]),
    });
    const s = draft.sheets.find((x) => x.name === draft.defaultSheet)!;
    const preview = await previewDraft({
      projectId,
      draftId: draft.draftId,
      sheetName: s.name,
      mapping: s.suggested,
    });
    const warning = preview.issues.find((i) => i.message.includes('no such finish'));
    expect(warning).toMatchObject({ severity: 'warning', field: 'jacket' });
    expect(warning!.message).toMatch(
      /not in the library or the project's jackets; the specification band's jacket is used/,
    );
    await commitDraft({
      projectId,
      draftId: draft.draftId,
      sheetName: s.name,
      mapping: s.suggested,
      userId,
    });
    const [ho2] = await db
      .select()
      .from(lines)
      .where(and(eq(lines.projectId, projectId), eq(lines.tag, 'HO-2')));
    expect(ho2.jacketId).toBe(jacketId);
  });

  it('a band that names an unknown material is refused with the band and field named', async () => {
    const { basis } = await getDesignBasis({ projectId });
    const { designBasisSchema } = await import('@/lib/lines/design-basis');
    const r = designBasisSchema.safeParse({
      ...basis,
      systems: basis.systems.map((s, i) => (i === 2 ? { ...s, outerId: 'own-not-there' } : s)),
    });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({ path: ['systems', 2, 'outerId'] });
    expect(r.error!.issues[0].message).toMatch(
      /Band 3: "own-not-there" is not in the library or the project's materials/,
    );
  });

  it('the solver uses the project material where the specification names it, and its own jacket emittance', async () => {
    const { basis } = await getDesignBasis({ projectId });
    await saveDesignBasis({
      projectId,
      userId,
      basis: {
        ...basis,
        systems: basis.systems.map((s) => (s.fromC === 20 ? { ...s, outerId: materialId } : s)),
      },
    });
    await solveProject({ projectId, all: true });
    const results = await db
      .select({ tag: lines.tag, r: lineResults })
      .from(lineResults)
      .innerJoin(lines, eq(lines.id, lineResults.lineId))
      .where(eq(lineResults.projectId, projectId));
    const ho1 = results.find((x) => x.tag === 'HO-1')!.r,
      ho2 = results.find((x) => x.tag === 'HO-2')!.r;
    expect(ho1.systemLabel).toBe('Test microporous section');
    expect((ho1.layers as { materialId: string }[]).every((l) => l.materialId === materialId)).toBe(true);
    expect(ho2.jacketId).toBe(jacketId);
    // Independent check of the stored heat flow: the same layers, k from the project's table, ε 0.13 (library oxidised aluminium).
    const k = compileConductivity({
      type: 'table',
      points: [
        [50, 0.021],
        [150, 0.024],
        [300, 0.03],
      ],
    });
    const layers = (ho1.layers as { thicknessMm: number }[]).map((l) => ({
      thicknessM: l.thicknessMm / 1000,
      conductivity: k,
    }));
    const check = solveSteady({
      geometry: 'horizontal-pipe',
      pipeOuterDiameterM: 0.1683,
      heightM: 6,
      characteristicLengthM: 1,
      processC: 240,
      ambient: {
        airC: basis.conditions.heatLoss.outdoor.airC,
        surroundingsC: basis.conditions.heatLoss.outdoor.airC,
        windMs: basis.conditions.heatLoss.outdoor.windMs,
        emittance: 0.13,
      },
      layers,
    });
    expect(Math.abs(ho1.heatFlowPerUnit! - check.heatFlow) / check.heatFlow).toBeLessThan(1e-6);
    // HO-2 is solved with the project jacket's emittance (0.3), checked the same way.
    const layers2 = (ho2.layers as { thicknessMm: number }[]).map((l) => ({
      thicknessM: l.thicknessMm / 1000,
      conductivity: k,
    }));
    const check2 = solveSteady({
      geometry: 'horizontal-pipe',
      pipeOuterDiameterM: 0.1683,
      heightM: 6,
      characteristicLengthM: 1,
      processC: 240,
      ambient: {
        airC: basis.conditions.heatLoss.outdoor.airC,
        surroundingsC: basis.conditions.heatLoss.outdoor.airC,
        windMs: basis.conditions.heatLoss.outdoor.windMs,
        emittance: 0.3,
      },
      layers: layers2,
    });
    expect(Math.abs(ho2.heatFlowPerUnit! - check2.heatFlow) / check2.heatFlow).toBeLessThan(1e-6);
    expect(ho2.surfaceTempC).toBeCloseTo(check2.surfaceC, 1);
  });

  it('a material changed in place keeps its id, so the band still uses it; the next solve uses the new data', async () => {
    const before = await getDesignBasis({ projectId });
    const [ho1Before] = await db
      .select({ q: lineResults.heatFlowPerUnit })
      .from(lineResults)
      .innerJoin(lines, eq(lines.id, lineResults.lineId))
      .where(and(eq(lines.projectId, projectId), eq(lines.tag, 'HO-1')));
    // A revised data sheet: 10 % higher k throughout.
    const r = await updateOwnMaterial({
      projectId,
      userId,
      id: materialId,
      material: {
        ...product,
        kPoints: product.kPoints.map(([t, k]) => [t, k * 1.1] as [number, number]),
        source: 'Scenario data for tests, rev B',
      },
      pricePerM3: 2500,
    });
    expect(r.revision).toBe(before.revision + 1);
    expect(r.basis.ownMaterials).toHaveLength(1);
    expect(r.basis.ownMaterials[0]).toMatchObject({
      id: materialId,
      source: 'Scenario data for tests, rev B',
    });
    expect(r.basis.prices.materialPerM3[materialId]).toBe(2500);
    expect(r.basis.systems.find((s) => s.fromC === 20)!.outerId).toBe(materialId);
    await solveProject({ projectId });
    const [ho1After] = await db
      .select({ q: lineResults.heatFlowPerUnit, mm: lineResults.recommendedMm })
      .from(lineResults)
      .innerJoin(lines, eq(lines.id, lineResults.lineId))
      .where(and(eq(lines.projectId, projectId), eq(lines.tag, 'HO-1')));
    expect(ho1After.q).not.toBe(ho1Before.q);
    await expectAppError(
      updateOwnMaterial({ projectId, userId, id: 'own-nothing', material: product }),
      'not_found',
      /does not exist/,
    );
    const audit = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.projectId, projectId), eq(auditLog.action, 'project material changed')));
    expect(audit).toHaveLength(1);
  });

  it('the bill names the project material, and removal is refused while a band or a chosen design uses it', async () => {
    await acceptRecommendations({ projectId, userId });
    const bill = await collectBillLines({ projectId });
    const ho1 = bill.find((b) => b.tag === 'HO-1')!;
    expect(ho1.layers[0]).toMatchObject({
      materialId,
      materialName: 'Test microporous section',
      productForm: 'pipe-section',
    });
    expect(bill.find((b) => b.tag === 'HO-2')!.jacketName).toBe('Dimpled stainless');

    await expectAppError(
      removeOwnEntry({ projectId, userId, id: materialId }),
      'conflict',
      /used by material band 3/,
    );
    const { basis } = await getDesignBasis({ projectId });
    await saveDesignBasis({
      projectId,
      userId,
      basis: {
        ...basis,
        systems: basis.systems.map((s) => (s.fromC === 20 ? { ...s, outerId: 'mineral-wool-pipe' } : s)),
      },
    });
    await expectAppError(
      removeOwnEntry({ projectId, userId, id: materialId }),
      'conflict',
      /in 3 chosen line designs/,
    );
    await expectAppError(
      removeOwnEntry({ projectId, userId, id: jacketId }),
      'conflict',
      /jacket override of 1 line/,
    );
    expect((await getDesignBasis({ projectId })).basis.ownMaterials).toHaveLength(1);
  });

  it('once nothing uses it, the material is removed with its price', async () => {
    await db.delete(lineDesigns).where(eq(lineDesigns.projectId, projectId));
    const r = await removeOwnEntry({ projectId, userId, id: materialId });
    expect(r.basis.ownMaterials).toHaveLength(0);
    expect(r.basis.prices.materialPerM3[materialId]).toBeUndefined();
    await expectAppError(
      removeOwnEntry({ projectId, userId, id: materialId }),
      'not_found',
      /does not exist/,
    );
  });
});
