/**
 * Fittings and thermal bridges on a pipe run, as equivalent lengths (the simplified approach of
 * ISO 12241 for thermal bridges; VDI 2055 Part 1 gives surcharges of the same kind; ASTM C1129
 * estimates bare against covered valves and flanges). Each fitting adds the heat loss of so many
 * metres of the same pipe: insulated fittings in metres of the insulated pipe, bare ones in metres
 * of bare pipe.
 *
 * The default lengths are common-practice estimates recalled from insulation design guides, not
 * values read from VDI 2055 or ASTM C1129: a project replaces them with its own specification's.
 */
export interface FittingCounts {
  elbows?: number;
  tees?: number;
  valves?: number;
  flangePairs?: number;
  /** Pipe supports or hangers per metre of run (thermal bridges through the insulation). */
  supportsPerM?: number;
  /** Valves and flange pairs left uninsulated (counted as bare). */
  valvesBare?: boolean;
}

export interface EquivalentLengths {
  /** Metres of insulated pipe per insulated fitting. */
  elbowM: number;
  teeM: number;
  valveM: number;
  flangePairM: number;
  /** Metres of insulated pipe per support (thermal bridge). */
  supportM: number;
  /** Metres of bare pipe per uninsulated valve or flange pair. */
  bareValveM: number;
  bareFlangePairM: number;
}

/** Common-practice estimates [recalled]; replace with the project's own. */
export const DEFAULT_EQUIVALENT_LENGTHS: EquivalentLengths = {
  elbowM: 0.5,
  teeM: 1.0,
  valveM: 1.5,
  flangePairM: 0.5,
  supportM: 0.25,
  bareValveM: 1.2,
  bareFlangePairM: 0.5,
};

export interface FittingsHeat {
  /** Extra heat flow of the fittings and supports, W. */
  fittingsW: number;
  /** Equivalent extra length of insulated pipe, m (supports and covered fittings). */
  insulatedEquivalentM: number;
  /** Equivalent extra length of bare pipe, m (uncovered valves and flanges). */
  bareEquivalentM: number;
}

/**
 * Heat flow of a run's fittings: counts × equivalent lengths × the heat loss per metre of the
 * insulated (q′) or the bare (q′_bare) pipe. `lengthM` is the straight run (for supports per metre).
 */
export function fittingsHeatLoss(o: {
  counts: FittingCounts;
  lengthM: number;
  insulatedWPerM: number;
  bareWPerM: number;
  lengths?: EquivalentLengths;
}): FittingsHeat {
  const L = o.lengths ?? DEFAULT_EQUIVALENT_LENGTHS;
  const c = o.counts;
  const bare = !!c.valvesBare;
  const insulatedEquivalentM =
    (c.elbows ?? 0) * L.elbowM +
    (c.tees ?? 0) * L.teeM +
    (bare ? 0 : (c.valves ?? 0) * L.valveM + (c.flangePairs ?? 0) * L.flangePairM) +
    (c.supportsPerM ?? 0) * o.lengthM * L.supportM;
  const bareEquivalentM = bare
    ? (c.valves ?? 0) * L.bareValveM + (c.flangePairs ?? 0) * L.bareFlangePairM
    : 0;
  return {
    fittingsW: insulatedEquivalentM * o.insulatedWPerM + bareEquivalentM * o.bareWPerM,
    insulatedEquivalentM,
    bareEquivalentM,
  };
}

/**
 * Heat-tracing duty (the sizing basis of IEEE 515 / IEC/IEEE 60079-30-2): the heat loss of the
 * insulated pipe held at the maintain temperature in the minimum design ambient and design wind,
 * times a safety factor; fittings add their equivalent lengths spread over the run.
 */
export const DEFAULT_TRACING_SAFETY_FACTOR = 1.2; // 20 % margin: common practice [recalled]

export function heatTracingDuty(o: {
  heatLossWPerM: number;
  safetyFactor?: number;
  fittingsExtraM?: number;
  lengthM?: number;
}): { heatLossWPerM: number; requiredWPerM: number } {
  const sf = o.safetyFactor ?? DEFAULT_TRACING_SAFETY_FACTOR;
  const spread = o.fittingsExtraM && o.lengthM ? 1 + o.fittingsExtraM / o.lengthM : 1;
  return { heatLossWPerM: o.heatLossWPerM, requiredWPerM: Math.max(0, o.heatLossWPerM) * spread * sf };
}
