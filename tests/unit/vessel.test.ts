import { describe, expect, it } from 'vitest';
import { compileConductivity, solveSteady, solveVessel } from '@/lib/thermal';

const k = compileConductivity({ type: 'constant', k: 0.04 });
const fixed = { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.9, fixedCoefficientWPerM2K: 8 };

describe('vessel as shell plus heads, area-weighted', () => {
  it('with constant k and a prescribed film, each part matches its closed form and the total adds up', () => {
    const D = 2,
      H = 5,
      t = 0.08,
      dT = 160;
    const v = solveVessel({
      diameterM: D,
      shellHeightM: H,
      processC: 180,
      ambient: fixed,
      layers: [{ thicknessM: t, conductivity: k }],
    });
    const shellPerM =
      dT / (Math.log((D / 2 + t) / (D / 2)) / (2 * Math.PI * 0.04) + 1 / (2 * Math.PI * (D / 2 + t) * 8));
    const headFlux = dT / (t / 0.04 + 1 / 8);
    expect(v.shell.heatFlow).toBeCloseTo(shellPerM, 6);
    expect(v.top.heatFlow).toBeCloseTo(headFlux, 6);
    expect(v.totalW).toBeCloseTo(shellPerM * H + (headFlux * 2 * (Math.PI * D * D)) / 4, 4);
    expect(v.areasM2.shell).toBeCloseTo(Math.PI * (D + 2 * t) * H, 9);
  });
  it('with natural convection the hot top head loses more per m² than the bottom (buoyancy assisted vs opposed)', () => {
    const v = solveVessel({
      diameterM: 1.5,
      shellHeightM: 3,
      processC: 150,
      ambient: { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.1 },
      layers: [{ thicknessM: 0.05, conductivity: k }],
    });
    expect(v.top.heatFlow).toBeGreaterThan(v.bottom.heatFlow);
    expect(v.worstSurfaceC).toBe(Math.max(v.shell.surfaceC, v.top.surfaceC, v.bottom.surfaceC));
    const direct = solveSteady({
      geometry: 'horizontal-wall-up',
      pipeOuterDiameterM: 0,
      heightM: 1,
      characteristicLengthM: 1.5 / 4,
      processC: 150,
      ambient: { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.1 },
      layers: [{ thicknessM: 0.05, conductivity: k }],
    });
    expect(v.top.heatFlow).toBeCloseTo(direct.heatFlow, 9);
  });
});

describe('a vessel in the recommender and the line list', () => {
  it('the diameter follows from the bare area and height: πDH + 2·πD²/4 = A (algebra)', async () => {
    const { vesselDiameterM } = await import('@/lib/lines/solve-line');
    for (const [A, H] of [
      [30, 4],
      [120, 12],
      [8, 0.5],
    ]) {
      const D = vesselDiameterM(A, H);
      expect(Math.PI * D * H + (2 * Math.PI * D * D) / 4).toBeCloseTo(A, 9);
    }
  });

  it('every candidate is shell + both heads: total heat against solveVessel, worst part for the touch check', async () => {
    const { recommendLine, DEFAULT_CRITERIA, materialById, jacketById } = await import('@/lib/thermal');
    const mw = materialById('mineral-wool-pipe')!;
    const system = { outer: mw, jacket: jacketById('aluminium-oxidised')! };
    const D = 1.8,
      H = 4.5,
      A = Math.PI * D * H + (Math.PI * D * D) / 2;
    const r = recommendLine(
      {
        geometry: 'vessel',
        pipeOuterDiameterMm: D * 1000,
        heightM: H,
        areaM2: A,
        normalTempC: 180,
        maxTempC: 190,
        purposes: ['heatConservation', 'personnelProtection'],
        accessible: true,
      },
      system,
      DEFAULT_CRITERIA,
    );
    const km = compileConductivity(mw.conductivity);
    const hl = DEFAULT_CRITERIA.conditions.heatLoss,
      pc = DEFAULT_CRITERIA.conditions.personnel;
    const layersOf = (c: (typeof r.candidates)[number]) =>
      c.layers.map((l) => ({ thicknessM: l.thicknessMm / 1000, conductivity: km }));
    for (const c of [r.candidates[0], r.candidates[4], r.candidates[10]]) {
      const eps = c.layers.length ? 0.13 : 0.8;
      const v = solveVessel({
        diameterM: D,
        shellHeightM: H,
        processC: 180,
        ambient: { airC: hl.airC, surroundingsC: hl.airC, windMs: hl.windMs, emittance: eps },
        layers: layersOf(c),
      });
      expect(Math.abs(c.heatLoss.heatFlow * A - v.totalW) / Math.abs(v.totalW)).toBeLessThan(1e-7);
    }
    const o = r.outcomes.find((x) => x.id === 'personnel')!;
    const i = r.candidates.findIndex((c) => c.totalMm === o.requiredMm);
    const at = solveVessel({
      diameterM: D,
      shellHeightM: H,
      processC: 190,
      ambient: { airC: pc.airC, surroundingsC: pc.airC, windMs: 0, emittance: 0.13 },
      layers: layersOf(r.candidates[i]),
    });
    const before = solveVessel({
      diameterM: D,
      shellHeightM: H,
      processC: 190,
      ambient: { airC: pc.airC, surroundingsC: pc.airC, windMs: 0, emittance: 0.13 },
      layers: layersOf(r.candidates[i - 1]),
    });
    expect(at.worstSurfaceC).toBeLessThanOrEqual(60);
    expect(before.worstSurfaceC).toBeGreaterThan(60);
    expect(r.candidates[i].personnel!.surfaceC).toBeCloseTo(at.worstSurfaceC, 4);
    // The bottom head (buoyancy opposed, the weakest film) is the hottest part.
    expect(at.worstSurfaceC).toBe(at.bottom.surfaceC);
    // Annual energy is for the whole vessel: mean flux × bare area × hours.
    const chosen = r.candidates.find((c) => c.totalMm === r.recommendedMm)!;
    expect(r.annual!.energyMWh).toBeCloseTo(
      (chosen.heatLoss.heatFlow * A * DEFAULT_CRITERIA.economics!.hoursPerYear) / 1e6,
      9,
    );
  });
});

