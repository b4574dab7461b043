import { describe, expect, it } from 'vitest';
import { DEFAULT_DESIGN_BASIS, type DesignBasis } from '@/lib/lines/design-basis';
import { solveLine } from '@/lib/lines/solve-line';
import type { LineInput } from '@/lib/lines/validate';
import { MATERIALS, materialById, seriesOf } from '@/lib/thermal';

const line: LineInput = {
  tag: 'S-1',
  service: 'Steam',
  area: 'A',
  geometry: 'horizontal-pipe',
  nps: '6',
  outsideDiameterMm: 168.3,
  lengthM: 60,
  surfaceAreaM2: null,
  heightM: null,
  normalTempC: 250,
  maxTempC: 260,
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
const inch: DesignBasis = { ...DEFAULT_DESIGN_BASIS, thicknessSeries: 'inch' };

describe('inch thickness series', () => {
  it('1 in = 25.4 mm exactly (international inch, 1959; NIST SP 811): the series converts without drift', () => {
    expect(seriesOf(materialById('mineral-wool-pipe')!, 'inch')).toEqual({
      thicknessesMm: [25.4, 38.1, 50.8, 63.5, 76.2, 88.9, 101.6],
      maxLayerMm: 101.6,
    });
    expect(seriesOf(materialById('elastomeric-foam')!, 'inch').thicknessesMm).toEqual([
      9.525, 12.7, 19.05, 25.4, 38.1,
    ]);
    // Every library material offers an inch series within its own single-layer limit (common practice).
    for (const m of MATERIALS)
      expect(m.inchSeries!.thicknessesIn.every((t) => t <= m.inchSeries!.maxLayerIn)).toBe(true);
  });

  it('a project on the inch series gets only totals built from inch sizes, and the millimetre project its mm sizes', () => {
    const us = solveLine(inch, line).recommendation;
    const si = solveLine(DEFAULT_DESIGN_BASIS, line).recommendation;
    const isInchTotal = (mm: number) => Math.abs(mm / 12.7 - Math.round(mm / 12.7)) < 1e-9;
    expect(us.candidates.slice(1).every((c) => c.layers.every((l) => isInchTotal(l.thicknessMm)))).toBe(true);
    expect(us.recommendedMm).not.toBeNull();
    expect(isInchTotal(us.recommendedMm!)).toBe(true);
    expect(si.candidates.slice(1).every((c) => Number.isInteger(c.totalMm))).toBe(true);
    // Beyond 4 in the inch build goes to two layers with staggered joints.
    const fiveInch = us.candidates.find((c) => Math.abs(c.totalMm - 127) < 1e-9)!;
    expect(fiveInch.layers.length).toBe(2);
  });
});
