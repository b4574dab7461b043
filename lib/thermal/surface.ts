import { filmAt } from './air';
// Constants repeated here (not imported) because these run in the innermost loop.
const GRAVITY = 9.80665,
  KELVIN = 273.15,
  STEFAN_BOLTZMANN = 5.670374419e-8;
import {
  FORCED_CONVECTION,
  NATURAL_CONVECTION,
  rangeWarning,
  type ForcedCorrelation,
  type ForcedName,
  type NaturalCorrelation,
  type NaturalName,
} from './correlations';
import { createWorkspace, type Workspace } from './workspace';
// The inner loop's imports bound once to local constants: module loaders and bundlers reach an
// import through an accessor on every use, which the hottest calls should not pay (measured).
const film = filmAt;

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

/** Which of the outside shape's lengths a correlation is scaled by. */
type LengthScale = 'diameterM' | 'heightM' | 'characteristicLengthM';

/**
 * The correlations for each outside shape, by registry name, and the length each is scaled by.
 * On a horizontal plate buoyancy assists when a hot surface faces up (or a cold one down) and
 * opposes otherwise, so the natural correlation depends on whether the surface is hotter than the
 * air. This table is the one place a shape meets its correlations; `convection` looks the names up
 * in the registries.
 */
export const SURFACE_CORRELATIONS: Record<
  Geometry,
  {
    naturalWhenHotter: NaturalName;
    naturalWhenColder: NaturalName;
    naturalLength: LengthScale;
    forced: ForcedName;
    forcedLength: LengthScale;
  }
> = {
  'horizontal-pipe': {
    naturalWhenHotter: 'horizontal-cylinder-churchill-chu',
    naturalWhenColder: 'horizontal-cylinder-churchill-chu',
    naturalLength: 'diameterM',
    forced: 'crossflow-cylinder-churchill-bernstein',
    forcedLength: 'diameterM',
  },
  'vertical-pipe': {
    naturalWhenHotter: 'vertical-plate-churchill-chu',
    naturalWhenColder: 'vertical-plate-churchill-chu',
    naturalLength: 'heightM',
    forced: 'crossflow-cylinder-churchill-bernstein',
    forcedLength: 'diameterM',
  },
  'vertical-wall': {
    naturalWhenHotter: 'vertical-plate-churchill-chu',
    naturalWhenColder: 'vertical-plate-churchill-chu',
    naturalLength: 'heightM',
    forced: 'flat-plate-average',
    forcedLength: 'heightM',
  },
  'horizontal-wall-up': {
    naturalWhenHotter: 'horizontal-plate-assisted-lloyd-moran',
    naturalWhenColder: 'horizontal-plate-opposed-mcadams',
    naturalLength: 'characteristicLengthM',
    forced: 'flat-plate-average',
    forcedLength: 'characteristicLengthM',
  },
  'horizontal-wall-down': {
    naturalWhenHotter: 'horizontal-plate-opposed-mcadams',
    naturalWhenColder: 'horizontal-plate-assisted-lloyd-moran',
    naturalLength: 'characteristicLengthM',
    forced: 'flat-plate-average',
    forcedLength: 'characteristicLengthM',
  },
};

/**
 * The table above with its names looked up in the registries once, at load: the inner loop then
 * reads the entries from one object per shape instead of looking names up on every call.
 */
interface Plan {
  whenHotter: NaturalName;
  whenColder: NaturalName;
  naturalHotter: NaturalCorrelation;
  naturalColder: NaturalCorrelation;
  naturalLength: (s: OuterShape) => number;
  forcedName: ForcedName;
  forced: ForcedCorrelation;
  forcedLength: (s: OuterShape) => number;
}
const LENGTH: Record<LengthScale, (s: OuterShape) => number> = {
  diameterM: (s) => s.diameterM,
  heightM: (s) => s.heightM,
  characteristicLengthM: (s) => s.characteristicLengthM,
};
function planFor(g: Geometry): Plan {
  const u = SURFACE_CORRELATIONS[g];
  return {
    whenHotter: u.naturalWhenHotter,
    whenColder: u.naturalWhenColder,
    naturalHotter: NATURAL_CONVECTION[u.naturalWhenHotter],
    naturalColder: NATURAL_CONVECTION[u.naturalWhenColder],
    naturalLength: LENGTH[u.naturalLength],
    forcedName: u.forced,
    forced: FORCED_CONVECTION[u.forced],
    forcedLength: LENGTH[u.forcedLength],
  };
}
const PLANS = {
  'horizontal-pipe': planFor('horizontal-pipe'),
  'vertical-pipe': planFor('vertical-pipe'),
  'vertical-wall': planFor('vertical-wall'),
  'horizontal-wall-up': planFor('horizontal-wall-up'),
  'horizontal-wall-down': planFor('horizontal-wall-down'),
} satisfies Record<Geometry, Plan>;

export interface ConvectionDetail {
  h: number;
  natural: NaturalName;
  ra: number;
  hNatural: number;
  forced?: ForcedName;
  re?: number;
  hForced?: number;
  /** Prandtl number of the air at the film temperature. */
  pr: number;
}

/**
 * Convective coefficient at surface temperature Ts (°C), W/(m²·K): natural and forced terms
 * combined as h = (h_forced³ + h_natural³)^(1/3) (Churchill's cube rule, common for mixed convection);
 * air properties at the film temperature.
 */
