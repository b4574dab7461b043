/**
 * Dew point (over water) and frost point (over ice) of moist air from temperature and relative
 * humidity, by the Magnus form with the coefficients of O. A. Alduchov and R. E. Eskridge,
 * "Improved Magnus form approximation of saturation vapor pressure", J. Appl. Meteor. 35 (1996)
 * 601–609: over water e_s = 6.1094·exp(17.625·T/(T + 243.04)) hPa (−40 to 50 °C);
 * over ice e_s = 6.1121·exp(22.587·T/(T + 273.86)) hPa (−80 to 0 °C).
 */

const WATER = { a: 17.625, b: 243.04 };
const ICE = { a: 22.587, b: 273.86 };

function invert(c: { a: number; b: number }, gamma: number) {
  return (c.b * gamma) / (c.a - gamma);
}

/** Dew point over liquid water, °C. RH in per cent (0 < RH ≤ 100). */
export function dewPointC(airC: number, relativeHumidityPct: number): number {
  const g = Math.log(relativeHumidityPct / 100) + (WATER.a * airC) / (WATER.b + airC);
  return invert(WATER, g);
}

/**
 * Frost point over ice, °C (meaningful when it is below 0 °C). Relative humidity is taken against
 * saturation over ice when the air itself is at or below 0 °C and over water above it — the
 * ASHRAE Handbook—Fundamentals convention (as psychrolib implements it).
 */
export function frostPointC(airC: number, relativeHumidityPct: number): number {
  const sat =
    airC <= 0
      ? 6.1121 * Math.exp((ICE.a * airC) / (ICE.b + airC))
      : 6.1094 * Math.exp((WATER.a * airC) / (WATER.b + airC));
  return invert(ICE, Math.log(((relativeHumidityPct / 100) * sat) / 6.1121));
}

/**
 * The temperature a cold surface must stay above to stay dry: the dew point, or the frost point
 * when the dew point is below 0 °C (moisture then deposits as frost).
 */
export function condensationThresholdC(
  airC: number,
  relativeHumidityPct: number,
): { valueC: number; basis: 'dew point' | 'frost point' } {
  const dp = dewPointC(airC, relativeHumidityPct);
  if (dp >= 0) return { valueC: dp, basis: 'dew point' };
  return { valueC: frostPointC(airC, relativeHumidityPct), basis: 'frost point' };
}
