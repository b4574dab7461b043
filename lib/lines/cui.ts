/**
 * The corrosion-under-insulation screen of a line under its project's design basis: the engine's
 * rule (lib/thermal/cui.ts) fed with the line's temperatures and, as its idle temperature, the
 * annual heat-loss air of its location. One home for the line page, the review flag and tests.
 */
import { screenCui, type CuiScreen } from '@/lib/thermal';
import type { DesignBasis } from './design-basis';
import type { LineInput } from './validate';

export function cuiScreenFor(
  basis: Pick<DesignBasis, 'cui' | 'conditions'>,
  line: Pick<LineInput, 'normalTempC' | 'maxTempC' | 'outdoor'>,
): CuiScreen {
  const idleC = basis.conditions.heatLoss[line.outdoor ? 'outdoor' : 'indoor'].airC;
  return screenCui({ normalC: line.normalTempC, maxC: line.maxTempC ?? undefined, idleC }, basis.cui);
}
