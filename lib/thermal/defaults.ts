import type { Criteria, MaterialSystem } from './recommend';
import { DEFAULT_ECONOMICS, DEFAULT_PRICES } from './economics';
import { jacketById, materialById } from './materials';

/**
 * Default criteria for a new project — each a common-practice starting point that the design basis
 * overrides: 60 °C touch limit for metal jackets (industry convention, consistent with ASTM C1055's
 * 5 s contact / first-degree-burn guidance; not a value C1055 mandates), 2 K dew-point margin,
 * personnel check at the hottest air in still air, condensation at 30 °C / 80 % RH.
 */
export const DEFAULT_CRITERIA: Criteria = {
  conditions: {
    heatLoss: { airC: 10, windMs: 3 },
    personnel: { airC: 35, windMs: 0 },
    condensation: { airC: 30, windMs: 0.5, relativeHumidityPct: 80 },
    freeze: { airC: -15, windMs: 5 },
  },
  touchLimitMetalC: 60,
  touchLimitNonMetalC: 65,
  dewPointMarginK: 2,
  maxProcessDropK: 5,
  // 25 % ice allowed by the required time: common practice for water lines (a partly frozen line still drains and rarely bursts).
  freeze: { initialWaterTempC: 10, requiredHours: 8, iceFractionPct: 25 },
  economics: DEFAULT_ECONOMICS,
  prices: DEFAULT_PRICES,
};

/** Material systems per service band (a starting specification, common practice). */
export function defaultSystemFor(tempC: number): MaterialSystem {
  if (tempC < 0)
    return {
      outer: materialById('polyisocyanurate')!,
      jacket: jacketById('aluminium-oxidised')!,
      inner: materialById('cellular-glass')!,
    };
  if (tempC < 20) return { outer: materialById('elastomeric-foam')!, jacket: jacketById('pvc')! };
  if (tempC <= 120)
    return { outer: materialById('mineral-wool-pipe')!, jacket: jacketById('aluminium-oxidised')! };
  if (tempC <= 600)
    return { outer: materialById('mineral-wool-pipe')!, jacket: jacketById('aluminium-oxidised')! };
  return {
    outer: materialById('mineral-wool-pipe')!,
    inner: materialById('calcium-silicate')!,
    jacket: jacketById('stainless-steel')!,
  };
}
