/**
 * Design conductivity after EN ISO 23993: λ_design(T) = λ_declared(T) · F_ageing · F_moisture ·
 * F_installation, the declared curve kept. ISO 23993 publishes the method, not factor values, so
 * the checks are hand calculations of the stated method [X].
 */
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_CRITERIA,
  compileConductivity,
  designConductivitySpec,
  designFactor,
  jacketById,
  materialById,
  recommendLine,
  solveSteady,
  type LineCase,
  type MaterialSystem,
} from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS, designBasisSchema, type DesignBasis } from '@/lib/lines/design-basis';
import { catalogueOf } from '@/lib/lines/catalogue';
import { solveLine } from '@/lib/lines/solve-line';
import { runRecommendCase } from '@/lib/lines/recommend-case';
import type { LineInput } from '@/lib/lines/validate';

const mw = materialById('mineral-wool-pipe')!;
const factors = { ageing: 1.05, moisture: 1.02, installation: 1.1 };

describe('the design curve', () => {
  it('is the declared curve times the product of the factors [X]: 0.044 W/(m·K) at 100 °C → 0.044·1.05·1.02·1.10 = 0.0518364', () => {
    expect(designFactor(factors)).toBeCloseTo(1.1781, 10);
    const design = compileConductivity(designConductivitySpec({ ...mw, designFactors: factors }));
    expect(design.k(100)).toBeCloseTo(0.0518364, 10);
    // Between declared points the declared curve's own interpolation: 75 °C mean, halfway 0.038–0.044.
    expect(design.k(75)).toBeCloseTo(0.041 * 1.1781, 10);
  });
  it('keeps the declared curve untouched, and is the same object with no factors', () => {
    const before = JSON.stringify(mw.conductivity);
    designConductivitySpec({ ...mw, designFactors: factors });
    expect(JSON.stringify(mw.conductivity)).toBe(before);
    expect(designConductivitySpec(mw)).toBe(mw.conductivity);
  });
  it('scales linear curves in both coefficients', () => {
    expect(
      designConductivitySpec({
        conductivity: { type: 'linear', a: 0.03, b: 1e-4 },
        designFactors: { ageing: 1.2, moisture: 1, installation: 1 },
      }),
    ).toEqual({ type: 'linear', a: 0.036, b: 1.2e-4 });
  });
});

describe('thickness is chosen on design conductivity', () => {
  const line: LineCase = {
    geometry: 'horizontal-pipe',
    pipeOuterDiameterMm: 168.3,
    lengthM: 40,
    normalTempC: 250,
    purposes: ['personnelProtection', 'heatConservation'],
    accessible: true,
  };
  const jacket = jacketById('aluminium-oxidised')!;
  it("a candidate's heat flow is the one solved with the design curve, and the requirement does not fall", () => {
    const declared: MaterialSystem = { outer: mw, jacket };
    const design: MaterialSystem = { outer: { ...mw, designFactors: factors }, jacket };
    const a = recommendLine(line, declared, DEFAULT_CRITERIA),
      b = recommendLine(line, design, DEFAULT_CRITERIA);
    const c = b.candidates.find((x) => x.totalMm === 100)!;
    const fresh = solveSteady({
      geometry: 'horizontal-pipe',
      pipeOuterDiameterM: 0.1683,
      heightM: 1,
      characteristicLengthM: 1,
      processC: 250,
      ambient: { airC: 10, surroundingsC: 10, windMs: 3, emittance: jacket.emittance },
      layers: [
        {
          thicknessM: 0.1,
          conductivity: compileConductivity(designConductivitySpec({ ...mw, designFactors: factors })),
        },
      ],
    });
    expect(c.heatLoss.heatFlow).toBeCloseTo(fresh.heatFlow, 4);
    expect(c.heatLoss.heatFlow).toBeGreaterThan(
      a.candidates.find((x) => x.totalMm === 100)!.heatLoss.heatFlow * 1.1,
    );
    expect(b.outcomes.find((o) => o.id === 'personnel')!.requiredMm!).toBeGreaterThanOrEqual(
      a.outcomes.find((o) => o.id === 'personnel')!.requiredMm!,
    );
  });
  it('a project sets factors per material in its design basis; the catalogue carries them and keeps the declared curve', () => {
    const basis: DesignBasis = {
      ...DEFAULT_DESIGN_BASIS,
      designConductivity: { 'mineral-wool-pipe': { ...factors, source: 'Specification §4.2' } },
    };
    const m = catalogueOf(basis).materials.get('mineral-wool-pipe')!;
    expect(m.designFactors).toEqual({ ...factors, source: 'Specification §4.2' });
    expect(m.conductivity).toBe(mw.conductivity);
    const l: LineInput = {
      tag: 'T-1',
      service: '',
      area: 'A',
      geometry: 'horizontal-pipe',
      nps: '6',
      outsideDiameterMm: 168.3,
      lengthM: 40,
      surfaceAreaM2: null,
      heightM: null,
      normalTempC: 250,
      maxTempC: 250,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: ['heatConservation', 'personnelProtection'],
      outdoor: true,
      accessible: true,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    };
    const plain = solveLine(DEFAULT_DESIGN_BASIS, l).recommendation,
      withF = solveLine(basis, l).recommendation;
    const at = (r: typeof plain) => r.candidates.find((x) => x.totalMm === 80)!.heatLoss.heatFlow;
    expect(at(withF) / at(plain)).toBeGreaterThan(1.12);
    expect(withF.recommendedMm!).toBeGreaterThanOrEqual(plain.recommendedMm!);
  });
  it('refuses a factor under 1 and an unknown material, naming the field', () => {
    const low = designBasisSchema.safeParse({
      ...DEFAULT_DESIGN_BASIS,
      designConductivity: { 'mineral-wool-pipe': { ageing: 0.9, moisture: 1, installation: 1 } },
    });
    expect(low.success).toBe(false);
    expect(low.error!.issues[0].message).toMatch(/^Ageing factor must be 1 or more/);
    const unknown = designBasisSchema.safeParse({
      ...DEFAULT_DESIGN_BASIS,
      designConductivity: { 'no-such': { ageing: 1, moisture: 1, installation: 1.1 } },
    });
    expect(unknown.error!.issues[0].message).toMatch(/Design conductivity: "no-such" is not in the library/);
  });
  it('the batch CLI takes insulation.designFactors additively', () => {
    const base = {
      id: 'a',
      geometry: 'horizontal-pipe',
      nps: 6,
      normalTempC: 250,
      purposes: ['heatConservation'],
      thicknessMm: 80,
    };
    const plain = runRecommendCase(base) as { heatLossWPerM: number };
    const f = runRecommendCase({ ...base, insulation: { designFactors: { installation: 1.2 } } }) as {
      heatLossWPerM: number;
    };
    expect(f.heatLossWPerM / plain.heatLossWPerM).toBeGreaterThan(1.15);
    expect(runRecommendCase({ ...base, insulation: { designFactors: { moisture: 0.5 } } })).toMatchObject({
      error: expect.stringMatching(/insulation\.designFactors\.moisture must be between 1 and 3/),
    });
  });
});
