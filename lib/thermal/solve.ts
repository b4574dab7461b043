import type { Conductivity } from './conductivity';
import { brentRoot } from './roots';
import {
  convectionDetail,
  isPipe,
  radiativeFlux,
  surfaceFlux,
  surfaceWarnings,
  type Ambient,
  type Geometry,
  type OuterShape,
} from './surface';
import { createWorkspace, type Workspace } from './workspace';
// The inner loop's imports bound once to local constants (see surface.ts: loaders reach an import
// through an accessor on every use).
const flux = surfaceFlux;

/** One solid layer, inside to outside. */
export interface SolidLayer {
  thicknessM: number;
  conductivity: Conductivity;
  name?: string;
  minServiceC?: number;
  maxServiceC?: number;
}

export interface SteadyCase {
  geometry: Geometry;
  /** Pipe outside diameter (bare steel), m — pipes only. */
  pipeOuterDiameterM: number;
  heightM: number;
  characteristicLengthM: number;
  processC: number;
  ambient: Ambient;
  /** Insulation layers, innermost first; empty for a bare surface. */
  layers: SolidLayer[];
  /** Optional inside film coefficient, W/(m²·K); omitted = inner surface at the process temperature. */
  innerFilmWPerM2K?: number;
  /** Optional pipe or vessel wall inside the given outside diameter. */
  wall?: { thicknessM: number; conductivity: Conductivity };
}

export interface OverallCoefficient {
  /** W/(m·K) per metre of pipe (pipes only). */
  perLengthWPerMK?: number;
  /** Referred to the outermost surface: U_o = Q / (A_o·(T_process − T_air)). */
  outerSurface: { valueWPerM2K: number; diameterM?: number };
  /** Referred to the innermost (process-side) surface: U_i = Q / (A_i·ΔT). Not interchangeable with U_o. */
  innerSurface: { valueWPerM2K: number; diameterM?: number };
}

export interface SteadyResult {
  /** W/m for pipes, W/m² for flat surfaces; positive from the process to the surroundings. */
  heatFlow: number;
  surfaceC: number;
  /** Temperatures between insulation layers, inner to outer (layers − 1 values). */
  interfacesC: number[];
  /** Every boundary from the process side to the outside surface (for the profile). */
  profileC: { radiusOrDepthM: number; tempC: number }[];
  convectiveWPerM2K: number;
  /** Radiative flux ÷ (Ts − T_air). */
  radiativeWPerM2K: number;
  outerDiameterM?: number;
  overall: OverallCoefficient;
  warnings: string[];
  iterations: number;
}

export interface Element {
  film: boolean;
  factor: number;
  cond: Conductivity | undefined;
  r1: number;
  r2: number;
}

/** Builds the resistance chain: inner film, wall, layers — each with its geometric factor. */
// One constructor so every element has the same hidden class (monomorphic access in the loops).
function el(film: boolean, factor: number, cond: Conductivity | undefined, r1: number, r2: number): Element {
  return { film, factor, cond, r1, r2 };
}

function buildChain(c: SteadyCase) {
  const pipe = isPipe(c.geometry);
  const els: Element[] = [];
  const wallT = c.wall?.thicknessM ?? 0;
  let r = pipe ? c.pipeOuterDiameterM / 2 - wallT : 0; // for walls r is the depth from the process face
  const rInner = r;
  if (c.innerFilmWPerM2K) {
    els.push(
      el(true, pipe ? 1 / (c.innerFilmWPerM2K * 2 * Math.PI * r) : 1 / c.innerFilmWPerM2K, undefined, r, r),
    );
  }
  const solids = c.wall ? [{ thicknessM: wallT, conductivity: c.wall.conductivity }, ...c.layers] : c.layers;
  for (const l of solids) {
    const r2 = r + l.thicknessM;
    els.push(el(false, pipe ? Math.log(r2 / r) / (2 * Math.PI) : l.thicknessM, l.conductivity, r, r2));
    r = r2;
  }
  return { els, rInner, rOuter: r, pipe };
}

/** Temperature after each element for a heat flow Q; NaN when a conductivity model cannot carry it. */
function march(els: Element[], Tp: number, Q: number, out?: { [i: number]: number }): number {
  let T = Tp;
  for (let i = 0; i < els.length; i++) {
    const e = els[i];
    T = e.film ? T - Q * e.factor : e.cond!.solveOut(T, Q * e.factor);
    if (out) out[i] = T;
    if (T !== T) return NaN;
  }
  return T;
}

/**
 * Surface temperature for a heat flow Q, and dTs/dQ along the chain into `ws.dTsdQ`: from
 * ∫k dT = Q·f per element, k(T_in)·dT_in − k(T_out)·dT_out = f·dQ.
 */
