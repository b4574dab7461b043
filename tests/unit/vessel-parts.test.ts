/**
 * Vessel parts decided per part: the touch and condensation criteria on each part's own surface,
 * the other criteria as the whole vessel's; each part's thickness checked here against independent
 * solves of the vessel model (solveVessel) [X].
 */
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_CRITERIA,
  compileConductivity,
  jacketById,
  materialById,
  recommendLine,
  solveVessel,
  vesselPartDecisions,
  type LineCase,
  type MaterialSystem,
} from '@/lib/thermal';
import { runRecommendCase } from '@/lib/lines/recommend-case';

const blanket = materialById('mineral-wool-blanket')!;
const system: MaterialSystem = { outer: blanket, jacket: jacketById('aluminium-oxidised')! };
const tank: LineCase = {
  geometry: 'vessel',
  pipeOuterDiameterMm: 2000,
  heightM: 6,
  normalTempC: 250,
  purposes: ['personnelProtection'],
  accessible: true,
};
const crit = { ...DEFAULT_CRITERIA, touchContactSeconds: 5, sweepAllCandidates: true };
const pc = DEFAULT_CRITERIA.conditions.personnel;

/** The three parts' surface temperatures with the same layers on every part (the independent model). */
function partsAt(layersMm: number[], emittance: number) {
  const v = solveVessel({
    diameterM: 2,
    shellHeightM: 6,
    processC: 250,
    ambient: { airC: pc.airC, surroundingsC: pc.airC, windMs: pc.windMs, emittance },
    layers: layersMm.map((t) => ({
      thicknessM: t / 1000,
      conductivity: compileConductivity(blanket.conductivity),
    })),
  });
  return { shell: v.shell.surfaceC, top: v.top.surfaceC, bottom: v.bottom.surfaceC };
}

describe('a hot vertical vessel: the bottom head needs more than the shell', () => {
  const r = recommendLine(tank, system, crit);
  const vp = r.vesselParts!;
  it("each part gets its own thickness; the vessel's recommendation is the thickest part (as before)", () => {
    expect(vp.shell.recommendedMm).toBeLessThan(vp.bottom.recommendedMm!);
    expect(vp.top.recommendedMm).toBeLessThanOrEqual(vp.shell.recommendedMm!);
    expect(r.recommendedMm).toBe(
      Math.max(vp.shell.recommendedMm!, vp.top.recommendedMm!, vp.bottom.recommendedMm!),
    );
    for (const p of ['shell', 'top', 'bottom'] as const) expect(vp[p].governing).toBe('personnel');
  });
  it('each part meets the 56 °C limit (bare metal, 5 s, ISO 13732-1) on its own surface at its thickness, and not one candidate thinner', () => {
    for (const p of ['shell', 'top', 'bottom'] as const) {
      const i = r.candidates.findIndex((c) => c.totalMm === vp[p].recommendedMm);
      expect(i).toBeGreaterThan(0);
      const at = partsAt(
        r.candidates[i].layers.map((l) => l.thicknessMm),
        system.jacket.emittance,
      )[p];
      const before = r.candidates[i - 1];
      const less = partsAt(
        before.layers.map((l) => l.thicknessMm),
        before.totalMm ? system.jacket.emittance : 0.8,
      )[p];
      expect(at).toBeLessThanOrEqual(56);
      expect(less).toBeGreaterThan(56);
    }
  });
  it("the mean flux at the parts' own thicknesses is the area-weighted sum of the parts [X]", () => {
    const hl = DEFAULT_CRITERIA.conditions.heatLoss;
    const q = (mm: number) => {
      const c = r.candidates.find((x) => x.totalMm === mm)!;
      return solveVessel({
        diameterM: 2,
        shellHeightM: 6,
        processC: 250,
        ambient: {
          airC: hl.airC,
          surroundingsC: hl.airC,
          windMs: hl.windMs,
          emittance: system.jacket.emittance,
        },
        layers: c.layers.map((l) => ({
          thicknessM: l.thicknessMm / 1000,
          conductivity: compileConductivity(blanket.conductivity),
        })),
      });
    };
    const s = q(vp.shell.recommendedMm!),
      t = q(vp.top.recommendedMm!),
      b = q(vp.bottom.recommendedMm!);
    const head = Math.PI,
      shellArea = Math.PI * 2 * 6;
    expect(vp.shell.heatFluxWPerM2!).toBeCloseTo(s.shell.heatFlow / (Math.PI * 2), 3);
    expect(vp.bottom.heatFluxWPerM2!).toBeCloseTo(b.bottom.heatFlow, 3);
    expect(vp.meanFluxWPerM2!).toBeCloseTo(
      (s.shell.heatFlow * 6 + (t.top.heatFlow + b.bottom.heatFlow) * head) / (shellArea + 2 * head),
      3,
    );
    // Thinner shell and top head than the bottom's: less material, a little more heat than the one-thickness vessel.
    expect(vp.meanFluxWPerM2!).toBeGreaterThan(
      r.candidates.find((c) => c.totalMm === r.recommendedMm)!.heatLoss.heatFlow,
    );
  });
  it("the batch CLI answers vesselParts and each surface criterion's parts (additive)", () => {
    const out = runRecommendCase({
      id: 'v',
      geometry: 'vertical-vessel',
      pipeOuterDiameterMm: 2000,
      heightM: 6,
      normalTempC: 250,
      purposes: ['personnelProtection'],
      touchContactSeconds: 5,
    }) as {
      vesselParts: { shell: { recommendedMm: number }; bottom: { recommendedMm: number } };
      criteria: { personnel: { parts: { shell: number; bottom: number } } };
    };
    expect(out.vesselParts.shell.recommendedMm).toBe(out.criteria.personnel.parts.shell);
    expect(out.vesselParts.bottom.recommendedMm).toBeGreaterThan(out.vesselParts.shell.recommendedMm);
  });
});

