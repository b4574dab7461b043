/**
 * Convection correlations, each named by quantity, geometry and author. Nusselt numbers are
 * dimensionless; the caller multiplies by k/L with the length each correlation states.
 * Each correlation exposes its validity range as data; `checkRange` turns it into a warning.
 */

export interface ValidityRange {
  variable: 'Ra' | 'Re' | 'RePr';
  min: number;
  max: number;
}

/**
 * Natural convection, long horizontal isothermal cylinder (length scale: outside diameter).
 * Nu = {0.60 + 0.387·Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}²
 * Source: S. W. Churchill and H. H. S. Chu, "Correlating equations for laminar and turbulent free
 * convection from a horizontal cylinder", Int. J. Heat Mass Transfer 18 (1975) 1049–1053, eq. (4).
 * Valid: 1e-5 ≤ Ra ≤ 1e12, all Pr.
 * Check: Ra = 1.867e6, Pr = 0.7241 → Nu = 17.40 (Çengel & Ghajar, Heat and Mass Transfer, 5th ed., Ex. 9-1).
 */
export function nusseltHorizontalCylinderChurchillChu(ra: number, pr: number): number {
  return nusseltHorizontalCylinderChurchillChuWithFactor(ra, prFactorHorizontalCylinderChurchillChu(pr));
}
/** The Prandtl part of the horizontal-cylinder equation, [1 + (0.559/Pr)^(9/16)]^(8/27). */
export const prFactorHorizontalCylinderChurchillChu = (pr: number) =>
  Math.pow(1 + Math.pow(0.559 / pr, 9 / 16), 8 / 27);
/** The same equation with its Prandtl factor given (the solver tabulates it against film temperature). */
export function nusseltHorizontalCylinderChurchillChuWithFactor(ra: number, prFactor: number): number {
  const s = 0.6 + (0.387 * Math.sqrt(Math.cbrt(ra))) / prFactor;
  return s * s;
}
nusseltHorizontalCylinderChurchillChu.range = { variable: 'Ra', min: 1e-5, max: 1e12 } as ValidityRange;

/**
 * Natural convection, vertical isothermal plate (length scale: height); also used for vertical
 * pipes whose diameter is not small against the boundary layer and for vertical walls.
 * Nu = {0.825 + 0.387·Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}²
 * Source: S. W. Churchill and H. H. S. Chu, "Correlating equations for laminar and turbulent free
 * convection from a vertical plate", Int. J. Heat Mass Transfer 18 (1975) 1323–1329, eq. (4).
 * Valid: 1e-1 ≤ Ra ≤ 1e12, all Pr.
 * Check: Ra = 1e9, Pr = 0.71 → Nu = 122.86 (eq. 4 worked by hand).
 */
export function nusseltVerticalPlateChurchillChu(ra: number, pr: number): number {
  return nusseltVerticalPlateChurchillChuWithFactor(ra, prFactorVerticalPlateChurchillChu(pr));
}
/** [1 + (0.492/Pr)^(9/16)]^(8/27). */
export const prFactorVerticalPlateChurchillChu = (pr: number) =>
  Math.pow(1 + Math.pow(0.492 / pr, 9 / 16), 8 / 27);
export function nusseltVerticalPlateChurchillChuWithFactor(ra: number, prFactor: number): number {
  const s = 0.825 + (0.387 * Math.sqrt(Math.cbrt(ra))) / prFactor;
  return s * s;
}
nusseltVerticalPlateChurchillChu.range = { variable: 'Ra', min: 1e-1, max: 1e12 } as ValidityRange;

/**
 * Natural convection, horizontal plate with buoyancy assisting (hot surface facing up, or cold
 * surface facing down); length scale L = area / perimeter.
 * Nu = 0.54·Ra^(1/4) for Ra ≤ 1e7, Nu = 0.15·Ra^(1/3) above.
 * Source: J. R. Lloyd and W. R. Moran, "Natural convection adjacent to horizontal surfaces of
 * various planforms", J. Heat Transfer 96 (1974) 443–447; as given in Incropera et al.,
 * Fundamentals of Heat and Mass Transfer, 6th ed., eqs. 9.30–9.31.
 * Valid: 1e4 ≤ Ra ≤ 1e11, Pr ≥ 0.7.
 * Check: Ra = 1e6 → Nu = 17.08; Ra = 1e9 → Nu = 150.0.
 */
export function nusseltHorizontalPlateAssistedLloydMoran(ra: number): number {
  return ra <= 1e7 ? 0.54 * Math.pow(ra, 0.25) : 0.15 * Math.cbrt(ra);
}
nusseltHorizontalPlateAssistedLloydMoran.range = { variable: 'Ra', min: 1e4, max: 1e11 } as ValidityRange;

/**
 * Natural convection, horizontal plate with buoyancy opposing (hot surface facing down, or cold
 * surface facing up); L = area / perimeter.
 * Nu = 0.27·Ra^(1/4)
 * Source: W. H. McAdams, Heat Transmission, 3rd ed., McGraw-Hill (1954); as given in Incropera
 * et al., Fundamentals of Heat and Mass Transfer, 5th ed., eq. 9.32.
 * Valid: 1e5 ≤ Ra ≤ 1e10.
 * Check: Ra = 1e8 → Nu = 27.0.
 */
export function nusseltHorizontalPlateOpposedMcAdams(ra: number): number {
  return 0.27 * Math.pow(ra, 0.25);
}
nusseltHorizontalPlateOpposedMcAdams.range = { variable: 'Ra', min: 1e5, max: 1e10 } as ValidityRange;

