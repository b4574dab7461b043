import { describe, expect, it } from 'vitest';
import {
  DEFAULT_CRITERIA,
  DEFAULT_COOLING,
  DEFAULT_PRICES,
  installedCost,
  capitalRecoveryFactor,
  levelisingFactor,
  compileConductivity,
  defaultSystemFor,
  jacketById,
  materialById,
  outletTempC,
  recommendLine,
  saturatedSteamAtPressure,
  solveSteady,
  type Criteria,
  type LineCase,
  type MaterialSystem,
} from '@/lib/thermal';
import { economicsView } from '@/lib/lines/economics-view';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';
import { solveLine } from '@/lib/lines/solve-line';
import type { LineInput } from '@/lib/lines/validate';

const hot: MaterialSystem = {
  outer: materialById('mineral-wool-pipe')!,
  jacket: jacketById('aluminium-oxidised')!,
};

describe('energy priced by what it is', () => {
  it('a cold line is priced as cooling: heat gained × hours ÷ COP × electricity price [X]', () => {
    const line: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 114.3,
      lengthM: 50,
      normalTempC: 6,
      purposes: ['heatConservation', 'condensationControl'],
    };
    const r = recommendLine(line, defaultSystemFor(6), DEFAULT_CRITERIA);
    const econ = DEFAULT_CRITERIA.economics!;
    for (const c of r.candidates.slice(0, 5)) {
      const expected =
        (((Math.abs(c.heatLoss.heatFlow) * econ.hoursPerYear) / 1000) *
          DEFAULT_COOLING.electricityPricePerKWh) /
        DEFAULT_COOLING.cop;
      expect(c.energyCostPerYear!).toBeCloseTo(expected, 9);
    }
    const q = Math.abs(r.candidates.find((c) => c.totalMm === r.recommendedMm)!.heatLoss.heatFlow);
    const boughtKWh = (q * 50 * econ.hoursPerYear) / 1000 / DEFAULT_COOLING.cop;
    expect(r.annual!.cost).toBeCloseTo(boughtKWh * DEFAULT_COOLING.electricityPricePerKWh, 6);
    expect(r.annual!.co2Tonnes).toBeCloseTo((boughtKWh * DEFAULT_COOLING.co2KgPerKWh) / 1000, 9);
    // A hot line keeps the fuel terms: heat ÷ boiler efficiency × fuel price.
    const h = recommendLine(
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 114.3,
        lengthM: 1,
        normalTempC: 180,
        purposes: ['heatConservation'],
      },
      hot,
      DEFAULT_CRITERIA,
    );
    const c3 = h.candidates[3];
    expect(c3.energyCostPerYear!).toBeCloseTo(
      (((c3.heatLoss.heatFlow * econ.hoursPerYear) / 1000) * econ.energyPricePerKWh) / econ.efficiency,
      9,
    );
  });
});

describe('flat optima shown honestly', () => {
  const line: LineCase = {
    geometry: 'horizontal-pipe',
    pipeOuterDiameterMm: 114.3,
    lengthM: 1,
    normalTempC: 290,
    purposes: ['heatConservation'],
  };
  it('gives the range within 2 % of the minimum annual cost, and the thinnest of it when the project asks', () => {
    const r = recommendLine(line, hot, DEFAULT_CRITERIA);
    const e = r.outcomes.find((o) => o.id === 'economic')!;
    const min = Math.min(...r.candidates.filter((c) => c.serviceLimitOk).map((c) => c.annualCost!));
    const at = (mm: number) => r.candidates.findIndex((c) => c.totalMm === mm);
    expect(r.candidates[at(e.range!.optimumMm)].annualCost).toBeCloseTo(min, 9);
    expect(r.candidates[at(e.range!.fromMm)].annualCost!).toBeLessThanOrEqual(min * 1.02);
    expect(r.candidates[at(e.range!.fromMm) - 1].annualCost!).toBeGreaterThan(min * 1.02); // boundary: one thinner is outside
    expect(r.candidates[at(e.range!.toMm)].annualCost!).toBeLessThanOrEqual(min * 1.02);
    expect(e.requiredMm).toBe(e.range!.optimumMm);
    const thin: Criteria = {
      ...DEFAULT_CRITERIA,
      economics: { ...DEFAULT_CRITERIA.economics!, economicChoice: 'thinnest-within-range' },
    };
    const t = recommendLine(line, hot, thin);
    expect(t.outcomes.find((o) => o.id === 'economic')!.requiredMm).toBe(e.range!.fromMm);
    expect(e.range!.fromMm).toBeLessThan(e.range!.optimumMm);
  });
});

