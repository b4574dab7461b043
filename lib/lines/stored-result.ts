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

/**
 * A traced line's tracing conditions and, per candidate thickness, the heat loss per metre at the
 * maintain temperature (lib/lines/tracing.ts); solved with the result, so pages only read it.
 */
export interface StoredTracing {
  /** Why the line is traced: marked in the line list, or by the project's freeze / process rule. */
  reason: 'line-list' | 'freeze-protection' | 'process-control';
  maintainC: number;
  airC: number;
  windMs: number;
  /** [thickness mm, heat loss W/m at the maintain temperature] per candidate, bare (0 mm) first. */
  lossByMm: [number, number][];
}