function marchSlope(els: Element[], Tp: number, Q: number, ws: Workspace): number {
  let T = Tp,
    d = 0;
  for (let i = 0; i < els.length; i++) {
    const e = els[i];
    if (e.film) {
      T -= Q * e.factor;
      d -= e.factor;
      continue;
    }
    const kin = e.cond!.k(T);
    const Tout = e.cond!.solveOut(T, Q * e.factor);
    if (Tout !== Tout) return NaN;
    d = (kin * d - e.factor) / e.cond!.k(Tout);
    T = Tout;
  }
  ws.dTsdQ = d;
  return T;
}

/**
 * Root of g(Q) = A·q_out(Ts(Q)) − Q, which has the sign of the heat flow at Q = 0 and the opposite
 * sign at the bare-surface flow Q_b = A·q_out(T_process) (the surface law is monotone in Ts and Ts
 * falls with Q). Newton steps with the exact conduction slope dTs/dQ and a surface-flux slope that
 * starts from the correlations' own slope estimate (`ws.convectiveSlope`) + 4εσT³ and then follows the
 * secant, kept inside a shrinking bracket [0, Q_b] and replaced by bisection whenever they would
 * leave it; Brent's method takes over in the rare case this has not converged, so the answer always
 * exists. Q_b is evaluated only when a step needs the far end of the bracket (one surface evaluation
 * saved per solve); the tolerance is relative to the heat flow itself. The answer goes into
 * `ws.heatQ` and `ws.heatIterations`.
 */
function solveHeatFlow(
  els: Element[],
  Tp: number,
  sgn: number,
  area: number,
  shape: OuterShape,
  amb: Ambient,
  guess: number,
  ws: Workspace,
): void {
  let lo = 0,
    hi = sgn * Infinity; // g(lo) has the sign sgn, g(hi) the opposite (or zero)
  let Qb = NaN; // evaluated on demand (no closure: this is the hot path)
  let Q = guess;
  if (!(guess * sgn > 0 && Number.isFinite(guess))) {
    Qb = area * flux(shape, Tp, amb, ws);
    hi = Qb;
    Q = 0.5 * Qb;
  }
  const tol = Math.abs(Q) * 1e-7;
  let prevTs = NaN,
    prevFlux = NaN;
  for (let it = 1; it <= 40; it++) {
    const Ts = marchSlope(els, Tp, Q, ws);
    if (Ts !== Ts) {
      hi = Q;
      Q = 0.5 * (lo + hi);
      continue;
    }
    const dTsdQ = ws.dTsdQ;
    const q = flux(shape, Ts, amb, ws);
    const g = area * q - Q;
    if (Math.abs(g) <= tol) {
      ws.heatQ = Q;
      ws.heatIterations = it;
      return;
    }
    if (g * sgn > 0) lo = Q;
    else hi = Q;
    let dflux: number;
    if (amb.fixedCoefficientWPerM2K !== undefined) dflux = amb.fixedCoefficientWPerM2K;
    else if (prevTs === prevTs && Math.abs(Ts - prevTs) > 1e-9 * (1 + Math.abs(Ts)))
      dflux = (q - prevFlux) / (Ts - prevTs); // secant on the surface law
    else {
      const t = Ts + 273.15;
      dflux = ws.convectiveSlope + 4 * amb.emittance * 5.670374419e-8 * t * t * t; // σ inlined: hot loop
    }
    prevTs = Ts;
    prevFlux = q;
    const dg = area * dflux * dTsdQ - 1; // negative
    let next = Q - g / dg;
    if (!((next - lo) * sgn > 0 && (hi - next) * sgn > 0)) {
      if (Qb !== Qb) {
        Qb = area * flux(shape, Tp, amb, ws);
        if ((hi - Qb) * sgn > 0) hi = Qb;
      }
      next = 0.5 * (lo + hi);
    }
    if (Math.abs(next - Q) <= tol) {
      ws.heatQ = next;
      ws.heatIterations = it;
      return;
    }
    Q = next;
  }
  const b = Qb === Qb ? Qb : area * flux(shape, Tp, amb, ws);
  const g = (q: number) => {
    const t = march(els, Tp, q);
    return t === t ? area * flux(shape, t, amb, ws) - q : -b;
  };
  const r = brentRoot(g, 0, b, b, g(b), Math.abs(b) * 1e-10);
  ws.heatQ = r.x;
  ws.heatIterations = 40 + r.iterations;
}

/**
 * A case's resistance chain and outside shape, prepared once and solved under many conditions.
 * Never changed after `prepareChain`: a solve writes only into its workspace, so a cached chain can
 * serve any number of solves.
 */
export interface PreparedChain {
  els: Element[];
  /** The same chain with neighbouring layers of one material merged (their ∫k dT composes), for iterating. */
  fast: Element[];
  rInner: number;
  rOuter: number;
  pipe: boolean;
  shape: OuterShape;
  /** Outside area per metre (pipes) or per m² (flat). */
  area: number;
}

