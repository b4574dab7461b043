/**
 * A vessel picked part by part on PostgreSQL: the demo plant's V-3020 (56 m², 8 m shell, 245/260 °C,
 * personnel protection), whose bottom head needs more than its shell to meet the touch limit. The
 * pick, the review flags, the bill's areas per part and the budget's sum of parts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, desc, eq } from 'drizzle-orm';
import { db, getPool } from '@/db/client';
import { auditLog, lineDesigns, lineResults, lines, projects } from '@/db/schema';
import * as auth from '@/lib/auth/service';
import { commitDraft, createDraft } from '@/lib/lines/import-store';
import { solveProject } from '@/lib/lines/results-store';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { pickVesselParts } from '@/lib/lines/picks-store';
import { collectBillLines, billFactors } from '@/lib/boq/store';
import { computeQuantities } from '@/lib/boq/quantities';
import { dashboard } from '@/lib/budget/store';
import { currentFlags } from '@/lib/review/store';
import { decodeCandidate } from '@/lib/lines/candidate-row';
import { catalogueOf } from '@/lib/lines/catalogue';
import { criteriaFor } from '@/lib/lines/solve-line';
import { TEMPLATE_EXAMPLE_ROWS } from '@/lib/lines/template';
import {
  compileConductivity,
  designConductivitySpec,
  solveVessel,
  vesselPartDecisions,
  type CriterionOutcome,
} from '@/lib/thermal';
import { expectAppError } from '../support/errors';
import { lineListWorkbook } from '../../seed/line-list';

let projectId = '',
  userId = '',
  lineId = '';
let rec: Record<'shell' | 'top' | 'bottom', number> = { shell: 0, top: 0, bottom: 0 };

const designOf = async () => (await db.select().from(lineDesigns).where(eq(lineDesigns.lineId, lineId)))[0];

beforeAll(async () => {
  const o = await auth.signUp({
    name: 'Vessel Engineer',
    email: `vessel.${randomUUID().slice(0, 8)}@example.com`,
    password: 'shell-and-heads-apart',
    organizationName: 'Vessel Org',
  });
  userId = o.userId;
  const [p] = await db
    .insert(projects)
    .values({ organizationId: o.organizationId, code: 'VP-1', name: 'Vessel parts' })
    .returning();
  projectId = p.id;
  const v3020 = TEMPLATE_EXAMPLE_ROWS.find((r) => r[0] === 'V-3020')!;
  const d = await createDraft({
    projectId,
    userId,
    fileName: 'v.xlsx',
    bytes: await lineListWorkbook([v3020]),
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
  const [l] = await db.select().from(lines).where(eq(lines.projectId, projectId));
  lineId = l.id;
  const [r] = await db.select().from(lineResults).where(eq(lineResults.lineId, lineId));
  const parts = vesselPartDecisions(
    r.outcomes as CriterionOutcome[],
    r.candidates.map((c) => ({
      totalMm: decodeCandidate(c).mm,
      serviceLimitOk: decodeCandidate(c).withinLimits,
    })),
  );
  rec = {
    shell: parts.shell.recommendedMm!,
    top: parts.top.recommendedMm!,
    bottom: parts.bottom.recommendedMm!,
  };
});
afterAll(async () => {
  await getPool().end();
});

describe('V-3020 picked part by part', () => {
  it('the bottom head needs more than the shell (personnel protection on its own surface)', async () => {
    expect(rec.bottom).toBeGreaterThan(rec.shell);
    const [r] = await db.select().from(lineResults).where(eq(lineResults.lineId, lineId));
    // The vessel's one-thickness recommendation is its thickest part; every stored candidate has part fluxes.
    expect(r.recommendedMm).toBe(Math.max(rec.shell, rec.top, rec.bottom));
    expect(r.candidates.every((c) => decodeCandidate(c).partFluxesWPerM2?.length === 3)).toBe(true);
  });

  it('a head below its own requirement needs a reason; guarding it needs one too', async () => {
    const thin = {
      shell: { thicknessMm: rec.shell },
      top: { thicknessMm: rec.top },
      bottom: { thicknessMm: rec.shell },
    };
    await expectAppError(
      pickVesselParts({ projectId, lineId, userId, parts: thin, expectedVersion: 0 }),
      'invalid',
      /bottom head is below what personnel requires; give a reason/,
    );
    await expectAppError(
      pickVesselParts({
        projectId,
        lineId,
        userId,
        parts: { ...thin, bottom: { thicknessMm: rec.shell, guarded: true } },
        expectedVersion: 0,
      }),
      'invalid',
      /reason the bottom head is guarded/,
    );
    await expectAppError(
      pickVesselParts({
        projectId,
        lineId,
        userId,
        parts: { ...thin, shell: { thicknessMm: rec.shell, guarded: true } },
        reason: 'x',
        expectedVersion: 0,
      }),
      'invalid',
      /Only a head can be guarded/,
    );
    await expectAppError(
      pickVesselParts({
        projectId,
        lineId,
        userId,
        parts: { ...thin, top: { thicknessMm: 7 } },
        reason: 'x',
        expectedVersion: 0,
      }),
      'invalid',
      /7 mm for the top head is not a candidate/,
    );
    expect(await designOf()).toBeUndefined(); // nothing half-written
  });

  it("each part at the engine's own per-part decision is the recommendation: no reason, nothing below", async () => {
    const r = await pickVesselParts({
      projectId,
      lineId,
      userId,
      parts: {
        shell: { thicknessMm: rec.shell },
        top: { thicknessMm: rec.top },
        bottom: { thicknessMm: rec.bottom },
      },
      expectedVersion: 0,
    });
    expect(r).toMatchObject({ version: 1, source: 'recommended', belowCriterion: null });
    const d = await designOf();
    expect(d.thicknessMm).toBe(rec.shell);
    expect(d.parts!.bottom.thicknessMm).toBe(rec.bottom);
    expect(d.parts!.bottom.layers.reduce((a, x) => a + x.thicknessMm, 0)).toBe(rec.bottom);
    const [a] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.lineId, lineId), eq(auditLog.action, 'design pick')))
      .orderBy(desc(auditLog.at));
    expect((a.after as { parts: string }).parts).toBe(
      `shell ${rec.shell} mm${rec.top !== rec.shell ? ` · top head ${rec.top} mm` : ''} · bottom head ${rec.bottom} mm`,
    );
    // No hot surface on any part at these thicknesses.
    const flags = (await currentFlags({ projectId })).find((f) => f.lineId === lineId)?.flags ?? [];
    expect(flags.filter((f) => f.type === 'hot-surface')).toEqual([]);
  });

  it('the bill counts the shell and each head at its own thickness (hand calculation of the areas)', async () => {
    const [line] = (await collectBillLines({ projectId })).map((l) => ({
      ...l,
      status: { counted: true as const },
    }));
    const q = computeQuantities([line], await billFactors({ projectId }));
    // Hand calculation. The engine's vessel (no outside diameter given): a vertical shell with two flat
    // heads whose bare area is the line's, π·D·H + 2·π·D²/4 = A, so D = √(H² + 2A/π) − H (the quadratic's
    // positive root; flat end area π·D²/4, circle area). A = 56 m², H = 8 m → D = √(64 + 35.6507) − 8 =
    // 1.982519 m [X]; shell π·1.982519·8 = 49.8259 m² [X]; each head π·1.982519²/4 = 3.0869 m² [X];
    // 49.8259 + 2·3.0869 = 55.9997 ≈ 56 m². Waste allowance 5 % (the bill's default factor, common practice).
    const row = (kind: string) => q.surfaces.filter((s) => s.kind === kind);
    // Every layer of a part covers the part's area.
    const sum = (rows: { areaM2: number }[]) => rows.reduce((a, s) => a + s.areaM2, 0) / rows.length;
    const shell = row('vessel shell'),
      top = row('vessel top head'),
      bottom = row('vessel bottom head');
    expect(shell.length).toBeGreaterThan(0);
    expect(sum(shell)).toBeCloseTo(49.8259 * 1.05, 2);
    expect(sum(top)).toBeCloseTo(3.0869 * 1.05, 3);
    expect(sum(bottom)).toBeCloseTo(3.0869 * 1.05, 3);
    // Each part's layers add up to its own thickness, and volume = area × thickness.
    expect(shell.reduce((a, s) => a + s.thicknessMm, 0)).toBe(rec.shell);
    expect(bottom.reduce((a, s) => a + s.thicknessMm, 0)).toBe(rec.bottom);
    const vol = (rows: { areaM2: number; thicknessMm: number }[]) =>
      rows.reduce((a, s) => a + s.areaM2 * (s.thicknessMm / 1000), 0);
    expect(bottom.reduce((a, s) => a + s.volumeM3, 0)).toBeCloseTo(vol(bottom), 3);
    expect(bottom.reduce((a, s) => a + s.volumeM3, 0)).toBeCloseTo(3.0869 * 1.05 * (rec.bottom / 1000), 3);
    // Never pipe sections for a vessel; the schedule names each part.
    expect(q.materials).toEqual([]);
    expect(q.schedule[0].layers).toMatch(
      new RegExp(`^shell ${rec.shell} mm: .* · top head ${rec.top} mm: .* · bottom head ${rec.bottom} mm: `),
    );
  });

  it("the budget's heat loss is the sum of the parts, each at its own thickness", async () => {
    const { basis } = await getDesignBasis({ projectId });
    const [r] = await db.select().from(lineResults).where(eq(lineResults.lineId, lineId));
    const cands = r.candidates.map(decodeCandidate);
    const at = (mm: number) => cands.find((c) => c.mm === mm)!.partFluxesWPerM2!;
    const shellM2 = 49.8259,
      headM2 = 3.0869; // hand areas above [X]
    const handW = at(rec.shell)[0] * shellM2 + at(rec.top)[1] * headM2 + at(rec.bottom)[2] * headM2;
    const dash = await dashboard({ projectId });
    const mine = dash.top.find((x) => x.tag === 'V-3020')!;
    expect(mine.designedKW).toBeCloseTo(handW / 1000, 3);
    // Not the one-thickness figure at the shell's or the bottom head's thickness.
    const flux = (mm: number) => cands.find((c) => c.mm === mm)!.heatFlow * 56;
    expect(Math.abs(mine.designedKW * 1000 - flux(rec.shell))).toBeGreaterThan(1);
    expect(Math.abs(mine.designedKW * 1000 - flux(rec.bottom))).toBeGreaterThan(1);

    // The stored per-part fluxes against an independent solve of the vessel model, each part with its
    // own layers (solveVessel, heat-loss conditions, the design conductivity) [X].
    const cat = catalogueOf(basis);
    const hl = criteriaFor(basis, false).conditions.heatLoss;
    const d = await designOf();
    const layersOf = (ls: { materialId: string; thicknessMm: number }[]) =>
      ls.map((x) => ({
        thicknessM: x.thicknessMm / 1000,
        conductivity: compileConductivity(designConductivitySpec(cat.materials.get(x.materialId)!)),
      }));
    const v = solveVessel({
      diameterM: 1.982519,
      shellHeightM: 8,
      processC: 245,
      ambient: {
        airC: hl.airC,
        surroundingsC: hl.surroundingsC ?? hl.airC,
        windMs: hl.windMs,
        emittance: cat.jackets.get(r.jacketId)!.emittance,
      },
      layers: [],
      partLayers: {
        shell: layersOf(d.parts!.shell.layers),
        top: layersOf(d.parts!.top.layers),
        bottom: layersOf(d.parts!.bottom.layers),
      },
    });
    const independentW = v.shell.heatFlow * 8 + (v.top.heatFlow + v.bottom.heatFlow) * headM2;
    expect(Math.abs(independentW / handW - 1)).toBeLessThan(1e-3);
  });

  it('a guarded bottom head may stay at the shell thickness with a reason; the hot surface stays flagged for the reviewer', async () => {
    const r = await pickVesselParts({
      projectId,
      lineId,
      userId,
      parts: {
        shell: { thicknessMm: rec.shell },
        top: { thicknessMm: rec.top },
        bottom: { thicknessMm: rec.shell, guarded: true },
      },
      reason: 'Skirt enclosed by a mesh guard; bottom head not reachable in operation',
      expectedVersion: 1,
    });
    expect(r).toMatchObject({ version: 2, source: 'manual', belowCriterion: null });
    expect(r.parts).toBe(
      `shell ${rec.shell} mm${rec.top !== rec.shell ? ` · top head ${rec.top} mm` : ''} · bottom head ${rec.shell} mm (guarded)`,
    );
    const flags = (await currentFlags({ projectId })).find((f) => f.lineId === lineId)!.flags;
    const hot = flags.find((f) => f.type === 'hot-surface')!;
    expect(hot.message).toMatch(/bottom head \d+\.\d °C, guarded/);
    expect(hot.message).not.toMatch(/shell \d/);
    expect(flags.some((f) => f.type === 'below-criterion')).toBe(false);
    // An unguarded thin head with a reason is below the criterion, and flagged as such.
    await pickVesselParts({
      projectId,
      lineId,
      userId,
      parts: {
        shell: { thicknessMm: rec.shell },
        top: { thicknessMm: rec.top },
        bottom: { thicknessMm: rec.shell },
      },
      reason: 'Trial',
      expectedVersion: 2,
    });
    expect((await designOf()).belowCriterion).toBe('personnel');
    // A stale version is refused.
    await expectAppError(
      pickVesselParts({
        projectId,
        lineId,
        userId,
        parts: {
          shell: { thicknessMm: rec.shell },
          top: { thicknessMm: rec.top },
          bottom: { thicknessMm: rec.bottom },
        },
        expectedVersion: 2,
      }),
      'conflict',
    );
  });
});
