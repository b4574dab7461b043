import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import psychrolib from 'psychrolib';
import { runCase } from '@/lib/thermal';
import { runRecommendCase, type RecommendResult } from '@/lib/lines/recommend-case';

function runCli(script: 'recommend' | 'calc', cases: unknown): Record<string, unknown>[] {
  const dir = mkdtempSync(join(tmpdir(), 'lagwise-rec-'));
  const file = join(dir, 'cases.json');
  writeFileSync(file, JSON.stringify(cases));
  // Exactly what a user types; stdout must be the JSON array alone.
  return JSON.parse(execFileSync('npm', ['run', '--silent', script, '--', file], { encoding: 'utf8' }));
}

const wallCase = {
  id: 'wall',
  geometry: 'flat',
  surfaceAreaM2: 20,
  heightM: 2,
  normalTempC: 300,
  purposes: ['personnelProtection'],
  insulation: {
    conductivity: { type: 'linear', a: 0.035, b: 0.0002 },
    thicknessesMm: [25, 50, 75, 100],
    surfaceEmittance: 0.9,
  },
};

describe('npm run --silent recommend -- <file.json>', () => {
  it('answers each case in order with the documented fields; a bad case is { id, error } naming the fields', () => {
    const out = runCli('recommend', [
      {
        id: 'hs-4',
        geometry: 'horizontal-pipe',
        nps: '4',
        normalTempC: 250,
        purposes: ['heatConservation', 'personnelProtection'],
        lengthM: 100,
      },
      { id: 'bad', geometry: 'pipe', normalTempC: 'hot', purposes: [] },
      wallCase,
    ]);
    expect(out.map((r) => r.id)).toEqual(['hs-4', 'bad', 'wall']);
    const a = out[0] as unknown as RecommendResult;
    expect(Object.keys(a)).toEqual(
      expect.arrayContaining([
        'recommendedMm',
        'governing',
        'heatLossWPerM',
        'surfaceTempC',
        'criteria',
        'warnings',
      ]),
    );
    expect(a.recommendedMm).toBeGreaterThanOrEqual(a.criteria.personnel!.requiredMm!);
    expect(a.heatLossW).toBeCloseTo(a.heatLossWPerM! * 100, 6);
    expect(out[1]).toEqual({
      id: 'bad',
      error:
        'geometry: geometry must be one of horizontal-pipe, vertical-pipe, horizontal-vessel, vertical-vessel, flat; normalTempC: normalTempC must be a number; purposes: give at least one purpose',
    });
  });

  it("a criterion's surface temperature is a fresh solve of that thickness under its own conditions (against calc)", () => {
    const [r] = runCli('recommend', [wallCase]) as unknown as RecommendResult[];
    const p = r.criteria.personnel!;
    expect(p.requiredMm).toBe(75);
    expect(p.limitC).toBe(65); // emittance 0.9: a non-metal finish, 65 °C limit (default basis)
    const personnelAt = (mm: number) =>
      runCase({
        geometry: 'vertical-wall',
        heightM: 2,
        processTempC: 300,
        ambientTempC: 35,
        windSpeedMs: 0,
        surfaceEmittance: 0.9,
        layers: [{ thicknessMm: mm, conductivity: { type: 'linear', a: 0.035, b: 0.0002 } }],
      }) as { surfaceTempC: number };
    expect(p.surfaceTempC).toBeCloseTo(personnelAt(75).surfaceTempC, 6);
    // Round trip: 75 mm meets the 65 °C limit, the next thinner (50 mm) does not.
    expect(personnelAt(75).surfaceTempC).toBeLessThanOrEqual(65);
    expect(personnelAt(50).surfaceTempC).toBeGreaterThan(65);
    // Heat loss at the recommendation, under the heat-loss conditions (10 °C, 3 m/s outdoors).
    const hl = runCase({
      geometry: 'vertical-wall',
      heightM: 2,
      processTempC: 300,
      ambientTempC: 10,
      windSpeedMs: 3,
      surfaceEmittance: 0.9,
      layers: [{ thicknessMm: 75, conductivity: { type: 'linear', a: 0.035, b: 0.0002 } }],
    }) as { heatFluxWPerM2: number; surfaceTempC: number };
    expect(r.heatFluxWPerM2!).toBeCloseTo(hl.heatFluxWPerM2, 4);
    expect(r.heatLossWPerM).toBeNull();
    expect(r.heatLossW!).toBeCloseTo(hl.heatFluxWPerM2 * 20, 3);
  });

  it('a cold line under a humid design day gets a condensation thickness (dew point as psychrolib gives it)', () => {
    const r = runRecommendCase({
      id: 'chw',
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 60.3,
      normalTempC: 12,
      purposes: ['condensationControl'],
      conditions: { condensation: { airC: 30, windMs: 0, relativeHumidityPct: 80 } },
    }) as RecommendResult;
    psychrolib.SetUnitSystem(psychrolib.SI);
    const c = r.criteria.condensation!;
    // psychrolib 1.1.1 (ASHRAE Handbook—Fundamentals 2017, ch. 1) as the independent dew point.
    expect(Math.abs(c.dewPointC! - psychrolib.GetTDewPointFromRelHum(30, 0.8))).toBeLessThan(0.05);
    expect(c.limitC).toBeCloseTo(c.dewPointC! + 2, 9);
    expect(c.requiredMm).toBeGreaterThan(0);
    expect(c.surfaceTempC!).toBeGreaterThanOrEqual(c.limitC!);
    expect(r.governing).toBe('condensation');
    expect(r.recommendedMm).toBe(c.requiredMm);
  });

  it('evaluates a given thickness instead of choosing, and says which criteria it meets', () => {
    const r = runRecommendCase({
      id: 'eval',
      geometry: 'horizontal-pipe',
      nps: 2,
      normalTempC: 180,
      purposes: ['personnelProtection'],
      thicknessMm: 25,
    }) as RecommendResult;
    expect(r.evaluatedMm).toBe(25);
    expect(r.layers.reduce((s, l) => s + l.thicknessMm, 0)).toBe(25);
    expect(r.criteria.personnel!.met).toBe(r.criteria.personnel!.requiredMm! <= 25);
    const bare = runCase({
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 60.3,
      processTempC: 180,
      ambientTempC: 10,
      windSpeedMs: 3,
      surfaceEmittance: 0.8,
      layers: [],
    }) as { heatLossWPerM: number };
    expect(r.heatLossWPerM!).toBeLessThan(bare.heatLossWPerM / 3);
  });

  it('vessels either way up, the freeze time in hours and the frost point below 0 °C', () => {
    const v = runRecommendCase({
      id: 'v',
      geometry: 'vertical-vessel',
      pipeOuterDiameterMm: 3000,
      heightM: 6,
      normalTempC: 90,
      purposes: ['personnelProtection'],
    }) as RecommendResult;
    const h = runRecommendCase({
      id: 'h',
      geometry: 'horizontal-vessel',
      pipeOuterDiameterMm: 3000,
      lengthM: 6,
      normalTempC: 90,
      purposes: ['personnelProtection'],
    }) as RecommendResult;
    for (const r of [v, h]) {
      expect(r.criteria.personnel!.surfaceTempC!).toBeLessThanOrEqual(60);
      expect(r.heatFluxWPerM2!).toBeGreaterThan(0);
    }
    // The same area either way: the heat flux differs only through the outside films (within 25 %).
    expect(Math.abs(h.heatFluxWPerM2! - v.heatFluxWPerM2!) / v.heatFluxWPerM2!).toBeLessThan(0.25);
    expect(
      runRecommendCase({
        id: 'x',
        geometry: 'horizontal-vessel',
        pipeOuterDiameterMm: 3000,
        normalTempC: 90,
        purposes: ['personnelProtection'],
      }),
    ).toEqual({ id: 'x', error: 'lengthM: a horizontal-vessel needs its lengthM' });

    const f = runRecommendCase({
      id: 'f',
      geometry: 'horizontal-pipe',
      nps: '2',
      normalTempC: 10,
      purposes: ['freezeProtection'],
      pipeWallMm: 3.91,
    }) as RecommendResult;
    // Default basis: 8 h until 25 % of the water has frozen (cooling to 0 °C comes first).
    expect(f.criteria.freeze!.hoursToIceFraction!).toBeGreaterThanOrEqual(8);
    expect(f.criteria.freeze!.hoursToFreezingPoint!).toBeLessThan(f.criteria.freeze!.hoursToIceFraction!);
    expect(f.criteria.freeze!.iceFractionPct).toBe(25);
    expect(f.criteria.freeze!.requiredHours).toBe(8);
    expect(f.criteria.freeze!.iceFractionPct).toBe(25);
    expect((f.criteria.freeze as { hoursToIceFraction: number }).hoursToIceFraction).toBeGreaterThanOrEqual(
      8,
    );
    expect(f.criteria.freeze!.hoursToFreezingPoint!).toBeLessThan(
      (f.criteria.freeze as { hoursToIceFraction: number }).hoursToIceFraction,
    );

    const calc = runCase({
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 60.3,
      processTempC: -30,
      ambientTempC: -5,
      relativeHumidityPct: 90,
      windSpeedMs: 0,
      surfaceEmittance: 0.9,
      layers: [],
    }) as { dewPointC: number; frostPointC: number; warnings: string[] };
    psychrolib.SetUnitSystem(psychrolib.SI);
    expect(Math.abs(calc.frostPointC - psychrolib.GetTDewPointFromRelHum(-5, 0.9))).toBeLessThan(0.1); // psychrolib over ice
    expect(calc.dewPointC).toBeLessThan(calc.frostPointC);
    expect(calc.warnings.join(' ')).toMatch(/frost point \(over ice\)/);
  });
});
