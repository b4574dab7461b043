import { describe, expect, it } from 'vitest';
import {
  DEFAULT_CRITERIA,
  capitalRecoveryFactor,
  compileConductivity,
  condensationThresholdC,
  defaultSystemFor,
  freezeTimeHours,
  jacketById,
  levelisingFactor,
  materialById,
  outletTempC,
  recommendLine,
  solveSteady,
  layerSplits,
  type Criteria,
  type LineCase,
  type MaterialSystem,
  type Recommendation,
} from '@/lib/thermal';

const mw = materialById('mineral-wool-pipe')!;
const hotSystem: MaterialSystem = { outer: mw, jacket: jacketById('aluminium-oxidised')! };

/** Re-solve a candidate from scratch with the public solver (independent of the recommender's caches). */
function surfaceAt(
  line: LineCase,
  system: MaterialSystem,
  layersMm: number[],
  processC: number,
  c: { airC: number; windMs: number },
  materials = layersMm.map(() => system.outer),
) {
  return solveSteady({
    geometry: line.geometry as Exclude<LineCase['geometry'], 'vessel'>,
    pipeOuterDiameterM: line.pipeOuterDiameterMm! / 1000,
    heightM: line.heightM ?? 1,
    characteristicLengthM: 1,
    processC,
    ambient: {
      airC: c.airC,
      surroundingsC: c.airC,
      windMs: c.windMs,
      emittance: layersMm.length ? system.jacket.emittance : 0.8,
    },
    layers: layersMm.map((t, i) => ({
      thicknessM: t / 1000,
      conductivity: compileConductivity(materials[i].conductivity),
    })),
  });
}

function candidateBefore(r: Recommendation, mm: number) {
  const i = r.candidates.findIndex((c) => c.totalMm === mm);
  return { at: r.candidates[i], before: r.candidates[i - 1] };
}

describe("each criterion's answer satisfies it, and the next smaller candidate does not", () => {
  const line: LineCase = {
    geometry: 'horizontal-pipe',
    pipeOuterDiameterMm: 114.3,
    lengthM: 80,
    normalTempC: 250,
    maxTempC: 260,
    purposes: ['personnelProtection', 'heatConservation'],
    accessible: true,
  };
  const r = recommendLine(line, hotSystem, DEFAULT_CRITERIA);

  it('personnel protection (60 °C on a metal jacket, 35 °C still air)', () => {
    const o = r.outcomes.find((x) => x.id === 'personnel')!;
    expect(o.requiredMm).toBeGreaterThan(0);
    const { at, before } = candidateBefore(r, o.requiredMm!);
    const now = surfaceAt(
      line,
      hotSystem,
      at.layers.map((l) => l.thicknessMm),
      260,
      DEFAULT_CRITERIA.conditions.personnel,
    );
    const less = surfaceAt(
      line,
      hotSystem,
      before.layers.map((l) => l.thicknessMm),
      260,
      DEFAULT_CRITERIA.conditions.personnel,
    );
    expect(now.surfaceC).toBeLessThanOrEqual(60);
    expect(less.surfaceC).toBeGreaterThan(60);
    expect(at.personnel!.surfaceC).toBeCloseTo(now.surfaceC, 4); // solver: Newton step ≤ 1e-7 of the heat flow
  });

  it('economic thickness is the minimum of the annualised cost curve', () => {
    const o = r.outcomes.find((x) => x.id === 'economic')!;
    const costs = r.candidates.map((c) => c.annualCost!);
    const min = Math.min(...costs);
    expect(r.candidates.find((c) => c.totalMm === o.requiredMm)!.annualCost).toBe(min);
    // The cost curve is whole: bare plus every candidate, bare being the dearest here.
    expect(costs.length).toBe(r.candidates.length);
    expect(costs[0]).toBeGreaterThan(min * 5);
  });

  it('the recommendation is the largest requirement and names it', () => {
    const needs = r.outcomes.map((o) => o.requiredMm!);
    expect(r.recommendedMm).toBe(Math.max(...needs));
    expect(r.outcomes.find((o) => o.id === r.governing)!.requiredMm).toBe(r.recommendedMm);
    expect(r.design!.heatFlow).toBeCloseTo(
      r.candidates.find((c) => c.totalMm === r.recommendedMm)!.heatLoss.heatFlow,
      6,
    );
  });

  it('condensation control on a chilled-water line (dew point + margin)', () => {
    const cold: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 88.9,
      lengthM: 40,
      normalTempC: 6,
      purposes: ['condensationControl'],
    };
    const sys = defaultSystemFor(6);
    const rc = recommendLine(cold, sys, DEFAULT_CRITERIA);
    const c = DEFAULT_CRITERIA.conditions.condensation;
    const need =
      condensationThresholdC(c.airC, c.relativeHumidityPct!).valueC + DEFAULT_CRITERIA.dewPointMarginK;
    const { at, before } = candidateBefore(rc, rc.recommendedMm!);
    const mats = (x: typeof at) => x.layers.map((l) => materialById(l.materialId)!);
    expect(
      surfaceAt(
        cold,
        sys,
        at.layers.map((l) => l.thicknessMm),
        6,
        c,
        mats(at),
      ).surfaceC,
    ).toBeGreaterThanOrEqual(need);
    expect(
      surfaceAt(
        cold,
        sys,
        before.layers.map((l) => l.thicknessMm),
        6,
        c,
        mats(before),
      ).surfaceC,
    ).toBeLessThan(need);
    expect(rc.governing).toBe('condensation');
  });

  it('freeze protection: the answer gives the required hours, the smaller one does not', () => {
    const water: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 168.3,
      lengthM: 60,
      normalTempC: 12,
      purposes: ['freezeProtection'],
    };
    const crit: Criteria = { ...DEFAULT_CRITERIA, freeze: { initialWaterTempC: 10, requiredHours: 12 } };
    const rf = recommendLine(water, hotSystem, crit);
    const fc = crit.conditions.freeze;
    const hours = (mm: number[]) =>
      freezeTimeHours({
        odMm: 168.3,
        initialC: 10,
        airC: fc.airC,
        heatFlowAt: (T) => surfaceAt(water, hotSystem, mm, T, fc).heatFlow,
      });
    const { at, before } = candidateBefore(rf, rf.recommendedMm!);
    expect(hours(at.layers.map((l) => l.thicknessMm))).toBeGreaterThanOrEqual(12);
    expect(hours(before.layers.map((l) => l.thicknessMm))).toBeLessThan(12);
  });

  it('says so when no standard thickness meets a criterion, instead of returning the largest', () => {
    const tiny: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 21.3,
      lengthM: 20,
      normalTempC: 15,
      purposes: ['freezeProtection'],
    };
    const rt = recommendLine(tiny, hotSystem, {
      ...DEFAULT_CRITERIA,
      freeze: { initialWaterTempC: 5, requiredHours: 48 },
    });
    expect(rt.unmet).toEqual(['freeze']);
    expect(rt.outcomes[0].requiredMm).toBeNull();
    expect(rt.warnings.join(' ')).toMatch(/No standard thickness gives 48 h before freezing.*heat tracing/);
  });

  it("an interface over the outer material's limit puts a higher-temperature inner layer in", () => {
    const pir = materialById('polyisocyanurate')!,
      cg = materialById('cellular-glass')!;
    const rh = recommendLine(
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 60.3,
        lengthM: 10,
        normalTempC: 200,
        purposes: ['heatConservation'],
      },
      { outer: pir, inner: cg, jacket: jacketById('aluminium-oxidised')! },
      DEFAULT_CRITERIA,
    );
    expect(rh.layers[0].materialId).toBe('cellular-glass');
    const chosen = rh.candidates.find((c) => c.totalMm === rh.recommendedMm)!;
    expect(chosen.serviceLimitOk).toBe(true);
    if (chosen.layers.length > 1) expect(chosen.heatLoss.interfacesC[0]).toBeLessThanOrEqual(pir.maxServiceC);
  });
});

