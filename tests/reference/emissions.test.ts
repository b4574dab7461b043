/**
 * Emissions per energy source: CO₂ = energy lost ÷ efficiency (÷ COP for cooling) × the factor of
 * the energy bought, with the GHG Protocol scope named. Factors: IPCC 2006 Guidelines Vol. 2 Ch. 2
 * Table 2.2, kg CO₂/TJ on net calorific value [C2] — natural gas 56 100, gas/diesel oil 74 100,
 * residual fuel oil 77 400, LPG 63 100, other bituminous coal 94 600. Cross-check: US EPA 40 CFR 98
 * Subpart C Table C-1, natural gas 53.06 kg/MMBtu on higher heating value [C].
 */
import { describe, expect, it } from 'vitest';
import {
  COOLING_SOURCES,
  DEFAULT_CRITERIA,
  DEFAULT_ECONOMICS,
  HEAT_SOURCES,
  energyTerms,
  jacketById,
  materialById,
  recommendLine,
  type Economics,
  type LineCase,
} from '@/lib/thermal';

describe('CO₂ factors per kWh of fuel (IPCC 2006 Table 2.2 via 1 kWh = 3.6 MJ)', () => {
  it.each([
    ['natural-gas', 56100, 0.20196],
    ['fuel-oil', 74100, 0.26676],
    ['heavy-fuel-oil', 77400, 0.27864],
    ['lpg', 63100, 0.22716],
    ['coal', 94600, 0.34056],
  ] as const)('%s: %i kg/TJ = %f kg/kWh', (id, perTJ, perKWh) => {
    expect(HEAT_SOURCES[id].co2KgPerKWh).toBeCloseTo(perKWh, 10);
    expect(HEAT_SOURCES[id].co2KgPerKWh).toBeCloseTo((perTJ * 3.6e6) / 1e12, 12);
    expect(HEAT_SOURCES[id].scope).toBe('Scope 1');
    expect(HEAT_SOURCES[id].co2Source).toMatch(/IPCC 2006/);
  });
  it('natural gas on NCV (IPCC) against EPA on HHV: 53.06 kg/MMBtu = 0.18104 kg/kWh HHV; the ratio 1.1155 is the HHV/NCV ratio of gas (≈1.11) within 1 %', () => {
    const epaHhv = 53.06 / (1.05505585e9 / 3.6e6); // 1 MMBtu = 1.05505585 GJ = 293.071 kWh
    expect(epaHhv).toBeCloseTo(0.18105, 4);
    expect(HEAT_SOURCES['natural-gas'].co2KgPerKWh / epaHhv).toBeCloseTo(1.1155, 3);
  });
  it("bought electricity, heat and cooling are Scope 2 and say their factor is a placeholder for the supplier's", () => {
    for (const s of [
      HEAT_SOURCES.electricity,
      HEAT_SOURCES['district-heat'],
      ...Object.values(COOLING_SOURCES),
    ]) {
      expect(s.scope).toBe('Scope 2');
      expect(s.co2Source).toMatch(/^placeholder/);
    }
  });
});

describe("annual CO₂ of a line through the source's efficiency", () => {
  const system = { outer: materialById('mineral-wool-pipe')!, jacket: jacketById('aluminium-oxidised')! };
  const hot: LineCase = {
    geometry: 'horizontal-pipe',
    pipeOuterDiameterMm: 114.3,
    lengthM: 100,
    normalTempC: 180,
    purposes: ['heatConservation'],
  };
  it('oil-fired: MWh lost ÷ 0.85 × 0.26676 t/MWh, Scope 1 [X]', () => {
    const econ: Economics = {
      ...DEFAULT_ECONOMICS,
      heatSource: 'fuel-oil',
      efficiency: 0.85,
      co2KgPerKWh: HEAT_SOURCES['fuel-oil'].co2KgPerKWh,
    };
    const r = recommendLine(hot, system, { ...DEFAULT_CRITERIA, economics: econ });
    expect(r.annual!.scope).toBe('Scope 1');
    expect(r.annual!.source).toBe('Gas/diesel oil (own boiler)');
    expect(r.annual!.co2Tonnes).toBeCloseTo((r.annual!.energyMWh / 0.85) * 0.26676, 9);
    expect(r.annual!.energyMWh).toBeCloseTo((r.design!.heatFlow * 100 * econ.hoursPerYear) / 1e6, 9);
  });
  it('a cold line on district cooling: ÷ COP, Scope 2', () => {
    const econ: Economics = {
      ...DEFAULT_ECONOMICS,
      cooling: { electricityPricePerKWh: 0.08, cop: 1, co2KgPerKWh: 0.1, source: 'district-cooling' },
    };
    const cold: LineCase = { ...hot, normalTempC: 6, purposes: ['condensationControl', 'heatConservation'] };
    const r = recommendLine(
      cold,
      { outer: materialById('elastomeric-foam')!, jacket: jacketById('pvc')! },
      { ...DEFAULT_CRITERIA, economics: econ },
    );
    expect(r.annual!.scope).toBe('Scope 2');
    expect(r.annual!.co2Tonnes).toBeCloseTo(r.annual!.energyMWh * 0.1, 9);
    expect(energyTerms(econ, true).source).toBe('District cooling (bought chilled water)');
  });
  it('a basis that names no source is natural gas, as before', () => {
    const { heatSource: _h, ...old } = DEFAULT_ECONOMICS;
    expect(energyTerms(old, false)).toMatchObject({
      scope: 'Scope 1',
      source: 'Natural gas (own boiler)',
      co2KgPerKWh: HEAT_SOURCES['natural-gas'].co2KgPerKWh,
    });
  });
});