export function convectionDetail(
  shape: OuterShape,
  TsC: number,
  amb: Ambient,
  ws: Workspace = createWorkspace(),
): ConvectionDetail {
  const all: ConvectionDetail = {
    h: 0,
    natural: 'horizontal-cylinder-churchill-chu',
    ra: 0,
    hNatural: 0,
    pr: 0,
  };
  convection(shape, TsC, amb, ws, all);
  const d: ConvectionDetail = {
    h: all.h,
    natural: all.natural,
    ra: all.ra,
    hNatural: all.hNatural,
    pr: all.pr,
  };
  if (all.forced) {
    d.forced = all.forced;
    d.re = all.re;
    d.hForced = all.hForced;
  }
  return d;
}

/**
 * Hot-path form of `convectionDetail`: the coefficient only, with no allocation when a workspace is
 * given (which then also holds the flux slope, `ws.convectiveSlope`).
 */
export function convectiveCoefficient(
  shape: OuterShape,
  TsC: number,
  amb: Ambient,
  ws: Workspace = createWorkspace(),
): number {
  return convection(shape, TsC, amb, ws, null);
}

/**
 * The one implementation behind both forms: film properties from the tabulated formulas (`filmAt`,
 * into `ws.film`), the registry correlations through their Prandtl-factor forms. Fills `detail` when
 * given, and always `ws.convectiveSlope`: d(h·ΔT)/dTs estimated at fixed air properties — a first
 * derivative for the solver's Newton step, which then follows the secant.
 */
function convection(
  shape: OuterShape,
  TsC: number,
  amb: Ambient,
  ws: Workspace,
  detail: ConvectionDetail | null,
): number {
  const dT = TsC - amb.airC;
  const plan = PLANS[shape.geometry];
  const hotter = dT > 0;
  const air = film(0.5 * (TsC + amb.airC) + KELVIN, ws.film);
  const L = plan.naturalLength(shape);
  const ra = (GRAVITY * air.beta * Math.abs(dT) * L * L * L * air.pr) / (air.nu * air.nu);
  let nuN = 0,
    m = 0; // m = d ln Nu / d ln Ra of the natural correlation
  if (ra > 0) {
    const natural = hotter ? plan.naturalHotter : plan.naturalColder;
    nuN = natural.atFilm(ra, air);
    m = natural.slope(ra, nuN);
  }
  const hN = (nuN * air.k) / L;
  let h = hN,
    re = 0,
    hF = 0;
  // Slope estimate of the convective flux h·ΔT with respect to Ts at fixed air properties: the
  // natural term grows as ΔT^m, the forced term not at all, combined by the cube rule.
  let dq = hN * (1 + m);
  if (amb.windMs > 0) {
    const Lf = plan.forcedLength(shape);
    re = (amb.windMs * Lf) / air.nu;
    hF = (plan.forced.atFilm(re, air) * air.k) / Lf;
    const hN3 = hN * hN * hN;
    h = Math.cbrt(hF * hF * hF + hN3);
    dq = h + (hN3 / (h * h)) * m;
  }
  ws.convectiveSlope = dq;
  if (detail) {
    detail.h = h;
    detail.natural = hotter ? plan.whenHotter : plan.whenColder;
    detail.ra = ra;
    detail.hNatural = hN;
    detail.forced = amb.windMs > 0 ? plan.forcedName : undefined;
    detail.re = amb.windMs > 0 ? re : undefined;
    detail.hForced = amb.windMs > 0 ? hF : undefined;
    detail.pr = air.pr;
  }
  return h;
}

/** Radiative flux εσ(Ts⁴ − Tsur⁴), W/m². */
export function radiativeFlux(TsC: number, amb: Ambient): number {
  const ts = TsC + KELVIN,
    tr = amb.surroundingsC + KELVIN;
  const ts2 = ts * ts,
    tr2 = tr * tr;
  return amb.emittance * STEFAN_BOLTZMANN * (ts2 * ts2 - tr2 * tr2);
}

/**
 * Heat flux leaving the surface at Ts, W/m² (negative when the surface gains heat). The solver passes
 * its workspace (no allocation; `ws.convectiveSlope` is then the slope of this evaluation).
 */
export function surfaceFlux(
  shape: OuterShape,
  TsC: number,
  amb: Ambient,
  ws: Workspace = createWorkspace(),
): number {
  if (amb.fixedCoefficientWPerM2K !== undefined) return amb.fixedCoefficientWPerM2K * (TsC - amb.airC);
  return convection(shape, TsC, amb, ws, null) * (TsC - amb.airC) + radiativeFlux(TsC, amb);
}

/** Warnings for correlations used outside their stated range at the solved surface state. */
export function surfaceWarnings(d: ConvectionDetail): string[] {
  const w: string[] = [];
  const groups = { ra: d.ra, re: d.re ?? 0, pr: d.pr };
  if (d.ra > 0) {
    const m = rangeWarning(d.natural, groups);
    if (m) w.push(m);
  }
  if (d.forced && d.re !== undefined) {
    const m = rangeWarning(d.forced, groups);
    if (m) w.push(m);
  }
  return w;
}
