/**
 * When each safety criterion applies to a line — one definition, used by the recommendation
 * (recommend.ts), the review flags (lib/review/flags.ts) and the line page, so they cannot disagree.
 */
import { condensationThresholdC } from './psychro';
import type { ConditionSet, CriterionId, Purpose } from './recommend';

/**
 * Lines colder than this are checked for sweating even when the line list does not ask for
 * condensation control (common practice: chilled and refrigerated services sweat in most climates).
 */
export const ALWAYS_CHECK_CONDENSATION_BELOW_C = 10;

/**
 * Personnel protection applies to every surface within reach whose hottest operating temperature
 * is above the personnel-condition air: a burn does not depend on why the line is insulated.
 * `accessible` unknown counts as within reach.
 */
export function personnelProtectionApplies(
  o: { accessible?: boolean | null; hottestC: number },
  personnel: ConditionSet,
): boolean {
  return o.accessible !== false && o.hottestC > personnel.airC;
}

/** The surface temperature a cold surface must stay at or above: dew (or frost) point + margin under the condensation conditions. */
export function condensationLimit(condensation: ConditionSet, marginK: number) {
  const th = condensationThresholdC(condensation.airC, condensation.relativeHumidityPct ?? 80);
  return { ...th, needC: th.valueC + marginK };
}

/**
 * Condensation control applies when the line asks for it (or runs below 10 °C) and its process
 * temperature is under the dew point + margin of the condensation conditions — so that some
 * surface, bare or thinly insulated, could sweat. Compared with the condensation conditions' own
 * air, never the annual heat-loss air.
 */
export function condensationControlApplies(
  o: { purposes: readonly Purpose[]; coldestC: number },
  condensation: ConditionSet,
  marginK: number,
): boolean {
  const asked = o.purposes.includes('condensationControl') || o.coldestC < ALWAYS_CHECK_CONDENSATION_BELOW_C;
  return asked && o.coldestC < condensationLimit(condensation, marginK).needC;
}

/** Criteria a pick may not go below without a stated reason (it then stays flagged for review); the economic one is advice. */
export const HARD_CRITERIA: ReadonlySet<CriterionId> = new Set<CriterionId>([
  'personnel',
  'condensation',
  'heatLossLimit',
  'processDrop',
  'freeze',
  'energyCode',
]);
