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

/**
 * What the solver reads of the air at the film temperature: the Prandtl number and the
 * correlations' Prandtl factors, tabulated against film temperature by `filmAt` (air.ts).
 */
export interface FilmFactors {
  pr: number;
  /** `prFactorHorizontalCylinderChurchillChu` at the film's Pr. */
  fCyl: number;
  /** `prFactorVerticalPlateChurchillChu` at the film's Pr. */
  fPlate: number;
  /** `prFactorChurchillBernstein` at the film's Pr. */
  fCb: number;
}

/**
 * A natural-convection registry entry: called as Nu(Ra, Pr), with its validity range, the same
 * Nusselt number from the film's tabulated Prandtl factor (the solver's hot path), and its slope
 * d ln Nu / d ln Ra given Ra and that Nu (the natural flux grows as ΔT^(1+slope); the solver's
 * first Newton step uses it).
 */
export interface NaturalCorrelation {
  (ra: number, pr: number): number;
  readonly range: ValidityRange;
  readonly atFilm: (ra: number, film: FilmFactors) => number;
  readonly slope: (ra: number, nu: number) => number;
}

/** A forced-convection registry entry: Nu(Re, Pr), its validity range and its hot-path form. */
export interface ForcedCorrelation {
  (re: number, pr: number): number;
  readonly range: ValidityRange;
  readonly atFilm: (re: number, film: FilmFactors) => number;
}

const natural = (
  nu: (ra: number, pr: number) => number,
  range: ValidityRange,
  atFilm: NaturalCorrelation['atFilm'],
  slope: NaturalCorrelation['slope'],
): NaturalCorrelation => Object.assign((ra: number, pr: number) => nu(ra, pr), { range, atFilm, slope });
const forced = (
  nu: (re: number, pr: number) => number,
  range: ValidityRange,
  atFilm: ForcedCorrelation['atFilm'],
): ForcedCorrelation => Object.assign((re: number, pr: number) => nu(re, pr), { range, atFilm });

/**
 * Natural-convection correlations by the name a user or configuration picks — the only way from a
 * name to a function: the surface solver dispatches through this table (surface.ts).
 */
export const NATURAL_CONVECTION = {
  'horizontal-cylinder-churchill-chu': natural(
    nusseltHorizontalCylinderChurchillChu,
    nusseltHorizontalCylinderChurchillChu.range,
    (ra, film) => nusseltHorizontalCylinderChurchillChuWithFactor(ra, film.fCyl),
    // Nu = (0.6 + c·Ra^(1/6))² → d ln Nu / d ln Ra = (1 − 0.6/√Nu)/3.
    (_ra, nu) => (1 - 0.6 / Math.sqrt(nu)) / 3,
  ),
  'vertical-plate-churchill-chu': natural(
    nusseltVerticalPlateChurchillChu,
    nusseltVerticalPlateChurchillChu.range,
    (ra, film) => nusseltVerticalPlateChurchillChuWithFactor(ra, film.fPlate),
    (_ra, nu) => (1 - 0.825 / Math.sqrt(nu)) / 3,
  ),
  'horizontal-plate-assisted-lloyd-moran': natural(
    (ra, _pr) => nusseltHorizontalPlateAssistedLloydMoran(ra),
    nusseltHorizontalPlateAssistedLloydMoran.range,
    (ra, _film) => nusseltHorizontalPlateAssistedLloydMoran(ra),
    (ra, _nu) => (ra <= 1e7 ? 0.25 : 1 / 3),
  ),
  'horizontal-plate-opposed-mcadams': natural(
    (ra, _pr) => nusseltHorizontalPlateOpposedMcAdams(ra),
    nusseltHorizontalPlateOpposedMcAdams.range,
    (ra, _film) => nusseltHorizontalPlateOpposedMcAdams(ra),
    (_ra, _nu) => 0.25,
  ),
} as const satisfies Record<string, NaturalCorrelation>;

/** Forced-convection correlations by name — likewise the solver's only way to them. */
export const FORCED_CONVECTION = {
  'crossflow-cylinder-churchill-bernstein': forced(
    nusseltCrossflowCylinderChurchillBernstein,
    nusseltCrossflowCylinderChurchillBernstein.range,
    (re, film) => nusseltCrossflowCylinderChurchillBernsteinWithFactor(re, film.fCb),
  ),
  'flat-plate-average': forced(nusseltFlatPlateAverage, nusseltFlatPlateAverage.range, (re, film) =>
    nusseltFlatPlateAverage(re, film.pr),
  ),
} as const satisfies Record<string, ForcedCorrelation>;

export type NaturalName = keyof typeof NATURAL_CONVECTION;
export type ForcedName = keyof typeof FORCED_CONVECTION;

/** The dimensionless groups at a solved surface state; a range names which one it bounds. */
export interface Groups {
  ra: number;
  re: number;
  pr: number;
}
const GROUP: Record<ValidityRange['variable'], (g: Groups) => number> = {
  Ra: (g) => g.ra,
  Re: (g) => g.re,
  RePr: (g) => g.re * g.pr,
};

/** Both registries in one, for what every correlation has: its name and its validity range. */
const ANY_CONVECTION: Record<NaturalName | ForcedName, { range: ValidityRange }> = {
  ...NATURAL_CONVECTION,
  ...FORCED_CONVECTION,
};

/** A warning text when a dimensionless group falls outside a correlation's range, else null. */
export function checkRange(name: NaturalName | ForcedName, value: number): string | null {
  const r = ANY_CONVECTION[name].range;
  if (value >= r.min && value <= r.max) return null;
  return `${r.variable} = ${value.toExponential(2)} is outside the range of ${name} (${r.min.toExponential(0)} to ${r.max === Infinity ? '∞' : r.max.toExponential(0)}); result extrapolated`;
}

/** `checkRange` on the group the correlation's range names (Ra, Re or Re·Pr with the film's real Pr). */
export function rangeWarning(name: NaturalName | ForcedName, groups: Groups): string | null {
  return checkRange(name, GROUP[ANY_CONVECTION[name].range.variable](groups));
}
