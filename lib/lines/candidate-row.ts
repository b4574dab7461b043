/**
 * The one codec of a stored candidate. A line's result keeps its candidates compactly as JSON
 * arrays, one per thickness:
 *
 *   [mm, layers, heat flow, surface °C (heat loss), surface °C (personnel), annual cost,
 *    layers within service limits, surface °C (condensation), vessel part fluxes]
 *
 * with layers as [materialId, mm] pairs and heat flow in W/m (pipes) or W/m² (vessels and flat
 * surfaces). The ninth entry, vessels only, is [shell, top head, bottom head] heat flux in W/m² of
 * each part's own bare area (heat-loss conditions), for picks that give the parts their own thickness.
 * Results stored before the eighth field existed have seven entries; before the ninth, eight. Nothing outside this
 * module reads or writes a position; the SQL that finds a candidate by thickness takes its path
 * from here too. Pure (server and client).
 */
import type { CandidateResult } from '@/lib/thermal';

/** The stored form. */
export type CandidateRow = [
  number,
  [string, number][],
  number,
  number,
  number | null,
  number | null,
  boolean,
  (number | null)?,
  [number, number, number]?,
];

/** A stored candidate read back. */
export interface StoredCandidate {
  /** Total insulation thickness, mm (0: bare). */
  mm: number;
  layers: { materialId: string; thicknessMm: number }[];
  /** Heat flow under the heat-loss conditions, W/m or W/m². */
  heatFlow: number;
  /** Surface temperature under the heat-loss conditions, °C. */
  heatLossC: number;
  /** Surface temperature under the personnel conditions, °C, when solved. */
  personnelC: number | null;
  annualCost: number | null;
  /** Every layer within its service temperatures. */
  withinLimits: boolean;
  /** Surface temperature under the condensation conditions, °C, when solved (null in older rows). */
  condensationC: number | null;
  /** Vessels: heat flux per m² of each part's bare area [shell, top, bottom], when stored. */
  partFluxesWPerM2: [number, number, number] | null;
}

const POW10 = [1, 10, 100, 1000, 1e4, 1e5, 1e6];
const round = (v: number, d: number) => Math.round(v * POW10[d]) / POW10[d];

/**
 * The stored row of one of the engine's candidates, rounded as stored (heat flow to 6 places,
 * temperatures to 0.01 K, annual cost to 3 places).
 */
export function encodeCandidate(c: CandidateResult, partFluxes?: [number, number, number]): CandidateRow {
  const row: CandidateRow = [
    c.totalMm,
    c.layers.map((l) => [l.materialId, l.thicknessMm]),
    round(c.heatLoss.heatFlow, 6),
    round(c.heatLoss.surfaceC, 2),
    c.personnel ? round(c.personnel.surfaceC, 2) : null,
    c.annualCost === undefined ? null : round(c.annualCost, 3),
    c.serviceLimitOk,
    c.condensation ? round(c.condensation.surfaceC, 2) : null,
  ];
  if (partFluxes) row.push([round(partFluxes[0], 6), round(partFluxes[1], 6), round(partFluxes[2], 6)]);
  return row;
}

export function decodeCandidate(r: CandidateRow): StoredCandidate {
  return {
    mm: r[0],
    layers: r[1].map(([materialId, thicknessMm]) => ({ materialId, thicknessMm })),
    heatFlow: r[2],
    heatLossC: r[3],
    personnelC: r[4] ?? null,
    annualCost: r[5] ?? null,
    withinLimits: r[6],
    condensationC: r[7] ?? null,
    partFluxesWPerM2: r[8] ?? null,
  };
}

/** Thickness of a stored row, mm, without decoding the rest. */
export const candidateMm = (r: CandidateRow): number => r[0];

/** The stored row at a thickness, if the line has that candidate. */
export function candidateAt(rows: readonly CandidateRow[], mm: number | null): CandidateRow | undefined {
  return mm === null ? undefined : rows.find((r) => r[0] === mm);
}

/** Where a stored row keeps its thickness, for the SQL that finds the candidate at a thickness. */
export const CANDIDATE_MM_POSITION = 0;