export function prepareChain(c: Omit<SteadyCase, 'processC' | 'ambient'>): PreparedChain {
  const { els, rInner, rOuter, pipe } = buildChain(c as SteadyCase);
  const shape: OuterShape = {
    geometry: c.geometry,
    diameterM: 2 * rOuter,
    heightM: c.heightM,
    characteristicLengthM: c.characteristicLengthM,
  };
  const fast: Element[] = [];
  for (const e of els) {
    const last = fast[fast.length - 1];
    if (last && !e.film && !last.film && last.cond === e.cond) {
      fast[fast.length - 1] = el(
        false,
        pipe ? Math.log(e.r2 / last.r1) / (2 * Math.PI) : last.factor + e.factor,
        e.cond,
        last.r1,
        e.r2,
      );
    } else fast.push(e);
  }
  return {
    els,
    fast,
    rInner,
    rOuter,
    pipe,
    shape,
    area: pipe ? 2 * Math.PI * rOuter : 1,
  };
}

/**
 * What a solve returns, and what a neighbouring solve can start from: the combined surface
 * coefficient h and the ratio of the true conduction resistance to its k-at-mean-temperature
 * estimate.
 */
export interface ChainSolution {
  Q: number;
  Ts: number;
  iterations: number;
  h: number;
  resistanceRatio: number;
}

/**
 * The numerical core: heat flow Q and surface temperature for a prepared chain. Leaves the boundary
 * temperatures in `ws.temps` (the first `chain.els.length` entries). With a workspace from the caller
 * it allocates nothing: the returned object is `ws.solution`, valid until the next solve with that
 * workspace (copy what you keep). `hintH` / `hintRatio` come from a neighbouring solve (e.g. the
 * previous thickness); 0 and 1 mean none. `shape` is the outside surface when the caller solves the
 * chain for another height or horizontal length than it was prepared with (the chain's own otherwise).
 */
export function solveChain(
  chain: PreparedChain,
  processC: number,
  amb: Ambient,
  hintH = 0,
  hintRatio = 1,
  ws: Workspace = createWorkspace(),
  shape: OuterShape = chain.shape,
): ChainSolution {
  const ratio = hintRatio > 0 ? hintRatio : 1;
  const els = chain.els,
    fast = chain.fast,
    area = chain.area;
  const Tp = processC;
  const out = ws.solution;
  if (ws.temps.length < els.length) for (let i = ws.temps.length; i < els.length; i++) ws.temps.push(0);
  // The sign of the heat flow is the sign of the outside loss at the process temperature; it is
  // plain when the process is hotter (or colder) than both the air and the surroundings.
  const dA = Tp - amb.airC,
    dR = Tp - amb.surroundingsC;
  let sgn =
    amb.fixedCoefficientWPerM2K !== undefined || amb.emittance === 0
      ? Math.sign(dA)
      : dA > 0 && dR >= 0
        ? 1
        : dA < 0 && dR <= 0
          ? -1
          : Math.sign(surfaceFlux(shape, Tp, amb, ws));
  if (dA === 0 && (dR === 0 || amb.emittance === 0 || amb.fixedCoefficientWPerM2K !== undefined)) sgn = 0;
  let Q = 0,
    iterations = 0,
    Rc = 0,
    h0 = 5;
  if (els.length === 0) Q = sgn === 0 ? 0 : area * surfaceFlux(shape, Tp, amb, ws);
  else if (sgn !== 0) {
    // First guess: series resistances, k at the mean of process and air, and the surface coefficient
    // either hinted by the caller or evaluated 15 % of the way up.
    const Tm = 0.5 * (Tp + amb.airC);
    h0 = hintH;
    if (!(h0 > 0)) {
      const Ts0 = amb.airC + 0.15 * (Tp - amb.airC);
      h0 = Ts0 !== amb.airC ? surfaceFlux(shape, Ts0, amb, ws) / (Ts0 - amb.airC) : 0;
      if (!(h0 > 0)) h0 = 5;
    }
    for (let i = 0; i < fast.length; i++) {
      const e = fast[i];
      Rc += e.film ? e.factor : e.factor / e.cond!.k(Tm);
    }
    solveHeatFlow(fast, Tp, sgn, area, shape, amb, (Tp - amb.airC) / (Rc * ratio + 1 / (h0 * area)), ws);
    Q = ws.heatQ;
    iterations = ws.heatIterations;
  }
  const Ts = els.length ? march(els, Tp, Q, ws.temps) : Tp;
  const dTs = Ts - amb.airC;
  out.Q = Q;
  out.Ts = Ts;
  out.iterations = iterations;
  out.h = dTs !== 0 && Q !== 0 ? Q / area / dTs : h0;
  out.resistanceRatio = Q !== 0 && Rc > 0 ? (Tp - Ts) / Q / Rc : 1;
  return out;
}

