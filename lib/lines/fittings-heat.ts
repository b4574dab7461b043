/**
 * A line's fittings and supports in its heat loss: the line list's counts with the project's
 * equivalent lengths (design basis `fittings`), on pipes only — one rule for the line page, the
 * budget and the bill.
 */
import { fittingsHeatLoss } from '@/lib/thermal/fittings';
import type { DesignBasis } from './design-basis';

export interface LineCounts {
  geometry: string;
  lengthM: number | null;
  elbows: number;
  tees: number;
  valves: number;
  flanges: number;
}

/** Extra heat flow of the fittings, W, with the pipe insulated (q′ W/m) and left bare (q′_bare W/m). */
export function lineFittingsW(
  basis: DesignBasis,
  l: LineCounts,
  insulatedWPerM: number,
  bareWPerM: number,
  lineIsBare = false,
): number {
  if (!l.geometry.endsWith('pipe') || !l.lengthM) return 0;
  const f = basis.fittings;
  const counts = {
    elbows: l.elbows,
    tees: l.tees,
    valves: l.valves,
    flangePairs: l.flanges,
    supportsPerM: f.supportsPerM,
    valvesBare: f.valvesBare,
  };
  // A bare line's fittings are bare too: every equivalent length at the bare loss.
  return fittingsHeatLoss({
    counts: lineIsBare ? { ...counts, valvesBare: false } : counts,
    lengthM: l.lengthM,
    insulatedWPerM: lineIsBare ? bareWPerM : insulatedWPerM,
    bareWPerM,
    lengths: f,
  }).fittingsW;
}
