import { describe, expect, it } from 'vitest';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';
import { solveLine } from '@/lib/lines/solve-line';
import { candidateNumbers, decidingLimits, worstMargin, type CandidateRow } from '@/lib/lines/deciding';
import { recommendLine } from '@/lib/thermal';
import { criteriaFor, lineCaseFor } from '@/lib/lines/solve-line';
import type { LineInput } from '@/lib/lines/validate';

const line = (o: Partial<LineInput>): LineInput => ({
  tag: 'T',
  service: 's',
  area: 'A',
  geometry: 'horizontal-pipe',
  nps: '4',
  outsideDiameterMm: 114.3,
  lengthM: 30,
  surfaceAreaM2: null,
  heightM: null,
  normalTempC: 220,
  maxTempC: 230,
  steamPressureBarG: null,
  flowKgPerS: null,
  fluidCpKJPerKgK: null,
  elbows: 0,
  tees: 0,
  valves: 0,
  flanges: 0,
  purposes: ['heatConservation'],
  outdoor: true,
  accessible: true,
  accessHeightM: null,
  jacketId: null,
  notes: '',
  ...o,
});
const rowsOf = (l: LineInput) => {
  const s = solveLine(DEFAULT_DESIGN_BASIS, l);
  const rows = s.recommendation.candidates.map(
    (c): CandidateRow => [
      c.totalMm,
      c.layers.map((x) => [x.materialId, x.thicknessMm]),
      c.heatLoss.heatFlow,
      c.heatLoss.surfaceC,
      c.personnel?.surfaceC ?? null,
      null,
      c.serviceLimitOk,
      c.condensation?.surfaceC ?? null,
    ],
  );
  return { s, rows };
};

describe('the numbers that decide, per candidate', () => {
  it('the product sweeps every candidate under the personnel conditions without changing the recommendation', () => {
    const l = line({});
    const { s, rows } = rowsOf(l);
    expect(rows.every((r) => r[4] !== null)).toBe(true);
    // Swept only up to the requirement (the CLI and benchmark path), the decision is the same.
    const short = recommendLine(lineCaseFor(l), s.system, {
      ...criteriaFor(DEFAULT_DESIGN_BASIS, true),
      sweepAllCandidates: false,
    });
    expect(short.recommendedMm).toBe(s.recommendation.recommendedMm);
    expect(short.candidates.some((c) => c.personnel === undefined)).toBe(true);
    // Personnel temperatures fall with thickness; the bare surface is far over the 56 °C limit.
    const p = rows.map((r) => r[4]!);
    for (let i = 1; i < p.length; i++) expect(p[i]).toBeLessThan(p[i - 1]);
    const limits = decidingLimits(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id);
    expect(limits.personnelLimitC).toBe(56); // aluminium jacket: bare metal at 5 s contact, ISO 13732-1 (lower end of 56–61 °C)
    expect(limits.condensationNeedC).toBeNull();
    const nums = candidateNumbers(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id, rows, limits);
    const at = nums.find((c) => c.mm === s.recommendation.recommendedMm)!;
    expect(worstMargin(at, limits)).toEqual({
      criterion: 'personnel',
      marginK: limits.personnelLimitC! - at.personnelC!,
    });
    expect(worstMargin(nums[0], limits)!.marginK).toBeLessThan(0);
  });

  it('solves the candidates a stored result left out (results from before the full sweep)', () => {
    const l = line({});
    const { s, rows } = rowsOf(l);
    const limits = decidingLimits(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id);
    const legacy = rows.map(
      (r, i): CandidateRow => [r[0], r[1], r[2], r[3], i < 2 ? r[4] : null, r[5], r[6]],
    );
    const filled = candidateNumbers(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id, legacy, limits);
    // Solved fresh by solveSteady: the recommender's fast path agrees within 1e-6 K (engine-fast-path.test.ts).
    for (const [i, c] of filled.entries()) expect(Math.abs(c.personnelC! - rows[i][4]!)).toBeLessThan(1e-4);
  });

  it('a chilled line: the condensation surface temperature against dew point + margin', () => {
    const l = line({
      normalTempC: 5,
      maxTempC: null,
      purposes: ['condensationControl'],
      nps: '2',
      outsideDiameterMm: 60.3,
    });
    const { s, rows } = rowsOf(l);
    const limits = decidingLimits(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id);
    expect(limits.condensationNeedC).toBeCloseTo(
      limits.dewPointC! + DEFAULT_DESIGN_BASIS.dewPointMarginK,
      12,
    );
    expect(rows.every((r) => r[7] !== null)).toBe(true);
    const nums = candidateNumbers(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id, rows, limits);
    const m = worstMargin(nums.find((c) => c.mm === s.recommendation.recommendedMm)!, limits)!;
    expect(m.criterion).toBe('condensation');
    expect(m.marginK).toBeGreaterThanOrEqual(0);
    expect(worstMargin(nums[0], limits)!.marginK).toBeLessThan(0); // bare, it sweats
  });
});
