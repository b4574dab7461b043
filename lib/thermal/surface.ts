import { AIR_SCRATCH, airConductivityAt, filmAirProperties } from './air';
// Constants repeated here (not imported) because these run in the innermost loop.
const GRAVITY = 9.80665, KELVIN = 273.15, STEFAN_BOLTZMANN = 5.670374419e-8;
import {
  checkRange, FORCED_CONVECTION, NATURAL_CONVECTION, nusseltCrossflowCylinderChurchillBernstein, nusseltFlatPlateAverage,
  nusseltHorizontalCylinderChurchillChu, nusseltHorizontalPlateAssistedLloydMoran, nusseltHorizontalPlateOpposedMcAdams,
  nusseltVerticalPlateChurchillChu, type ForcedName, type NaturalName,
} from './correlations';

export type Geometry = 'horizontal-pipe' | 'vertical-pipe' | 'vertical-wall' | 'horizontal-wall-up' | 'horizontal-wall-down';
export const GEOMETRIES: Geometry[] = ['horizontal-pipe', 'vertical-pipe', 'vertical-wall', 'horizontal-wall-up', 'horizontal-wall-down'];
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

interface Choice { natural: NaturalName; naturalLength: number; forced: ForcedName; forcedLength: number }

function choose(shape: OuterShape, hotter: boolean): Choice {
  switch (shape.geometry) {
    case 'horizontal-pipe':
      return { natural: 'horizontal-cylinder-churchill-chu', naturalLength: shape.diameterM, forced: 'crossflow-cylinder-churchill-bernstein', forcedLength: shape.diameterM };
    case 'vertical-pipe':
      return { natural: 'vertical-plate-churchill-chu', naturalLength: shape.heightM, forced: 'crossflow-cylinder-churchill-bernstein', forcedLength: shape.diameterM };
    case 'vertical-wall':
      return { natural: 'vertical-plate-churchill-chu', naturalLength: shape.heightM, forced: 'flat-plate-average', forcedLength: shape.heightM };
    case 'horizontal-wall-up':
      return { natural: hotter ? 'horizontal-plate-assisted-lloyd-moran' : 'horizontal-plate-opposed-mcadams', naturalLength: shape.characteristicLengthM, forced: 'flat-plate-average', forcedLength: shape.characteristicLengthM };
    case 'horizontal-wall-down':
      return { natural: hotter ? 'horizontal-plate-opposed-mcadams' : 'horizontal-plate-assisted-lloyd-moran', naturalLength: shape.characteristicLengthM, forced: 'flat-plate-average', forcedLength: shape.characteristicLengthM };
  }
}

export interface ConvectionDetail { h: number; natural: NaturalName; ra: number; hNatural: number; forced?: ForcedName; re?: number; hForced?: number }

/**
 * Convective coefficient at surface temperature Ts (°C), W/(m²·K): natural and forced terms
 * combined as h = (h_forced³ + h_natural³)^(1/3) (Churchill's cube rule, common for mixed convection);
 * air properties at the film temperature.
 */
export function convectionDetail(shape: OuterShape, TsC: number, amb: Ambient): ConvectionDetail {
  const dT = TsC - amb.airC;
  const c = choose(shape, dT > 0);
  const air = filmAirProperties(TsC, amb.airC);
  const L = c.naturalLength;
  const ra = (GRAVITY * air.beta * Math.abs(dT) * L * L * L * air.pr) / (air.nu * air.nu);
  const hNatural = ra > 0 ? (NATURAL_CONVECTION[c.natural](ra, air.pr) * air.k) / L : 0;
  if (!(amb.windMs > 0)) return { h: hNatural, natural: c.natural, ra, hNatural };
  const re = (amb.windMs * c.forcedLength) / air.nu;
  const hForced = (FORCED_CONVECTION[c.forced](re, air.pr) * air.k) / c.forcedLength;
  const h = Math.cbrt(hForced * hForced * hForced + hNatural * hNatural * hNatural);
  return { h, natural: c.natural, ra, hNatural, forced: c.forced, re, hForced };
}

/** Hot-path form of `convectionDetail`: the coefficient only, with no allocation. */
export function convectiveCoefficient(shape: OuterShape, TsC: number, amb: Ambient): number {
  const dT = TsC - amb.airC;
  if (dT === 0 && !(amb.windMs > 0)) return 0;
  const T = 0.5 * (TsC + amb.airC) + KELVIN;
  const k = airConductivityAt(T);
  const air = AIR_SCRATCH;
  const g = shape.geometry;
  const hot = dT > 0;
  const Ln = g === 'horizontal-pipe' ? shape.diameterM : g === 'vertical-pipe' || g === 'vertical-wall' ? shape.heightM : shape.characteristicLengthM;
  const ra = (GRAVITY * air.beta * Math.abs(dT) * Ln * Ln * Ln * air.pr) / (air.nu * air.nu);
  let nuN: number;
  if (ra <= 0) nuN = 0;
  else if (g === 'horizontal-pipe') nuN = nusseltHorizontalCylinderChurchillChu(ra, air.pr);
  else if (g === 'vertical-pipe' || g === 'vertical-wall') nuN = nusseltVerticalPlateChurchillChu(ra, air.pr);
  else nuN = (g === 'horizontal-wall-up') === hot ? nusseltHorizontalPlateAssistedLloydMoran(ra) : nusseltHorizontalPlateOpposedMcAdams(ra);
  const hN = (nuN * k) / Ln;
  if (!(amb.windMs > 0)) return hN;
  const Lf = g === 'horizontal-pipe' || g === 'vertical-pipe' ? shape.diameterM : Ln;
  const re = (amb.windMs * Lf) / air.nu;
  const nuF = Lf === shape.diameterM && (g === 'horizontal-pipe' || g === 'vertical-pipe') ? nusseltCrossflowCylinderChurchillBernstein(re, air.pr) : nusseltFlatPlateAverage(re, air.pr);
  const hF = (nuF * k) / Lf;
  return Math.cbrt(hF * hF * hF + hN * hN * hN);
}

/** Radiative flux εσ(Ts⁴ − Tsur⁴), W/m². */
export function radiativeFlux(TsC: number, amb: Ambient): number {
  const ts = TsC + KELVIN, tr = amb.surroundingsC + KELVIN;
  const ts2 = ts * ts, tr2 = tr * tr;
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
  if (d.ra > 0) { const m = checkRange(d.natural, d.ra); if (m) w.push(m); }
  if (d.forced && d.re !== undefined) {
    const m = checkRange(d.forced, d.forced === 'crossflow-cylinder-churchill-bernstein' ? d.re * 0.7 : d.re);
    if (m) w.push(m);
  }
  return w;
}
