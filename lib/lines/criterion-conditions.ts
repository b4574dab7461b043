/**
 * Which condition set of the design basis each criterion is judged under, for the line page: the
 * engine names it on each outcome (`conditionSet`); results stored before it did are read by the
 * same rule the engine follows (recommend.ts). Pure: the page and tests share it.
 */
import type { ConditionSet, ConditionSetId, CriterionId } from '@/lib/thermal';

export const CONDITION_SET_LABEL: Record<ConditionSetId | 'none', string> = {
  heatLoss: 'annual heat-loss conditions',
  personnel: 'personnel conditions (hottest air, still)',
  condensation: 'condensation conditions (design humidity)',
  freeze: 'coldest design air and wind',
  none: 'no air conditions (table minimum)',
};

/** The condition set of an outcome; `cold`: the line runs below the heat-loss air (a process change is judged on the hottest day). */
export function conditionSetOf(
  o: { id: string; conditionSet?: ConditionSetId | 'none' },
  cold: boolean,
): ConditionSetId | 'none' {
  if (o.conditionSet) return o.conditionSet;
  switch (o.id as CriterionId) {
    case 'personnel':
      return 'personnel';
    case 'condensation':
      return 'condensation';
    case 'freeze':
      return 'freeze';
    case 'processDrop':
      return cold ? 'personnel' : 'freeze';
    case 'energyCode':
      return 'none';
    default:
      return 'heatLoss';
  }
}

/** "coldest design air and wind: −15 °C, 5 m/s" — the set's label and its values, temperatures through `temp`. */
export function describeConditionSet(
  id: ConditionSetId | 'none',
  sets: Record<ConditionSetId, ConditionSet>,
  temp: (c: number) => string,
  wind: (ms: number) => string,
): string {
  if (id === 'none') return CONDITION_SET_LABEL.none;
  const c = sets[id];
  return `${CONDITION_SET_LABEL[id]}: ${temp(c.airC)}, ${wind(c.windMs)}${c.relativeHumidityPct !== undefined ? `, ${c.relativeHumidityPct} % RH` : ''}`;
}