describe('vessel economics', () => {
  it('installed cost and energy are both per m² of bare area: a large vessel costs about what a flat wall of the same build does, and a hot one is not left bare', async () => {
    const { recommendLine, DEFAULT_CRITERIA, materialById, jacketById } = await import('@/lib/thermal');
    const system = { outer: materialById('mineral-wool-pipe')!, jacket: jacketById('aluminium-oxidised')! };
    const D = 12,
      H = 9,
      A = Math.PI * D * H + (Math.PI * D * D) / 2;
    const tank = recommendLine(
      {
        geometry: 'vessel',
        pipeOuterDiameterMm: D * 1000,
        heightM: H,
        areaM2: A,
        normalTempC: 75,
        purposes: ['heatConservation'],
      },
      system,
      DEFAULT_CRITERIA,
    );
    const wall = recommendLine(
      { geometry: 'vertical-wall', heightM: H, areaM2: A, normalTempC: 75, purposes: ['heatConservation'] },
      system,
      DEFAULT_CRITERIA,
    );
    const at = (r: typeof tank, mm: number) => r.candidates.find((c) => c.totalMm === mm)!.installedCost!;
    // Curvature adds a little material on the shell (t/D ≈ 1 %); labour and jacket are per m² on both.
    expect(Math.abs(at(tank, 50) / at(wall, 50) - 1)).toBeLessThan(0.03);
    expect(tank.recommendedMm).toBeGreaterThan(0);
    expect(tank.governing).toBe('economic');
  });
});

describe('product form on vessels', () => {
  it("a vessel takes the band's blanket, a pipe of the same temperature its pipe section", async () => {
    const { solveLine } = await import('@/lib/lines/solve-line');
    const { DEFAULT_DESIGN_BASIS } = await import('@/lib/lines/design-basis');
    const common = {
      tag: 'X',
      service: '',
      area: 'A',
      nps: null,
      lengthM: null,
      heightM: 4,
      normalTempC: 150,
      maxTempC: null,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: ['heatConservation' as const],
      outdoor: true,
      accessible: false,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    };
    const tank = solveLine(DEFAULT_DESIGN_BASIS, {
      ...common,
      geometry: 'vessel',
      outsideDiameterMm: null,
      surfaceAreaM2: 40,
    });
    const pipe = solveLine(DEFAULT_DESIGN_BASIS, {
      ...common,
      geometry: 'horizontal-pipe',
      outsideDiameterMm: 168.3,
      lengthM: 10,
      surfaceAreaM2: null,
    });
    expect(tank.system.outer.id).toBe('mineral-wool-blanket');
    expect(tank.system.outer.productForm).toBe('blanket');
    expect(pipe.system.outer.id).toBe('mineral-wool-pipe');
    expect(tank.recommendation.layers.every((l) => l.materialId === 'mineral-wool-blanket')).toBe(true);
  });
});