describe('vesselPartDecisions (the rule the line page reads stored results with)', () => {
  const cands = [0, 50, 80, 100, 120].map((totalMm) => ({ totalMm, serviceLimitOk: true }));
  it('surface criteria by part, the others for every part; an unmet part criterion is named', () => {
    const d = vesselPartDecisions(
      [
        { id: 'personnel', requiredMm: 120, parts: { shell: 80, top: 50, bottom: null } },
        { id: 'economic', requiredMm: 100 },
      ],
      cands,
    );
    expect(d.shell).toEqual({ recommendedMm: 100, governing: 'economic', unmet: [] });
    expect(d.top).toEqual({ recommendedMm: 100, governing: 'economic', unmet: [] });
    expect(d.bottom).toEqual({ recommendedMm: 100, governing: 'economic', unmet: ['personnel'] });
    const noEcon = vesselPartDecisions(
      [{ id: 'personnel', requiredMm: 120, parts: { shell: 80, top: 50, bottom: 120 } }],
      cands,
    );
    expect([noEcon.shell.recommendedMm, noEcon.top.recommendedMm, noEcon.bottom.recommendedMm]).toEqual([
      80, 50, 120,
    ]);
  });
});

describe('picks per part (lib/lines/vessel-parts.ts)', () => {
  const outcomes = [
    { id: 'personnel', requiredMm: 180, parts: { shell: 100, top: 80, bottom: 180 } },
    { id: 'processDrop', requiredMm: 60 },
    { id: 'economic', requiredMm: 150 },
  ];
  it("holds each part to its own surface requirement and the vessel's others; a guarded head is not held to personnel", async () => {
    const { partsBelow } = await import('@/lib/lines/vessel-parts');
    const at = (shell: number, top: number, bottom: number, guarded = false) => ({
      shell: { thicknessMm: shell },
      top: { thicknessMm: top },
      bottom: { thicknessMm: bottom, guarded },
    });
    expect(partsBelow(outcomes, at(100, 80, 180))).toEqual([]); // economic is advice, not hard
    expect(partsBelow(outcomes, at(100, 80, 100))).toEqual([{ part: 'bottom', criteria: ['personnel'] }]);
    expect(partsBelow(outcomes, at(100, 80, 100, true))).toEqual([]);
    expect(partsBelow(outcomes, at(100, 50, 50, true))).toEqual([
      { part: 'top', criteria: ['personnel', 'processDrop'] },
      { part: 'bottom', criteria: ['processDrop'] },
    ]);
  });
  it('says a design in words, naming only the heads that differ from the shell', async () => {
    const { describeDesign } = await import('@/lib/lines/vessel-parts');
    const p = (mm: number, guarded?: boolean) => ({
      thicknessMm: mm,
      layers: [],
      ...(guarded ? { guarded } : {}),
    });
    expect(describeDesign(100, null)).toBe('100 mm');
    expect(describeDesign(100, { shell: p(100), top: p(100), bottom: p(180) })).toBe(
      'shell 100 mm · bottom head 180 mm',
    );
    expect(describeDesign(100, { shell: p(100), top: p(100), bottom: p(100, true) })).toBe(
      'shell 100 mm · bottom head 100 mm (guarded)',
    );
  });
  it("the engine's part areas add up to the line's area (πDH + 2·πD²/4 = A)", async () => {
    const { engineVesselAreasM2 } = await import('@/lib/lines/vessel-parts');
    const a = engineVesselAreasM2(56, 8);
    expect(a.shell + a.top + a.bottom).toBeCloseTo(56, 9);
    expect(a.top).toBeCloseTo(3.0869, 4); // D = 1.982519 m [X]
  });
});
