/**
 * Energy-code minimum pipe insulation: ASHRAE/IES Standard 90.1, Table 6.8.3-1 "Minimum Pipe
 * Insulation Thickness" (2016 edition and later; the IECC carries the same table), heating and
 * hot-water systems and cooling systems. Values as reproduced on a manufacturer's page (second-hand
 * transcription, checked against memory of the standard); verify against the edition the project
 * must meet.
 *
 * Each row: fluid operating temperature range (°F), the conductivity range of the insulation the
 * table assumes (Btu·in/(h·ft²·°F)) at a mean rating temperature (°F), and the minimum thickness
 * (in) by nominal pipe size band: < 1, 1 to < 1½, 1½ to < 4, 4 to < 8, ≥ 8.
 *
 * Insulation whose conductivity K at the row's mean rating temperature lies outside the range needs
 * T = r·[(1 + t/r)^(K/k) − 1] (the table's footnote), with r the actual pipe outside radius,
 * t the table thickness and k the upper value of the range.
 */
import { pipeByOutsideDiameter } from './pipes';
import { cToF, fToC } from './units';

export interface EnergyCodeRow {
  service: 'heating' | 'cooling';
  /** Fluid operating temperature range, °F (inclusive lower, exclusive upper per the table's wording). */
  fromF: number;
  toF: number;
  kLow: number;
  kHigh: number;
  meanRatingF: number;
  /** Thickness, in, by NPS band: < 1, 1 to < 1½, 1½ to < 4, 4 to < 8, ≥ 8. */
  thicknessIn: [number, number, number, number, number];
}

export const ASHRAE_90_1_TABLE_6_8_3_1: readonly EnergyCodeRow[] = [
  {
    service: 'heating',
    fromF: 350,
    toF: Infinity,
    kLow: 0.32,
    kHigh: 0.34,
    meanRatingF: 250,
    thicknessIn: [4.5, 5.0, 5.0, 5.0, 5.0],
  },
  {
    service: 'heating',
    fromF: 251,
    toF: 350,
    kLow: 0.29,
    kHigh: 0.31,
    meanRatingF: 200,
    thicknessIn: [3.0, 4.0, 4.5, 4.5, 4.5],
  },
  {
    service: 'heating',
    fromF: 201,
    toF: 251,
    kLow: 0.27,
    kHigh: 0.3,
    meanRatingF: 150,
    thicknessIn: [2.5, 2.5, 2.5, 3.0, 3.0],
  },
  {
    service: 'heating',
    fromF: 141,
    toF: 201,
    kLow: 0.25,
    kHigh: 0.29,
    meanRatingF: 125,
    thicknessIn: [1.5, 1.5, 2.0, 2.0, 2.0],
  },
  {
    service: 'heating',
    fromF: 105,
    toF: 141,
    kLow: 0.22,
    kHigh: 0.28,
    meanRatingF: 100,
    thicknessIn: [1.0, 1.0, 1.5, 1.5, 1.5],
  },
  {
    service: 'cooling',
    fromF: 40,
    toF: 60.0001,
    kLow: 0.21,
    kHigh: 0.27,
    meanRatingF: 75,
    thicknessIn: [0.5, 0.5, 1.0, 1.0, 1.0],
  },
  {
    service: 'cooling',
    fromF: -Infinity,
    toF: 40,
    kLow: 0.2,
    kHigh: 0.26,
    meanRatingF: 50,
    thicknessIn: [0.5, 1.0, 1.0, 1.0, 1.5],
  },
];

/** 1 W/(m·K) in Btu·in/(h·ft²·°F). */
export const W_PER_MK_IN_BTU_IN = 6.933471799;

/** The row for a fluid temperature, or null between 60 °F and 105 °F (the table asks nothing there). */
export function energyCodeRow(fluidC: number): EnergyCodeRow | null {
  const f = cToF(fluidC);
  for (const r of ASHRAE_90_1_TABLE_6_8_3_1) {
    if (r.service === 'heating' && f >= r.fromF && f < r.toF) return r;
    if (r.service === 'cooling' && f >= r.fromF && f < r.toF) return r;
  }
  if (f > 350) return ASHRAE_90_1_TABLE_6_8_3_1[0];
  return null;
}

/** The NPS band index for a pipe outside diameter: < 1, 1 to < 1½, 1½ to < 4, 4 to < 8, ≥ 8. */
export function npsBand(outsideDiameterMm: number): number {
  const nps = pipeByOutsideDiameter(outsideDiameterMm)?.npsInches ?? outsideDiameterMm / 25.4 - 0.3;
  if (nps < 1) return 0;
  if (nps < 1.5) return 1;
  if (nps < 4) return 2;
  if (nps < 8) return 3;
  return 4;
}

/** The footnote's equivalent thickness, in: T = r·[(1 + t/r)^(K/k) − 1]. */
export function equivalentThicknessIn(o: {
  radiusIn: number;
  tableIn: number;
  kActual: number;
  kUpper: number;
}): number {
  return o.radiusIn * (Math.pow(1 + o.tableIn / o.radiusIn, o.kActual / o.kUpper) - 1);
}

export interface EnergyCodeMinimum {
  code: 'ashrae-90.1';
  /** Table 6.8.3-1 row and thickness. */
  row: EnergyCodeRow;
  tableMm: number;
  /** After the conductivity correction (equal to tableMm when K is within the table's range). */
  minimumMm: number;
  /** The insulation's conductivity at the row's mean rating temperature, Btu·in/(h·ft²·°F). */
  kActual: number;
  corrected: boolean;
}

/**
 * The energy-code minimum for a pipe at a fluid temperature with insulation whose conductivity
 * (W/(m·K)) at a mean temperature (°C) is given. Null when the table sets no minimum.
 */
export function energyCodeMinimum(o: {
  fluidC: number;
  outsideDiameterMm: number;
  conductivityAt: (meanC: number) => number;
}): EnergyCodeMinimum | null {
  const row = energyCodeRow(o.fluidC);
  if (!row) return null;
  const tableIn = row.thicknessIn[npsBand(o.outsideDiameterMm)];
  const kActual = o.conductivityAt(fToC(row.meanRatingF)) * W_PER_MK_IN_BTU_IN;
  const inRange = kActual >= row.kLow - 1e-9 && kActual <= row.kHigh + 1e-9;
  const minimumIn = inRange
    ? tableIn
    : equivalentThicknessIn({
        radiusIn: o.outsideDiameterMm / 2 / 25.4,
        tableIn,
        kActual,
        kUpper: row.kHigh,
      });
  return {
    code: 'ashrae-90.1',
    row,
    tableMm: tableIn * 25.4,
    minimumMm: minimumIn * 25.4,
    kActual,
    corrected: !inRange,
  };
}