describe('conditions where they belong', () => {
  it('process drop is checked at the coldest design air and wind, not the annual mean', () => {
    const line: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 60.3,
      lengthM: 200,
      normalTempC: 90,
      purposes: ['processControl'],
      massFlowKgPerS: 0.5,
      fluidCpJPerKgK: 4190,
    };
    const crit: Criteria = { ...DEFAULT_CRITERIA, maxProcessDropK: 3 };
    const r = recommendLine(line, hot, crit);
    const o = r.outcomes.find((x) => x.id === 'processDrop')!;
    expect(o.requiredMm).toBeGreaterThan(0);
    // At the annual mean (10 °C, 3 m/s) a thinner layer would pass: the cold set governs.
    const annual = recommendLine(line, hot, {
      ...crit,
      conditions: { ...crit.conditions, freeze: crit.conditions.heatLoss },
    });
    expect(annual.outcomes.find((x) => x.id === 'processDrop')!.requiredMm!).toBeLessThan(o.requiredMm!);
    expect(o.message).toMatch(/-15 °C air, 5 m\/s \(coldest design conditions\)/);
    // Re-solve the answer and the next thinner by hand at −15 °C, 5 m/s (ISO 12241 exponential form).
    const fc = crit.conditions.freeze;
    const dropAt = (mm: number) => {
      const q = solveSteady({
        geometry: 'horizontal-pipe',
        pipeOuterDiameterM: 0.0603,
        heightM: 1,
        characteristicLengthM: 1,
        processC: 90,
        ambient: {
          airC: fc.airC,
          surroundingsC: fc.airC,
          windMs: fc.windMs,
          emittance: mm ? hot.jacket.emittance : 0.8,
        },
        layers: mm
          ? [{ thicknessM: mm / 1000, conductivity: compileConductivity(hot.outer.conductivity) }]
          : [],
      }).heatFlow;
      return (
        90 -
        outletTempC({
          inletC: 90,
          airC: fc.airC,
          uPerLengthWPerMK: q / (90 - fc.airC),
          lengthM: 200,
          massFlowKgPerS: 0.5,
          cpJPerKgK: 4190,
        })
      );
    };
    const i = r.candidates.findIndex((c) => c.totalMm === o.requiredMm);
    expect(dropAt(o.requiredMm!)).toBeLessThanOrEqual(3 + 1e-9);
    expect(r.candidates[i].layers.length).toBe(1);
    expect(dropAt(r.candidates[i - 1].totalMm)).toBeGreaterThan(3);
  });

  it('warns when a steam line is colder than saturation at its pressure (IAPWS-IF97: 1 MPa → 179.88 °C)', () => {
    expect(saturatedSteamAtPressure(1).temperatureC).toBeCloseTo(179.88, 1); // IAPWS-IF97 saturation table
    const r = recommendLine(
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 114.3,
        normalTempC: 150,
        steamPressureMPaAbs: 1,
        purposes: ['heatConservation'],
      },
      hot,
      DEFAULT_CRITERIA,
    );
    expect(r.warnings.join(' ')).toMatch(
      /29\.9 K below the saturation temperature of steam at its pressure \(179\.9 °C, IAPWS-IF97\)/,
    );
    const ok = recommendLine(
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 114.3,
        normalTempC: 180,
        steamPressureMPaAbs: 1,
        purposes: ['heatConservation'],
      },
      hot,
      DEFAULT_CRITERIA,
    );
    expect(ok.warnings.join(' ')).not.toMatch(/saturation/);
    expect(capitalRecoveryFactor(0.08, 15)).toBeCloseTo(0.11683, 5); // annuity tables: 8 %, 15 years
  });
});