/**
 * The highest / lowest temperature insulation layer i sees, from the boundary temperatures `temps`
 * of a solve of the chain (`ws.temps` right after `solveChain`).
 */
export function layerFaceTemps(
  chain: PreparedChain,
  temps: ArrayLike<number>,
  processC: number,
  layerCount: number,
  i: number,
): [number, number] {
  const first = chain.els.length - layerCount;
  const hot = first + i - 1 >= 0 ? temps[first + i - 1] : processC;
  const cold = temps[first + i];
  return hot > cold ? [hot, cold] : [cold, hot];
}

/**
 * Steady heat flow through concentric cylindrical (or flat) layers with temperature-dependent
 * conductivity, to an outside surface losing heat by convection and radiation.
 * Method: ASTM C680 / ISO 12241 — each layer's flow is S·∫k dT (Kirchhoff transform, exact for the
 * given k(T)); the heat flow Q is found by a bracketed Newton iteration on [0, Q_bare-at-T_process],
 * where the residual (outside loss at the marched surface temperature − Q) is monotone. One Q passes
 * every layer by construction, so the energy balance closes at every interface.
 */
export function solveSteady(
  c: SteadyCase,
  hintCoefficientWPerM2K?: number,
  ws: Workspace = createWorkspace(),
): SteadyResult {
  return solvePrepared(prepareChain(c), c, hintCoefficientWPerM2K, ws);
}

/**
 * `solveSteady` on a chain prepared from the same case's sizes and layers; the outside surface's
 * height and horizontal length are the case's (a cached chain may have been prepared with others).
 */
export function solvePrepared(
  chain: PreparedChain,
  c: SteadyCase,
  hintCoefficientWPerM2K?: number,
  ws: Workspace = createWorkspace(),
): SteadyResult {
  const { els, rInner, rOuter, pipe } = chain;
  const shape: OuterShape = {
    geometry: c.geometry,
    diameterM: 2 * rOuter,
    heightM: c.heightM,
    characteristicLengthM: c.characteristicLengthM,
  };
  const Tp = c.processC;
  const { Q, Ts, iterations } = solveChain(chain, Tp, c.ambient, hintCoefficientWPerM2K ?? 0, 1, ws, shape);
  const temps = ws.temps.slice(0, els.length);

  const warnings: string[] = [];
  const detail =
    c.ambient.fixedCoefficientWPerM2K === undefined ? convectionDetail(shape, Ts, c.ambient, ws) : undefined;
  if (detail) warnings.push(...surfaceWarnings(detail));
  const dTs = Ts - c.ambient.airC;
  const hConv = detail ? detail.h : c.ambient.fixedCoefficientWPerM2K!;
  const hRad = detail && dTs !== 0 ? radiativeFlux(Ts, c.ambient) / dTs : 0;

  // Profile and interfaces (insulation layers only; the wall and film come first in the chain).
  const first = els.length - c.layers.length;
  const profileC = [{ radiusOrDepthM: rInner, tempC: Tp }];
  for (const [i, e] of els.entries()) profileC.push({ radiusOrDepthM: e.r2, tempC: temps[i] });
  const interfacesC = c.layers.slice(0, -1).map((_, i) => temps[first + i]);
  c.layers.forEach((l, i) => {
    const [hi, lo] = layerFaceTemps(chain, temps, Tp, c.layers.length, i);
    const label = l.name ?? `layer ${i + 1}`;
    if (l.maxServiceC !== undefined && hi > l.maxServiceC + 1e-9)
      warnings.push(
        `${label}: ${hi.toFixed(1)} °C exceeds its maximum service temperature of ${l.maxServiceC} °C`,
      );
    if (l.minServiceC !== undefined && lo < l.minServiceC - 1e-9)
      warnings.push(
        `${label}: ${lo.toFixed(1)} °C is below its minimum service temperature of ${l.minServiceC} °C`,
      );
  });

  const dT = Tp - c.ambient.airC;
  const u = dT === 0 ? 0 : Q / dT;
  const overall: OverallCoefficient = pipe
    ? {
        perLengthWPerMK: u,
        outerSurface: { valueWPerM2K: u / (2 * Math.PI * rOuter), diameterM: 2 * rOuter },
        innerSurface: { valueWPerM2K: u / (2 * Math.PI * rInner), diameterM: 2 * rInner },
      }
    : { outerSurface: { valueWPerM2K: u }, innerSurface: { valueWPerM2K: u } };

  return {
    heatFlow: Q,
    surfaceC: Ts,
    interfacesC,
    profileC,
    convectiveWPerM2K: hConv,
    radiativeWPerM2K: hRad,
    outerDiameterM: pipe ? 2 * rOuter : undefined,
    overall,
    warnings,
    iterations,
  };
}
