import { describe, expect, it } from 'vitest';
import {
  ASHRAE_90_1_TABLE_6_8_3_1,
  energyCodeMinimum,
  energyCodeRow,
  equivalentThicknessIn,
  npsBand,
  W_PER_MK_IN_BTU_IN,
} from '@/lib/thermal';
import { runRecommendCase, type RecommendResult } from '@/lib/lines/recommend-case';

/**
 * ASHRAE/IES 90.1-2016 Table 6.8.3-1 (minimum pipe insulation thickness), as reproduced on a
 * manufacturer's page [C2]; the footnote's equivalent-thickness formula T = r[(1 + t/r)^(K/k) − 1]
 * [R] with a worked use computed by hand [X].
 */
describe('ASHRAE 90.1 Table 6.8.3-1', () => {
  it('carries the rows of the standard (thickness in inches by NPS band, conductivity range, mean rating temperature)', () => {
    const rows = ASHRAE_90_1_TABLE_6_8_3_1.map((r) => [
      r.service,
      r.kLow,
      r.kHigh,
      r.meanRatingF,
      ...r.thicknessIn,
    ]);
    expect(rows).toEqual([
      ['heating', 0.32, 0.34, 250, 4.5, 5, 5, 5, 5], // > 350 °F
      ['heating', 0.29, 0.31, 200, 3, 4, 4.5, 4.5, 4.5], // 251–350 °F
      ['heating', 0.27, 0.3, 150, 2.5, 2.5, 2.5, 3, 3], // 201–250 °F
      ['heating', 0.25, 0.29, 125, 1.5, 1.5, 2, 2, 2], // 141–200 °F
      ['heating', 0.22, 0.28, 100, 1, 1, 1.5, 1.5, 1.5], // 105–140 °F
      ['cooling', 0.21, 0.27, 75, 0.5, 0.5, 1, 1, 1], // 40–60 °F
      ['cooling', 0.2, 0.26, 50, 0.5, 1, 1, 1, 1.5], // below 40 °F
    ]);
  });

  it('finds the row by fluid temperature and the band by pipe size', () => {
    expect(energyCodeRow(120)!.meanRatingF).toBe(150); // 248 °F → 201–250 °F
    expect(energyCodeRow(200)!.meanRatingF).toBe(250); // 392 °F → above 350 °F
    expect(energyCodeRow(7)!.meanRatingF).toBe(75); // 44.6 °F → 40–60 °F chilled water
    expect(energyCodeRow(-10)!.meanRatingF).toBe(50); // refrigerant below 40 °F
    expect(energyCodeRow(30)).toBeNull(); // 86 °F: the table sets nothing between 60 and 105 °F
    expect([21.3, 33.4, 48.3, 60.3, 114.3, 219.1].map(npsBand)).toEqual([0, 1, 2, 2, 3, 4]); // NPS ½, 1, 1½, 2, 4, 8 (ASME B36.10M ODs)
  });

  it('footnote formula, worked by hand for NPS 2 (r = 1.1875 in), t = 1.5 in, k = 0.29 [X]', () => {
    expect(
      equivalentThicknessIn({ radiusIn: 1.1875, tableIn: 1.5, kActual: 0.25, kUpper: 0.29 }),
    ).toBeCloseTo(1.214, 3);
    expect(
      equivalentThicknessIn({ radiusIn: 1.1875, tableIn: 1.5, kActual: 0.32, kUpper: 0.29 }),
    ).toBeCloseTo(1.737, 3);
  });

  it('takes the table value within the conductivity range and corrects outside it', () => {
    // 160 °C hot water (320 °F) on NPS 2: table 4.5 in at 200 °F mean, k 0.29–0.31.
    const within = energyCodeMinimum({
      fluidC: 160,
      outsideDiameterMm: 60.3,
      conductivityAt: () => 0.3 / W_PER_MK_IN_BTU_IN,
    })!;
    expect(within.tableMm).toBeCloseTo(4.5 * 25.4, 9);
    expect(within.minimumMm).toBeCloseTo(4.5 * 25.4, 9);
    const worse = energyCodeMinimum({
      fluidC: 160,
      outsideDiameterMm: 60.3,
      conductivityAt: () => 0.36 / W_PER_MK_IN_BTU_IN,
    })!;
    const r = 60.3 / 2 / 25.4;
    expect(worse.minimumMm / 25.4).toBeCloseTo(r * ((1 + 4.5 / r) ** (0.36 / 0.31) - 1), 9);
    expect(worse.corrected).toBe(true);
  });

  it('is a hard criterion in the recommendation when asked for', () => {
    const r = runRecommendCase({
      id: 'c',
      geometry: 'horizontal-pipe',
      nps: '2',
      normalTempC: 120,
      purposes: ['heatConservation'],
      energyCode: 'ashrae-90.1',
    }) as RecommendResult;
    const e = r.criteria.energyCode!;
    expect(e.tableMm).toBeCloseTo(2.5 * 25.4, 9); // 248 °F, NPS 2: 2.5 in
    expect(e.requiredMm!).toBeGreaterThanOrEqual(e.minimumMm!);
    expect(r.recommendedMm!).toBeGreaterThanOrEqual(e.requiredMm!);
    const none = runRecommendCase({
      id: 'n',
      geometry: 'horizontal-pipe',
      nps: '2',
      normalTempC: 30,
      purposes: ['heatConservation'],
      energyCode: 'ashrae-90.1',
    }) as RecommendResult;
    expect(none.criteria.energyCode).toBeUndefined();
  });
});

describe('the project setting', () => {
  it('a design basis with ASHRAE 90.1 makes it a hard criterion for its pipes', async () => {
    const { DEFAULT_DESIGN_BASIS } = await import('@/lib/lines/design-basis');
    const { solveLine } = await import('@/lib/lines/solve-line');
    const { HARD_CRITERIA } = await import('@/lib/thermal');
    const line = {
      tag: 'HW-9',
      service: 'hot water',
      area: 'A',
      geometry: 'horizontal-pipe',
      nps: '2',
      outsideDiameterMm: 60.3,
      lengthM: 20,
      surfaceAreaM2: null,
      heightM: null,
      normalTempC: 120,
      maxTempC: null,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: ['personnelProtection'],
      outdoor: true,
      accessible: true,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    } as const;
    const off = solveLine(DEFAULT_DESIGN_BASIS, { ...line, purposes: [...line.purposes] });
    expect(off.recommendation.outcomes.find((o) => o.id === 'energyCode')).toBeUndefined();
    const on = solveLine(
      { ...DEFAULT_DESIGN_BASIS, energyCode: 'ashrae-90.1' },
      { ...line, purposes: [...line.purposes] },
    );
    const e = on.recommendation.outcomes.find((o) => o.id === 'energyCode')!;
    expect(e.tableMm).toBeCloseTo(63.5, 9); // 248 °F, NPS 2: 2.5 in
    expect(on.recommendation.recommendedMm!).toBeGreaterThanOrEqual(e.requiredMm!);
    expect(on.recommendation.governing).toBe('energyCode');
    expect(HARD_CRITERIA.has('energyCode')).toBe(true);
  });
});