describe('installed cost from the stated rates (hand calculations [X])', () => {
  const mw = materialById('mineral-wool-pipe')!,
    blanket = materialById('mineral-wool-blanket')!;
  const P = DEFAULT_PRICES;
  it('2" pipe, 50 mm in one layer, aluminium jacket, no fitting counts: allowance 15 %', () => {
    const line: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 60.3,
      lengthM: 30,
      normalTempC: 150,
      purposes: ['heatConservation'],
    };
    const ri = 0.03015,
      ro = ri + 0.05;
    const material = Math.PI * (ro * ro - ri * ri) * 450 * 1.1; // 0.017326 m³/m × 450 €/m³ × 1.10 waste = 8.58
    const labour = 18; // NPS 2 band
    const jacket = 35 * Math.PI * 2 * ro; // 35 €/m² over the jacket's circumference
    const expected = (material + labour + jacket + 3) * 1.15;
    expect(
      installedCost(
        line,
        { totalMm: 50, layers: [{ material: mw, thicknessMm: 50 }] },
        2 * ro,
        P,
        'aluminium-oxidised',
      ),
    ).toBeCloseTo(expected, 9);
    expect(expected).toBeCloseTo(54.28, 1); // (8.58 + 18 + 17.63 + 3) × 1.15 by hand
  });
  it('4" pipe, 2 × 40 mm, stainless jacket, its own counts (2 elbows, 1 valve, 2 flange pairs over 20 m)', () => {
    const line: LineCase = {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 114.3,
      lengthM: 20,
      normalTempC: 250,
      purposes: ['heatConservation'],
      fittings: { elbows: 2, tees: 0, valves: 1, flangePairs: 2 },
    };
    const r0 = 0.05715,
      r1 = r0 + 0.04,
      r2 = r1 + 0.04;
    const material = Math.PI * (r2 * r2 - r0 * r0) * 450 * 1.1;
    const labour = 2 * 24; // NPS 4 band, two layers
    const jacket = 70 * Math.PI * 2 * r2;
    const fittings = ((2 * 25 + 90 + 2 * 45) * 2) / 20; // per item and layer, spread over the run
    const expected = material + labour + jacket + 3 + fittings;
    expect(
      installedCost(
        line,
        {
          totalMm: 80,
          layers: [
            { material: mw, thicknessMm: 40 },
            { material: mw, thicknessMm: 40 },
          ],
        },
        2 * r2,
        P,
        'stainless-steel',
      ),
    ).toBeCloseTo(expected, 9);
  });
  it('a vertical vessel (D 2 m, H 4 m), 100 mm blanket, per m² of bare area', () => {
    const line: LineCase = {
      geometry: 'vessel',
      pipeOuterDiameterMm: 2000,
      heightM: 4,
      normalTempC: 120,
      purposes: ['heatConservation'],
    };
    const D = 2,
      H = 4,
      head = Math.PI,
      area = Math.PI * D * H + 2 * head; // 31.42 m²
    const vol = Math.PI * (1.1 * 1.1 - 1) * H + 2 * head * 0.1;
    const material = vol * 300 * 1.1;
    const labour = 22 * area;
    const jacket = 35 * (Math.PI * 2.2 * H + 2 * head);
    const expected = ((material + labour + jacket + 4 * area) * 1.15) / area;
    expect(
      installedCost(
        line,
        { totalMm: 100, layers: [{ material: blanket, thicknessMm: 100 }] },
        2.2,
        P,
        'aluminium-oxidised',
      ),
    ).toBeCloseTo(expected, 9);
  });
});

describe('the economics a cost engineer reads on the line page', () => {
  it('payback and net present value against bare and the next thinner, and the optimum under ±30 % prices', () => {
    const line = {
      tag: 'HO-1',
      service: 'hot oil',
      area: 'A',
      geometry: 'horizontal-pipe',
      nps: '4',
      outsideDiameterMm: 114.3,
      lengthM: 60,
      surfaceAreaM2: null,
      heightM: null,
      normalTempC: 290,
      maxTempC: null,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: ['heatConservation'],
      outdoor: true,
      accessible: false,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    } as LineInput;
    const v = economicsView(DEFAULT_DESIGN_BASIS, line, null)!;
    const r = solveLine(DEFAULT_DESIGN_BASIS, line).recommendation;
    const at = r.candidates.find((c) => c.totalMm === v.atMm)!,
      bare = r.candidates[0];
    const econ = DEFAULT_DESIGN_BASIS.economics;
    const crf = capitalRecoveryFactor(econ.discountRate, econ.lifeYears);
    const lf = levelisingFactor(econ.discountRate, econ.escalationRate, econ.lifeYears);
    const saving = bare.energyCostPerYear! - at.energyCostPerYear!;
    expect(v.vsBare!.paybackYears!).toBeCloseTo(at.installedCost! / saving, 9);
    expect(v.vsBare!.npv).toBeCloseTo((saving * lf) / crf - at.installedCost!, 6);
    expect(v.vsBare!.paybackYears!).toBeLessThan(2); // a bare 290 °C line pays back fast
    const opt = (label: string) => v.sensitivity.find((x) => x.label === label)!.optimumMm!;
    expect(opt('Labour +30 %')).toBeLessThanOrEqual(v.optimumMm!);
    expect(opt('Labour −30 %')).toBeGreaterThanOrEqual(v.optimumMm!);
    expect(opt('Energy price +30 %')).toBeGreaterThanOrEqual(v.optimumMm!);
    expect(opt('Energy price −30 %')).toBeLessThanOrEqual(v.optimumMm!);
    expect(v.range!.fromMm).toBeLessThanOrEqual(v.optimumMm!);
  });
});