/**
 * Forced convection, cylinder in cross-flow (length scale: outside diameter).
 * Nu = 0.3 + 0.62·Re^½·Pr^⅓ / [1 + (0.4/Pr)^⅔]^¼ · [1 + (Re/282000)^(5/8)]^(4/5)
 * Source: S. W. Churchill and M. Bernstein, "A correlating equation for forced convection from
 * gases and liquids to a circular cylinder in crossflow", J. Heat Transfer 99 (1977) 300–306, eq. (7).
 * Valid: Re·Pr ≥ 0.2.
 * Check: Re = 6071, Pr = 0.7 → Nu = 40.637 (ChEDL `ht`, Nu_cylinder_Churchill_Bernstein).
 */
export function nusseltCrossflowCylinderChurchillBernstein(re: number, pr: number): number {
  return nusseltCrossflowCylinderChurchillBernsteinWithFactor(re, prFactorChurchillBernstein(pr));
}
/** Pr^⅓ / [1 + (0.4/Pr)^⅔]^¼. */
export const prFactorChurchillBernstein = (pr: number) =>
  Math.cbrt(pr) / Math.sqrt(Math.sqrt(1 + Math.pow(0.4 / pr, 2 / 3)));
export function nusseltCrossflowCylinderChurchillBernsteinWithFactor(re: number, prFactor: number): number {
  const a = 0.62 * Math.sqrt(re) * prFactor;
  // (Re/282000)^(5/8) as the fifth power of an eighth root (three square roots) and y^(4/5) as
  // exp(0.8·ln y): the same values to a few ulps at a fraction of Math.pow's cost (this runs in the
  // solver's inner loop).
  const r8 = Math.sqrt(Math.sqrt(Math.sqrt(re / 282000)));
  const r2 = r8 * r8;
  return 0.3 + a * Math.exp(0.8 * Math.log(1 + r2 * r2 * r8));
}
nusseltCrossflowCylinderChurchillBernstein.range = {
  variable: 'RePr',
  min: 0.2,
  max: Infinity,
} as ValidityRange;

/**
 * Forced convection, flat plate in parallel flow, average over length L.
 * Laminar: Nu = 0.664·Re^½·Pr^⅓ (Re ≤ 5e5); mixed laminar–turbulent: Nu = (0.037·Re^0.8 − 871)·Pr^⅓.
 * Source: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., eqs. 7.30 and 7.38
 * (transition at Re = 5e5).
 * Valid: 0.6 ≤ Pr ≤ 60, Re ≤ 1e8.
 * Check: Re = 1e5, Pr = 0.7 → Nu = 186.4; Re = 1e6, Pr = 0.7 → Nu = 1281.
 */
export function nusseltFlatPlateAverage(re: number, pr: number): number {
  const p3 = Math.cbrt(pr);
  return re <= 5e5 ? 0.664 * Math.sqrt(re) * p3 : (0.037 * Math.pow(re, 0.8) - 871) * p3;
}
nusseltFlatPlateAverage.range = { variable: 'Re', min: 0, max: 1e8 } as ValidityRange;

/** Natural-convection correlations by the name a user or configuration picks. */
export const NATURAL_CONVECTION = {
  'horizontal-cylinder-churchill-chu': nusseltHorizontalCylinderChurchillChu,
  'vertical-plate-churchill-chu': nusseltVerticalPlateChurchillChu,
  'horizontal-plate-assisted-lloyd-moran': (ra: number, _pr: number) =>
    nusseltHorizontalPlateAssistedLloydMoran(ra),
  'horizontal-plate-opposed-mcadams': (ra: number, _pr: number) => nusseltHorizontalPlateOpposedMcAdams(ra),
} as const;

/** Forced-convection correlations by name. */
export const FORCED_CONVECTION = {
  'crossflow-cylinder-churchill-bernstein': nusseltCrossflowCylinderChurchillBernstein,
  'flat-plate-average': nusseltFlatPlateAverage,
} as const;

export const CORRELATION_RANGES: Record<
  keyof typeof NATURAL_CONVECTION | keyof typeof FORCED_CONVECTION,
  ValidityRange
> = {
  'horizontal-cylinder-churchill-chu': nusseltHorizontalCylinderChurchillChu.range,
  'vertical-plate-churchill-chu': nusseltVerticalPlateChurchillChu.range,
  'horizontal-plate-assisted-lloyd-moran': nusseltHorizontalPlateAssistedLloydMoran.range,
  'horizontal-plate-opposed-mcadams': nusseltHorizontalPlateOpposedMcAdams.range,
  'crossflow-cylinder-churchill-bernstein': nusseltCrossflowCylinderChurchillBernstein.range,
  'flat-plate-average': nusseltFlatPlateAverage.range,
};

export type NaturalName = keyof typeof NATURAL_CONVECTION;
export type ForcedName = keyof typeof FORCED_CONVECTION;

/** A warning text when a dimensionless group falls outside a correlation's range, else null. */
export function checkRange(name: NaturalName | ForcedName, value: number): string | null {
  const r = CORRELATION_RANGES[name];
  if (value >= r.min && value <= r.max) return null;
  return `${r.variable} = ${value.toExponential(2)} is outside the range of ${name} (${r.min.toExponential(0)} to ${r.max === Infinity ? '∞' : r.max.toExponential(0)}); result extrapolated`;
}
