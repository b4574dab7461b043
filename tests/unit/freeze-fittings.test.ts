import { describe, expect, it } from 'vitest';
import {
  FREEZE_PROPERTIES,
  fittingsHeatLoss,
  freezeTimeHours,
  heatTracingDuty,
  iceFractionHours,
  DEFAULT_EQUIVALENT_LENGTHS,
} from '@/lib/thermal';
import { runRecommendCase, type RecommendResult } from '@/lib/lines/recommend-case';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';

describe('freeze protection with ice (ISO 12241 method, hand calculation [X])', () => {
  // NPS 2 (60.3 mm OD, 3.91 mm wall), constant resistance R′ = 4 K·m/W, air −15 °C, water from 10 °C.
  const od = 60.3,
    wall = 3.91,
    Rp = 4,
    Ta = -15;
  const ro = od / 2000,
    ri = ro - wall / 1000;
  const P = FREEZE_PROPERTIES;

  it('uses the stated properties: water 1000 kg/m³, 4190 J/(kg·K), 334 kJ/kg; steel 7850 kg/m³, 460 J/(kg·K)', () => {
    expect(P).toEqual({
      waterKgPerM3: 1000,
      waterJPerKgK: 4190,
      fusionJPerKg: 334_000,
      steelKgPerM3: 7850,
      steelJPerKgK: 460,
    });
  });

  it('cooling to 0 °C and freezing 25 % of the water, each by the closed form', () => {
    const C = 1000 * 4190 * Math.PI * ri * ri + 7850 * 460 * Math.PI * (ro * ro - ri * ri);
    const cooling = freezeTimeHours({
      odMm: od,
      wallMm: wall,
      initialC: 10,
      airC: Ta,
      heatFlowAt: (T) => (T - Ta) / Rp,
    });
    expect(cooling).toBeCloseTo((C * Rp * Math.log((10 - Ta) / (0 - Ta))) / 3600, 3);
    const q0 = (0 - Ta) / Rp; // 3.75 W/m
    const ice = iceFractionHours({ odMm: od, wallMm: wall, iceFractionPct: 25, heatFlowAtZeroWPerM: q0 });
    expect(ice).toBeCloseTo((0.25 * 1000 * Math.PI * ri * ri * 334_000) / q0 / 3600, 9);
    // 2.163 L of water per metre; 25 % is 0.541 kg, × 334 kJ/kg at 3.75 W ≈ 13.38 h (by hand [X]).
    expect(ice).toBeCloseTo(13.38, 1);
  });

  it('the recommendation reports both times at the required thickness; allowing ice needs less insulation', () => {
    const withIce = runRecommendCase({
      id: 'a',
      geometry: 'horizontal-pipe',
      nps: '2',
      pipeWallMm: 3.91,
      normalTempC: 10,
      purposes: ['freezeProtection'],
      freeze: { initialWaterTempC: 10, requiredHours: 8, iceFractionPct: 25 },
    }) as RecommendResult;
    const noIce = runRecommendCase({
      id: 'b',
      geometry: 'horizontal-pipe',
      nps: '2',
      pipeWallMm: 3.91,
      normalTempC: 10,
      purposes: ['freezeProtection'],
      freeze: { initialWaterTempC: 10, requiredHours: 8, iceFractionPct: 0 },
    }) as RecommendResult;
    const f = withIce.criteria.freeze!;
    expect(f.hoursToIceFraction!).toBeGreaterThanOrEqual(8);
    expect(f.hoursToFreezingPoint!).toBeLessThan(f.hoursToIceFraction!);
    expect(noIce.criteria.freeze!.hoursToFreezingPoint!).toBeGreaterThanOrEqual(8);
    expect(withIce.criteria.freeze!.requiredMm!).toBeLessThan(noIce.criteria.freeze!.requiredMm!);
  });
});

