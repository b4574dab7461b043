import { filmAt } from './air';
// Constants repeated here (not imported) because these run in the innermost loop.
const GRAVITY = 9.80665,
  KELVIN = 273.15,
  STEFAN_BOLTZMANN = 5.670374419e-8;
import {
  checkRange,
  nusseltCrossflowCylinderChurchillBernsteinWithFactor,
  nusseltFlatPlateAverage,
  nusseltHorizontalCylinderChurchillChuWithFactor,
  nusseltHorizontalPlateAssistedLloydMoran,
  nusseltHorizontalPlateOpposedMcAdams,
  nusseltVerticalPlateChurchillChuWithFactor,
  type ForcedName,
  type NaturalName,
} from './correlations';
// The inner loop's imports bound once to local constants: module loaders and bundlers reach an
// import through an accessor on every use, which the hottest calls should not pay (measured).
const film = filmAt;
const nuCb = nusseltCrossflowCylinderChurchillBernsteinWithFactor,
  nuFlat = nusseltFlatPlateAverage;
const nuCyl = nusseltHorizontalCylinderChurchillChuWithFactor,
  nuPlate = nusseltVerticalPlateChurchillChuWithFactor;
const nuUp = nusseltHorizontalPlateAssistedLloydMoran,
  nuDown = nusseltHorizontalPlateOpposedMcAdams;

export type Geometry =
  | 'horizontal-pipe'
  | 'vertical-pipe'
  | 'vertical-wall'
  | 'horizontal-wall-up'
  | 'horizontal-wall-down';
export const GEOMETRIES: Geometry[] = [
  'horizontal-pipe',
  'vertical-pipe',
  'vertical-wall',
  'horizontal-wall-up',
  'horizontal-wall-down',
];
export const isPipe = (g: Geometry) => g === 'horizontal-pipe' || g === 'vertical-pipe';

/** The outside surface: shape and the length scales the correlations need, in metres. */
export interface OuterShape {
  geometry: Geometry;
  /** Outside diameter of the outermost surface (pipes). */
  diameterM: number;
  /** Height (vertical pipe and vertical wall). */
  heightM: number;
  /** Area/perimeter of a horizontal surface. */
  characteristicLengthM: number;
}

/** The conditions around the surface. */
export interface Ambient {
  airC: number;
  /** Mean radiant temperature of the surroundings. */
  surroundingsC: number;
  windMs: number;
  emittance: number;
  /** A prescribed total surface coefficient (convection + radiation), W/(m²·K), when a specification sets one. */
  fixedCoefficientWPerM2K?: number;
}

interface Choice {
  natural: NaturalName;
  naturalLength: number;
  forced: ForcedName;
  forcedLength: number;
}

const CHOICE: Choice = {
  natural: 'horizontal-cylinder-churchill-chu',
  naturalLength: 0,
  forced: 'crossflow-cylinder-churchill-bernstein',
  forcedLength: 0,
};
/** Correlations and length scales for the shape (filled into one scratch object: this runs in the inner loop). */
function choose(shape: OuterShape, hotter: boolean): Choice {
  const c = CHOICE;
  switch (shape.geometry) {
    case 'horizontal-pipe':
      c.natural = 'horizontal-cylinder-churchill-chu';
      c.naturalLength = shape.diameterM;
      c.forced = 'crossflow-cylinder-churchill-bernstein';
      c.forcedLength = shape.diameterM;
      break;
    case 'vertical-pipe':
      c.natural = 'vertical-plate-churchill-chu';
      c.naturalLength = shape.heightM;
      c.forced = 'crossflow-cylinder-churchill-bernstein';
      c.forcedLength = shape.diameterM;
      break;
    case 'vertical-wall':
      c.natural = 'vertical-plate-churchill-chu';
      c.naturalLength = shape.heightM;
      c.forced = 'flat-plate-average';
      c.forcedLength = shape.heightM;
      break;
    case 'horizontal-wall-up':
      c.natural = hotter ? 'horizontal-plate-assisted-lloyd-moran' : 'horizontal-plate-opposed-mcadams';
      c.naturalLength = shape.characteristicLengthM;
      c.forced = 'flat-plate-average';
      c.forcedLength = shape.characteristicLengthM;
      break;
    case 'horizontal-wall-down':
      c.natural = hotter ? 'horizontal-plate-opposed-mcadams' : 'horizontal-plate-assisted-lloyd-moran';
      c.naturalLength = shape.characteristicLengthM;
      c.forced = 'flat-plate-average';
      c.forcedLength = shape.characteristicLengthM;
      break;
  }
  return c;
}

export interface ConvectionDetail {
  h: number;
  natural: NaturalName;
  ra: number;
  hNatural: number;
  forced?: ForcedName;
  re?: number;
  hForced?: number;
}

/**
 * Convective coefficient at surface temperature Ts (°C), W/(m²·K): natural and forced terms
 * combined as h = (h_forced³ + h_natural³)^(1/3) (Churchill's cube rule, common for mixed convection);
 * air properties at the film temperature.
 */
