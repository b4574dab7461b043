/**
 * Heat-tracing duty of a run of pipe, on the sizing basis of IEEE 515 (IEEE Standard for the Testing,
 * Design, Installation, and Maintenance of Electrical Resistance Trace Heating for Industrial
 * Applications) and IEC/IEEE 60079-30-2 (the same design guidance for explosive atmospheres): the
 * tracer must make up the heat the insulated pipe loses when it is held at the maintain temperature
 * in the minimum design ambient and the design wind, with a safety factor on top; fittings, valves,
 * flanges and supports lose more than straight pipe and get extra tracer.
 *
 *   required heat  Q  = SF · (q′_m · L + Q_fittings,m)           (W)
 *   required duty  q′ = Q / L = SF · q′_m · (1 + Q_fittings,m / (q′_m · L))   (W per metre of pipe)
 *
 * q′_m is the heat loss per metre at the maintain temperature (solved by the engine at the chosen
 * thickness), Q_fittings,m the fittings' extra loss at the same conditions (the project's equivalent
 * lengths, lib/thermal/fittings.ts — the ISO 12241 simplified thermal-bridge approach). With no
 * fittings this is the `heatTracingDuty` of lib/thermal/fittings.ts.
 *
 * The tracer length is the run plus an allowance per fitting (extra cable looped on the fitting so it
 * gets the heat it loses): common practice, values recalled from design guides, not read from
 * IEEE 515 or IEC/IEEE 60079-30-2, which leave them to the designer and the tracer's manufacturer.
 */
import type { FittingCounts } from './fittings';

/** Metres of extra tracer per fitting (common practice [recalled]; set the project's own). */
export interface TracerAllowances {
  elbowM: number;
  teeM: number;
  valveM: number;
  flangePairM: number;
  supportM: number;
}

/**
 * Common practice [recalled]: about 1 m of tracer on a small-bore valve body, 0.3 m on a flange pair, a
 * pipe shoe or support, an elbow or a tee. Larger valves take more (about their face-to-face length
 * three times over): the project replaces these with its tracer manufacturer's allowances.
 */
export const DEFAULT_TRACER_ALLOWANCES: TracerAllowances = {
  elbowM: 0.3,
  teeM: 0.3,
  valveM: 1.0,
  flangePairM: 0.3,
  supportM: 0.3,
};

export interface TracingDuty {
  /** Heat loss per metre of the insulated pipe at the maintain temperature, W/m (q′_m). */
  heatLossWPerM: number;
  /** Extra loss of the fittings and supports at the maintain temperature, W. */
  fittingsW: number;
  safetyFactor: number;
  /** Tracer output needed per metre of pipe, W/m (fittings spread over the run). */
  requiredWPerM: number;
  /** Tracer output needed for the whole run, W. */
  requiredW: number;
}

/** The duty of a run of `lengthM` metres (see the module comment for the formula). */
export function tracingDuty(o: {
  heatLossWPerM: number;
  fittingsW: number;
  lengthM: number;
  safetyFactor: number;
}): TracingDuty {
  const q = Math.max(0, o.heatLossWPerM);
  const fit = Math.max(0, o.fittingsW);
  const requiredW = o.safetyFactor * (q * o.lengthM + fit);
  return {
    heatLossWPerM: q,
    fittingsW: fit,
    safetyFactor: o.safetyFactor,
    requiredWPerM: o.lengthM > 0 ? requiredW / o.lengthM : q * o.safetyFactor,
    requiredW,
  };
}

/** Tracer length of a run: the run plus the allowance per fitting and per support (supports per metre × run). */
export function tracerLengthM(o: {
  lengthM: number;
  counts: Pick<FittingCounts, 'elbows' | 'tees' | 'valves' | 'flangePairs' | 'supportsPerM'>;
  allowances?: TracerAllowances;
}): number {
  const a = o.allowances ?? DEFAULT_TRACER_ALLOWANCES;
  const c = o.counts;
  return (
    o.lengthM +
    (c.elbows ?? 0) * a.elbowM +
    (c.tees ?? 0) * a.teeM +
    (c.valves ?? 0) * a.valveM +
    (c.flangePairs ?? 0) * a.flangePairM +
    (c.supportsPerM ?? 0) * o.lengthM * a.supportM
  );
}