describe('fittings as equivalent lengths and heat-tracing duty', () => {
  it('adds counts × lengths × the insulated or the bare loss per metre', () => {
    const L = DEFAULT_EQUIVALENT_LENGTHS;
    const covered = fittingsHeatLoss({
      counts: { elbows: 4, tees: 1, valves: 2, flangePairs: 3, supportsPerM: 0.5 },
      lengthM: 40,
      insulatedWPerM: 20,
      bareWPerM: 300,
    });
    expect(covered.insulatedEquivalentM).toBeCloseTo(
      4 * L.elbowM + L.teeM + 2 * L.valveM + 3 * L.flangePairM + 0.5 * 40 * L.supportM,
      12,
    );
    expect(covered.fittingsW).toBeCloseTo(covered.insulatedEquivalentM * 20, 9);
    const bare = fittingsHeatLoss({
      counts: { valves: 2, flangePairs: 3, valvesBare: true },
      lengthM: 40,
      insulatedWPerM: 20,
      bareWPerM: 300,
    });
    expect(bare.bareEquivalentM).toBeCloseTo(2 * L.bareValveM + 3 * L.bareFlangePairM, 12);
    expect(bare.fittingsW).toBeCloseTo(bare.bareEquivalentM * 300, 9);
  });

  it('tracer duty is the loss at the maintain temperature times the safety factor, fittings spread over the run', () => {
    expect(heatTracingDuty({ heatLossWPerM: 20, safetyFactor: 1.25 }).requiredWPerM).toBeCloseTo(25, 12);
    expect(
      heatTracingDuty({ heatLossWPerM: 20, safetyFactor: 1.2, fittingsExtraM: 5, lengthM: 50 }).requiredWPerM,
    ).toBeCloseTo(20 * 1.1 * 1.2, 12);
    const r = runRecommendCase({
      id: 't',
      geometry: 'horizontal-pipe',
      nps: '4',
      normalTempC: 60,
      purposes: ['heatConservation'],
      lengthM: 50,
      heatTracing: { maintainTempC: 60, minAmbientC: -20, windMs: 10, safetyFactor: 1.2 },
      fittings: { elbows: 4, valves: 2, valvesBare: true },
    }) as RecommendResult;
    expect(r.heatTracing!.requiredWPerM).toBeGreaterThan(r.heatTracing!.heatLossWPerM * 1.2);
    expect(r.heatTracing!.heatLossWPerM).toBeGreaterThan(r.heatLossWPerM!); // −20 °C and 10 m/s against the 10 °C annual air
    expect(r.totalHeatLossW!).toBeCloseTo(r.heatLossWPerM! * 50 + r.fittingsHeatLossW!, 6);
  });
});

describe("a line's fittings with the project's equivalent lengths", () => {
  it('pipes only; counts × lengths at the insulated loss, all bare on a bare line [X]', () => {
    const basis = {
      ...DEFAULT_DESIGN_BASIS,
      fittings: { ...DEFAULT_DESIGN_BASIS.fittings, supportsPerM: 0.5, valvesBare: true },
    };
    const L = basis.fittings;
    const line = { geometry: 'horizontal-pipe', lengthM: 40, elbows: 4, tees: 1, valves: 2, flanges: 3 };
    expect(lineFittingsW(basis, line, 20, 300)).toBeCloseTo(
      (4 * L.elbowM + 1 * L.teeM + 0.5 * 40 * L.supportM) * 20 +
        (2 * L.bareValveM + 3 * L.bareFlangePairM) * 300,
      9,
    );
    expect(lineFittingsW(basis, line, 300, 300, true)).toBeCloseTo(
      (4 * L.elbowM + L.teeM + 2 * L.valveM + 3 * L.flangePairM + 20 * L.supportM) * 300,
      9,
    );
    expect(lineFittingsW(basis, { ...line, geometry: 'vessel' }, 20, 300)).toBe(0);
    expect(lineFittingsW(basis, { ...line, lengthM: null }, 20, 300)).toBe(0);
  });
});
