/**
 * The JSON a line's stored result and design carry beside the candidate table
 * (lib/lines/candidate-row.ts). Types only; pure.
 */
import type { CriterionOutcome, OverallCoefficient } from '@/lib/thermal';

/** One insulation layer, inside out. */
export interface StoredLayer {
  materialId: string;
  thicknessMm: number;
}

/** The solved design at the recommendation, under the heat-loss conditions. */
export interface StoredDesign {
  profileC: { radiusOrDepthM: number; tempC: number }[];
  overall: OverallCoefficient;
  convective: number;
  radiative: number;
}

export type StoredOutcome = CriterionOutcome;