export function convectionDetail(shape: OuterShape, TsC: number, amb: Ambient): ConvectionDetail {
  convection(shape, TsC, amb, DETAIL);
  const d: ConvectionDetail = {
    h: DETAIL.h,
    natural: DETAIL.natural,
    ra: DETAIL.ra,
    hNatural: DETAIL.hNatural,
  };
  if (DETAIL.forced) {
    d.forced = DETAIL.forced;
    d.re = DETAIL.re;
    d.hForced = DETAIL.hForced;
  }
  return d;
}

/** Hot-path form of `convectionDetail`: the coefficient only, with no allocation. */
export function convectiveCoefficient(shape: OuterShape, TsC: number, amb: Ambient): number {
  return convection(shape, TsC, amb, null);
}

const DETAIL: ConvectionDetail = { h: 0, natural: 'horizontal-cylinder-churchill-chu', ra: 0, hNatural: 0 };

/**
 * The one implementation behind both forms: film properties from the tabulated formulas (`filmAt`),
 * the registry correlations through their Prandtl-factor forms. Fills `detail` when given.
 */
function convection(shape: OuterShape, TsC: number, amb: Ambient, detail: ConvectionDetail | null): number {
  const dT = TsC - amb.airC;
  const c = choose(shape, dT > 0);
  const air = film(0.5 * (TsC + amb.airC) + KELVIN);
  const L = c.naturalLength;
  const ra = (GRAVITY * air.beta * Math.abs(dT) * L * L * L * air.pr) / (air.nu * air.nu);
  let nuN = 0,
    m = 0; // m = d ln Nu / d ln Ra of the natural correlation
  if (ra > 0) {
    switch (c.natural) {
      case 'horizontal-cylinder-churchill-chu':
        nuN = nuCyl(ra, air.fCyl);
        m = (1 - 0.6 / Math.sqrt(nuN)) / 3;
        break;
      case 'vertical-plate-churchill-chu':
        nuN = nuPlate(ra, air.fPlate);
        m = (1 - 0.825 / Math.sqrt(nuN)) / 3;
        break;
      case 'horizontal-plate-assisted-lloyd-moran':
        nuN = nuUp(ra);
        m = ra <= 1e7 ? 0.25 : 1 / 3;
        break;
      case 'horizontal-plate-opposed-mcadams':
        nuN = nuDown(ra);
        m = 0.25;
        break;
    }
  }
  const hN = (nuN * air.k) / L;
  let h = hN,
    re = 0,
    hF = 0;
  // Slope estimate of the convective flux h·ΔT with respect to Ts at fixed air properties: the
  // natural term grows as ΔT^m, the forced term not at all, combined by the cube rule.
  let dq = hN * (1 + m);
  if (amb.windMs > 0) {
    re = (amb.windMs * c.forcedLength) / air.nu;
    const nuF =
      c.forced === 'crossflow-cylinder-churchill-bernstein' ? nuCb(re, air.fCb) : nuFlat(re, air.pr);
    hF = (nuF * air.k) / c.forcedLength;
    const hN3 = hN * hN * hN;
    h = Math.cbrt(hF * hF * hF + hN3);
    dq = h + (hN3 / (h * h)) * m;
  }
  CONVECTIVE_SLOPE.value = dq;
  if (detail) {
    detail.h = h;
    detail.natural = c.natural;
    detail.ra = ra;
    detail.hNatural = hN;
    detail.forced = amb.windMs > 0 ? c.forced : undefined;
    detail.re = amb.windMs > 0 ? re : undefined;
    detail.hForced = amb.windMs > 0 ? hF : undefined;
  }
  return h;
}

/**
 * d(h·ΔT)/dTs estimated by the last convection evaluation (air properties held at their film
 * values) — a first derivative for the solver's Newton step, which then follows the secant.
 */
export const CONVECTIVE_SLOPE = { value: 0 };

/** Radiative flux εσ(Ts⁴ − Tsur⁴), W/m². */
export function radiativeFlux(TsC: number, amb: Ambient): number {
  const ts = TsC + KELVIN,
    tr = amb.surroundingsC + KELVIN;
  const ts2 = ts * ts,
    tr2 = tr * tr;
  return amb.emittance * STEFAN_BOLTZMANN * (ts2 * ts2 - tr2 * tr2);
}

/** Heat flux leaving the surface at Ts, W/m² (negative when the surface gains heat). */
export function surfaceFlux(shape: OuterShape, TsC: number, amb: Ambient): number {
  if (amb.fixedCoefficientWPerM2K !== undefined) return amb.fixedCoefficientWPerM2K * (TsC - amb.airC);
  return convectiveCoefficient(shape, TsC, amb) * (TsC - amb.airC) + radiativeFlux(TsC, amb);
}

/** Warnings for correlations used outside their stated range at the solved surface state. */
export function surfaceWarnings(d: ConvectionDetail): string[] {
  const w: string[] = [];
  if (d.ra > 0) {
    const m = checkRange(d.natural, d.ra);
    if (m) w.push(m);
  }
  if (d.forced && d.re !== undefined) {
    const m = checkRange(d.forced, d.forced === 'crossflow-cylinder-churchill-bernstein' ? d.re * 0.7 : d.re);
    if (m) w.push(m);
  }
  return w;
}