describe('energy balance along a line and stagnant cooling', () => {
  it('outlet temperature follows the ISO 12241 exponential form', () => {
    // 100 m, U' = 0.5 W/(m·K), 0.2 kg/s of water: T_out = 10 + 80·exp(−50/837.2).
    expect(
      outletTempC({
        inletC: 90,
        airC: 10,
        uPerLengthWPerMK: 0.5,
        lengthM: 100,
        massFlowKgPerS: 0.2,
        cpJPerKgK: 4186,
      }),
    ).toBeCloseTo(10 + 80 * Math.exp(-50 / 837.2), 10);
  });
  it("freeze time equals C·R'·ln((T0 − Ta)/(0 − Ta)) when the resistance is constant", () => {
    const Rp = 2.5; // K·m/W
    const ro = 0.0843,
      ri = ro - 0.00711;
    const C = 1000 * 4190 * Math.PI * ri * ri + 7850 * 460 * Math.PI * (ro * ro - ri * ri); // ISO 12241 method's properties
    const t = freezeTimeHours({
      odMm: 168.6,
      wallMm: 7.11,
      initialC: 10,
      airC: -20,
      heatFlowAt: (T) => (T + 20) / Rp,
    });
    expect(t).toBeCloseTo((C * Rp * Math.log(30 / 20)) / 3600, 3);
  });
  it('no freezing when the air is above 0 °C', () => {
    expect(freezeTimeHours({ odMm: 60.3, initialC: 10, airC: 2, heatFlowAt: () => 1 })).toBe(Infinity);
  });
});

describe('economics', () => {
  it('capital recovery factor: 10 %, 10 years = 0.16275 (standard annuity tables)', () => {
    expect(capitalRecoveryFactor(0.1, 10)).toBeCloseTo(0.162745, 6);
    expect(capitalRecoveryFactor(0, 8)).toBe(0.125);
  });
  it('levelising factor is 1 without escalation and above 1 with it', () => {
    expect(levelisingFactor(0.08, 0, 15)).toBeCloseTo(1, 12);
    expect(levelisingFactor(0.08, 0.03, 15)).toBeGreaterThan(1.15);
  });
  it('U.S. DOE Steam Tip Sheet #2 worked example arithmetic: 5,069 MMBtu/yr → $45,620/yr', () => {
    // 0.90 effectiveness × $8.00/MMBtu × 5,069 MMBtu/yr ÷ 0.80 boiler efficiency.
    expect((0.9 * 8 * (3192 + 840 + 1037)) / 0.8).toBeCloseTo(45621, 0);
  });
});

describe('thickness series (common practice: single layers up to the maximum, then staggered multi-layer)', () => {
  it('goes to two layers beyond 100 mm and three beyond 200 mm', () => {
    const s = layerSplits({
      thicknessesMm: [25, 50, 75, 100],
      maxLayerMm: 100,
      maxLayers: 3,
      maxTotalMm: 300,
    });
    expect(s.filter((x) => x.length === 1).map((x) => x[0])).toEqual([25, 50, 75, 100]);
    expect(s.find((x) => x.reduce((a, b) => a + b) === 150)).toEqual([75, 75]);
    expect(s.find((x) => x.reduce((a, b) => a + b) === 125)).toEqual([75, 50]);
    expect(s.every((x) => x.length === 1 || x.reduce((a, b) => a + b) > (x.length - 1) * 100)).toBe(true);
    expect(Math.max(...s.map((x) => x.reduce((a, b) => a + b)))).toBe(300);
  });
});
