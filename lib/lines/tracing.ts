/**
 * Heat tracing of the project's lines (IEEE 515 / IEC/IEEE 60079-30-2 sizing basis; the formulas are
 * in lib/thermal/tracing.ts). One rule for which lines are traced and under which conditions; the
 * solve stores each candidate's heat loss at the maintain temperature (`tracingOfSolved`), and the
 * line page, the budget and the bill read the duty at the line's thickness (`lineTracing`).
 */
import type { CandidateResult, MaterialSystem } from '@/lib/thermal';
import { tracerLengthM, tracingDuty, type TracingDuty } from '@/lib/thermal/tracing';
import type { DesignBasis } from './design-basis';
import { lineFittingsW, type LineCounts } from './fittings-heat';
import { solveAt } from './recommend-case';
import { criteriaFor, lineCaseFor } from './solve-line';
import type { StoredTracing } from './stored-result';
import type { LineInput } from './validate';

export { TRACING_REASON_LABEL, TRACING_STANDARD } from './tracing-labels';

type TracedLine = Pick<LineInput, 'geometry' | 'purposes' | 'normalTempC' | 'outdoor'> & {
  heatTraced?: boolean;
};

/**
 * Whether a line is traced, why, and the conditions of its duty; null for untraced lines and for
 * vessels and flat surfaces (traced by the area, not sized here). Freeze-protected lines (and lines
 * marked in the line list without a process duty) hold the project's maintain temperature;
 * process-control lines hold their normal temperature. Outdoor lines see the minimum design ambient
 * and wind (blank: the freeze condition set); indoor lines the engine's indoor freeze rule (at least
 * 5 °C, still air).
 */
export function tracingConditions(basis: DesignBasis, l: TracedLine): Omit<StoredTracing, 'lossByMm'> | null {
  if (!l.geometry.endsWith('pipe')) return null;
  const ht = basis.heatTracing;
  const freeze = l.purposes.includes('freezeProtection');
  const process = l.purposes.includes('processControl');
  const reason: StoredTracing['reason'] | null = l.heatTraced
    ? 'line-list'
    : ht.traceFreezeProtection && freeze
      ? 'freeze-protection'
      : ht.traceProcessControl && process
        ? 'process-control'
        : null;
  if (!reason) return null;
  const maintainC = process && !freeze ? l.normalTempC : ht.maintainTempC;
  const outdoor = {
    airC: ht.minAmbientC ?? basis.conditions.freeze.airC,
    windMs: ht.windMs ?? basis.conditions.freeze.windMs,
  };
  // The engine's indoor freeze rule (criteriaFor) applied to the tracing ambient.
  const air = l.outdoor
    ? outdoor
    : criteriaFor({ ...basis, conditions: { ...basis.conditions, freeze: outdoor } }, false).conditions
        .freeze;
  return { reason, maintainC, airC: air.airC, windMs: air.windMs };
}

/** At solve time: each candidate's heat loss per metre at the maintain temperature, or null when not traced. */
export function tracingOfSolved(
  basis: DesignBasis,
  l: LineInput & { heatTraced?: boolean },
  system: MaterialSystem,
  candidates: readonly Pick<CandidateResult, 'totalMm' | 'layers'>[],
): StoredTracing | null {
  const t = tracingConditions(basis, l);
  if (!t) return null;
  const c = lineCaseFor(l);
  const cs = { airC: t.airC, windMs: t.windMs };
  return {
    ...t,
    lossByMm: candidates.map((x) => [x.totalMm, solveAt(c, system, x.layers, t.maintainC, cs).heatFlow]),
  };
}

export interface LineTracing extends TracingDuty {
  reason: StoredTracing['reason'];
  maintainC: number;
  airC: number;
  windMs: number;
  thicknessMm: number;
  /** Tracer length with the fitting allowances, m; null for a pipe without its length yet. */
  tracerM: number | null;
  /** Run length the duty is spread over, m (1 m for a pipe without its length). */
  lengthM: number | null;
}

/**
 * The duty at a thickness from the stored tracing: required W = SF · (q′_m · L + fittings at the
 * maintain temperature), fittings by the project's equivalent lengths (bare ones at the bare pipe's
 * loss at the same conditions). Null when the line is not traced or the thickness was not solved.
 */
export function lineTracing(
  basis: DesignBasis,
  line: LineCounts,
  stored: StoredTracing | null | undefined,
  thicknessMm: number | null,
): LineTracing | null {
  if (!stored || thicknessMm === null) return null;
  const at = stored.lossByMm.find(([mm]) => mm === thicknessMm);
  const bare = stored.lossByMm.find(([mm]) => mm === 0);
  if (!at || !bare) return null;
  const run = line.lengthM ?? 1;
  const fittingsW = lineFittingsW(basis, { ...line, lengthM: run }, at[1], bare[1], thicknessMm === 0);
  const duty = tracingDuty({
    heatLossWPerM: at[1],
    fittingsW,
    lengthM: run,
    safetyFactor: basis.heatTracing.safetyFactor,
  });
  const f = basis.fittings;
  return {
    ...duty,
    reason: stored.reason,
    maintainC: stored.maintainC,
    airC: stored.airC,
    windMs: stored.windMs,
    thicknessMm,
    lengthM: line.lengthM,
    tracerM:
      line.lengthM === null
        ? null
        : tracerLengthM({
            lengthM: line.lengthM,
            counts: {
              elbows: line.elbows,
              tees: line.tees,
              valves: line.valves,
              flangePairs: line.flanges,
              supportsPerM: f.supportsPerM,
            },
            allowances: basis.heatTracing,
          }),
  };
}
