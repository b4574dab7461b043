import { compileConductivity, type Conductivity } from './conductivity';
import { designConductivitySpec } from './design-conductivity';
import {
  capitalRecoveryFactor,
  energyTerms,
  labourPerMFor,
  levelisingFactor,
  DEFAULT_ECONOMICS,
  DEFAULT_PRICES,
  type Economics,
  type PriceModel,
} from './economics';
import type { InsulationMaterial, Jacket } from './materials';
import { condensationControlApplies, condensationLimit, personnelProtectionApplies } from './rules';
import {
  prepareChain,
  solveChain,
  solvePrepared,
  type PreparedChain,
  type SolidLayer,
  type SteadyResult,
} from './solve';
import { condensateKgPerHour, saturatedSteamAtPressure } from './steam';
import { isPipe, type Ambient, type Geometry } from './surface';
import { buildCandidates, type Candidate, type SeriesOptions } from './thickness';
import { pipeByOutsideDiameter } from './pipes';
import { energyCodeMinimum } from './energy-code';
import { TOUCH_SURFACE_LABEL, touchLimitFor, type TouchLimit, type TouchSurface } from './touch';

export interface ConditionSet {
  airC: number;
  surroundingsC?: number;
  windMs: number;
  relativeHumidityPct?: number;
}

export type Purpose =
  | 'heatConservation'
  | 'personnelProtection'
  | 'condensationControl'
  | 'processControl'
  | 'freezeProtection';
export type CriterionId =
  | 'personnel'
  | 'condensation'
  | 'heatLossLimit'
  | 'processDrop'
  | 'freeze'
  | 'energyCode'
  | 'economic';

export interface LineCase {
  /**
   * "vessel": a vertical cylindrical shell (diameter `pipeOuterDiameterMm`, height `heightM`) with two
   * flat heads, solved part by part; its heat flow is the mean flux over the bare outside area (W/m²)
   * and its surface temperature the worst of the three parts.
   */
  geometry: Geometry | 'vessel';
  /** A vessel's axis: vertical (default; heads on top and bottom) or horizontal (shell lying, two upright heads). */
  vesselOrientation?: 'vertical' | 'horizontal';
  pipeOuterDiameterMm?: number;
  /** Height of a vertical pipe or wall; a vessel's shell length along its axis (its height when vertical). */
  heightM?: number;
  /** Pipe wall for the heat capacity of a stagnant line (freeze time); Schedule 40 / STD when not given. */
  pipeWallMm?: number;
  /** The line's fittings, when the line list gives them (installed cost per item instead of an allowance). */
  fittings?: { elbows: number; tees: number; valves: number; flangePairs: number };
  characteristicLengthM?: number;
  /** Pipe length (pipes) or area (flat), for totals. */
  lengthM?: number;
  areaM2?: number;
  normalTempC: number;
  /** For personnel protection; defaults to the normal temperature. */
  maxTempC?: number;
  steamPressureMPaAbs?: number;
  massFlowKgPerS?: number;
  fluidCpJPerKgK?: number;
  purposes: Purpose[];
  /** Surface within reach of people; personnel protection applies only then. */
  accessible?: boolean;
}

export interface Criteria {
  conditions: {
    heatLoss: ConditionSet;
    personnel: ConditionSet;
    condensation: ConditionSet;
    freeze: ConditionSet;
  };
  /** Fixed touch limits (an explicit override): used only when `touchContactSeconds` is not set. */
  touchLimitMetalC: number;
  touchLimitNonMetalC: number;
  /**
   * Contact time (s) the touch limit follows from: the ISO 13732-1 burn threshold of the jacket's
   * surface (touch.ts). Unset: the fixed numbers above.
   */
  touchContactSeconds?: number;
  dewPointMarginK: number;
  heatLossLimitWPerM?: number;
  heatLossLimitWPerM2?: number;
  maxProcessDropK?: number;
  /** Stagnant water: starting temperature, hours required, and the ice fraction allowed by then (0: none, time to 0 °C). */
  freeze?: { initialWaterTempC: number; requiredHours: number; iceFractionPct?: number };
  economics?: Economics;
  prices?: PriceModel;
  /** An energy code whose minimum pipe insulation is a hard criterion (energy-code.ts). */
  energyCode?: 'ashrae-90.1';
  /**
   * Solve every candidate under the personnel and condensation conditions, not only up to the first
   * that meets the criterion (the product shows each candidate's numbers; the benchmark and the
   * CLI leave it off). The recommendation is the same either way.
   */
  sweepAllCandidates?: boolean;
}

export interface MaterialSystem {
  outer: InsulationMaterial;
  inner?: InsulationMaterial;
  jacket: Jacket;
  series?: Partial<SeriesOptions>;
}

export interface CandidateResult {
  totalMm: number;
  layers: { materialId: string; thicknessMm: number }[];
  heatLoss: { heatFlow: number; surfaceC: number; interfacesC: number[] };
  personnel?: { surfaceC: number; interfacesC: number[] };
  condensation?: { surfaceC: number };
  annualCost?: number;
  installedCost?: number;
  energyCostPerYear?: number;
  serviceLimitOk: boolean;
}

export interface CriterionOutcome {
  id: CriterionId;
  /** Smallest total thickness (mm) meeting it; 0 = bare is enough; null = no candidate meets it. */
  requiredMm: number | null;
  message: string;
  /** Freeze protection: hours for the stagnant water to cool to 0 °C at the required thickness. */
  hours?: number;
  /** Freeze protection: hours until the allowed ice fraction has frozen (cooling included). */
  iceHours?: number;
  /** Economic: the optimum and the thicknesses whose annual cost is within the flat range of it. */
  range?: { fromMm: number; toMm: number; optimumMm: number };
  /** Energy code: the table thickness and the minimum after the conductivity correction, mm. */
  tableMm?: number;
  minimumMm?: number;
  /** Vessels, surface criteria: the thickness each part needs by its own surface (shell, top and bottom heads; a lying vessel's two ends as top and bottom). */
  parts?: Record<VesselPart, number | null>;
  /** Personnel: the touch limit held to, the surface class and the standard it follows (touch.ts). */
  limitC?: number;
  touchSurface?: TouchSurface;
  touchBasis?: string;
  /** The condition set the criterion is judged under (`none` for a table minimum). */
  conditionSet?: ConditionSetId | 'none';
}

/** The design basis's condition sets: annual heat loss, personnel (hottest air), condensation, coldest design air. */
export type ConditionSetId = 'heatLoss' | 'personnel' | 'condensation' | 'freeze';

export interface Recommendation {
  recommendedMm: number | null;
  /** Criteria that no candidate meets (the recommendation meets the others). */
  unmet: CriterionId[];
  layers: { materialId: string; thicknessMm: number }[];
  governing: CriterionId | null;
  outcomes: CriterionOutcome[];
  candidates: CandidateResult[];
  /** The solved design at the recommendation, under the heat-loss conditions. */
  design?: SteadyResult;
  /** Annual energy lost, its cost and CO₂ (energy bought × the source's factor), with the source and its emission scope. */
  annual?: {
    energyMWh: number;
    cost: number;
    co2Tonnes: number;
    source: string;
    scope: 'Scope 1' | 'Scope 2';
  };
  condensateKgPerHour?: number;
  /**
   * Vessels: shell and heads decided per part (each meeting its criteria), with each part's heat flux
   * per m² of its bare area and the vessel's mean flux at those thicknesses, heat-loss conditions.
   */
  vesselParts?: {
    shell: VesselPartDecision & { heatFluxWPerM2: number | null };
    top: VesselPartDecision & { heatFluxWPerM2: number | null };
    bottom: VesselPartDecision & { heatFluxWPerM2: number | null };
    meanFluxWPerM2: number | null;
    /** Each candidate's heat flux per m² of each part's bare area, heat-loss conditions: [shell, top, bottom] by candidate index. */
    candidateFluxesWPerM2: [number, number, number][];
  };
  warnings: string[];
}

const NO_INTERFACES: number[] = [];
const compiled = new WeakMap<InsulationMaterial, Conductivity>();
function cond(m: InsulationMaterial): Conductivity {
  let c = compiled.get(m);
  if (!c) {
    c = compileConductivity(designConductivitySpec(m));
    compiled.set(m, c);
  }
  return c;
}

// Candidates depend only on the material system and whether an inner layer is needed: cached, and
// with them the prepared resistance chains per outside shape (lines of one size share them).
interface CandidateSet {
  all: (Candidate | null)[];
  layersCache: SolidLayer[][];
  layersOut: { materialId: string; thicknessMm: number }[][];
  /** Prepared chains by geometry, then by pipe outside diameter (m; 0 for flat surfaces). */
  chains: Map<string, Map<number, PreparedChain[]>>;
}
const candidateCache = new WeakMap<MaterialSystem, Map<string, CandidateSet>>();
function candidatesFor(system: MaterialSystem, hotFaceC: number, coldFaceC: number): CandidateSet {
  const needInner =
    !!system.inner && (hotFaceC > system.outer.maxServiceC || coldFaceC < system.outer.minServiceC);
  let m = candidateCache.get(system);
  if (!m) {
    m = new Map();
    candidateCache.set(system, m);
  }
  const key = needInner ? 'inner' : 'single';
  let v = m.get(key);
  if (!v) {
    const cands = buildCandidates({
      outer: system.outer,
      inner: system.inner,
      hotFaceC,
      coldFaceC,
      series: system.series,
    });
    const all: (Candidate | null)[] = [null, ...cands]; // index 0 = bare
    v = {
      all,
      layersCache: all.map((c) => (c ? layersOf(c) : [])),
      layersOut: all.map((c) =>
        c ? c.layers.map((l) => ({ materialId: l.material.id, thicknessMm: l.thicknessMm })) : [],
      ),
      chains: new Map(),
    };
    m.set(key, v);
  }
  return v;
}

const MAX_SIZES_PER_SET = 256;
/**
 * The prepared chains of every candidate for one geometry and pipe size. The height and the
 * horizontal-surface length only enter the outside correlations, so they are set on the cached
 * chains' shapes for the line being solved (solving is synchronous; nothing else holds them).
 */
function chainsFor(
  set: CandidateSet,
  geometry: Geometry,
  odM: number,
  heightM: number,
  lengthM: number,
): PreparedChain[] {
  // Number keys: building a string key from the diameter cost more than the lookup (measured).
  let bySize = set.chains.get(geometry);
  if (!bySize) {
    bySize = new Map();
    set.chains.set(geometry, bySize);
  }
  const size = isPipe(geometry) ? odM : 0;
  let chains = bySize.get(size);
  if (!chains) {
    if (bySize.size >= MAX_SIZES_PER_SET) bySize.clear();
    chains = set.layersCache.map((layers) =>
      prepareChain({ geometry, pipeOuterDiameterM: odM, heightM, characteristicLengthM: lengthM, layers }),
    );
    bySize.set(size, chains);
  } else if (chains[0].shape.heightM !== heightM || chains[0].shape.characteristicLengthM !== lengthM) {
    for (let i = 0; i < chains.length; i++) {
      chains[i].shape.heightM = heightM;
      chains[i].shape.characteristicLengthM = lengthM;
    }
  }
  return chains;
}

/** One candidate solved: heat flow, surface temperature, what the next solve starts from, service limits (shared scratch). */
const SOLVED = { Q: 0, Ts: 0, h: 0, ratio: 1, limitOk: true };
const solveOne = solveChain; // bound once (see surface.ts)
function solveCandidate(
  chain: PreparedChain,
  layers: SolidLayer[],
  processC: number,
  a: Ambient,
  hintH: number,
  hintRatio: number,
): typeof SOLVED {
  const r = solveOne(chain, processC, a, hintH, hintRatio);
  let limitOk = true;
  const t = chain.temps,
    first = t.length - layers.length;
  for (let j = 0; j < layers.length; j++) {
    const x = first + j - 1 >= 0 ? t[first + j - 1] : processC,
      y = t[first + j];
    const hi = Math.max(x, y),
      lo = Math.min(x, y);
    const L = layers[j];
    if (
      (L.maxServiceC !== undefined && hi > L.maxServiceC) ||
      (L.minServiceC !== undefined && lo < L.minServiceC)
    )
      limitOk = false;
  }
  SOLVED.Q = r.Q;
  SOLVED.Ts = r.Ts;
  SOLVED.h = r.h;
  SOLVED.ratio = r.resistanceRatio;
  SOLVED.limitOk = limitOk;
  return SOLVED;
}
/** Interface temperatures of the last solve of the chain (between insulation layers). */
function interfacesOf(chain: PreparedChain, layerCount: number): number[] {
  if (layerCount < 2) return NO_INTERFACES;
  const t = chain.temps;
  return t.slice(t.length - layerCount, t.length - 1);
}

/**
 * Start values for candidate i of a sweep from the ones solved before it: surface coefficient and
 * resistance ratio extrapolated in total thickness — quadratically through the last three, linearly
 * through two for the third candidate (the previous values when that would not be positive).
 * `Sweep` keeps the history; `pushSweep` adds a solved candidate. Fills the shared HINT.
 */
interface Sweep {
  h1: number;
  h2: number;
  h3: number;
  r1: number;
  r2: number;
  r3: number;
}
const newSweep = (): Sweep => ({ h1: 0, h2: 0, h3: 0, r1: 1, r2: 1, r3: 1 });
function pushSweep(s: Sweep, h: number, r: number) {
  s.h3 = s.h2;
  s.r3 = s.r2;
  s.h2 = s.h1;
  s.r2 = s.r1;
  s.h1 = h;
  s.r1 = r;
}
const HINT = { h: 0, ratio: 1 };
function sweepHint(all: (Candidate | null)[], i: number, s: Sweep): typeof HINT {
  HINT.h = 0;
  HINT.ratio = 1;
  if (i === 2) {
    HINT.h = s.h1;
    HINT.ratio = s.r1;
  } else if (i === 3) {
    const t0 = all[i - 2]!.totalMm,
      t1 = all[i - 1]!.totalMm,
      f = (all[i]!.totalMm - t1) / (t1 - t0);
    HINT.h = s.h1 + (s.h1 - s.h2) * f;
    HINT.ratio = s.r1 + (s.r1 - s.r2) * f;
  } else if (i > 3) {
    const t = all[i]!.totalMm,
      t1 = all[i - 1]!.totalMm,
      t2 = all[i - 2]!.totalMm,
      t3 = all[i - 3]!.totalMm;
    const l1 = ((t - t2) * (t - t3)) / ((t1 - t2) * (t1 - t3)),
      l2 = ((t - t1) * (t - t3)) / ((t2 - t1) * (t2 - t3)),
      l3 = ((t - t1) * (t - t2)) / ((t3 - t1) * (t3 - t2));
    HINT.h = s.h1 * l1 + s.h2 * l2 + s.h3 * l3;
    HINT.ratio = s.r1 * l1 + s.r2 * l2 + s.r3 * l3;
  }
  if (i > 2 && !(HINT.h > 0 && HINT.ratio > 0)) {
    HINT.h = s.h1;
    HINT.ratio = s.r1;
  }
  return HINT;
}

// Capital recovery and levelising factors per economics object (the same for every line of a project).
const annuityCache = new WeakMap<Economics, { crf: number; lf: number }>();
function annuityFactors(econ: Economics): { crf: number; lf: number } {
  let v = annuityCache.get(econ);
  if (!v) {
    v = {
      crf: capitalRecoveryFactor(econ.discountRate, econ.lifeYears),
      lf: levelisingFactor(econ.discountRate, econ.escalationRate, econ.lifeYears),
    };
    annuityCache.set(econ, v);
  }
  return v;
}

/** A vessel's parts for one candidate: shell (vertical cylinder) and the two flat heads, with their bare areas. */
interface VesselParts {
  shell: PreparedChain[];
  top: PreparedChain[];
  bottom: PreparedChain[];
  heightM: number;
  headM2: number;
  totalM2: number;
}
function vesselPartsFor(
  set: CandidateSet,
  diameterM: number,
  heightM: number,
  horizontal = false,
): VesselParts {
  const headM2 = (Math.PI * diameterM * diameterM) / 4;
  if (horizontal) {
    // A lying shell is a horizontal cylinder (per metre, times its length); each head an upright disc
    // taken as a vertical wall of height D (common practice for an estimate).
    const head = chainsFor(set, 'vertical-wall', 0, diameterM, 1);
    return {
      shell: chainsFor(set, 'horizontal-pipe', diameterM, 1, 1),
      top: head,
      bottom: head,
      heightM,
      headM2,
      totalM2: Math.PI * diameterM * heightM + 2 * headM2,
    };
  }
  return {
    shell: chainsFor(set, 'vertical-pipe', diameterM, heightM, 1),
    // Heads taken as flat discs, L = area / perimeter = D/4 (common practice for an estimate).
    top: chainsFor(set, 'horizontal-wall-up', 0, 1, diameterM / 4),
    bottom: chainsFor(set, 'horizontal-wall-down', 0, 1, diameterM / 4),
    heightM,
    headM2,
    totalM2: Math.PI * diameterM * heightM + 2 * headM2,
  };
}
/**
 * Candidate i of a vessel: heat flow as the mean flux over the bare area, surface temperature the
 * hottest part on hot service (the coldest on cold service), service limits checked on every part.
 */
function solveVesselCandidate(
  v: VesselParts,
  i: number,
  layers: SolidLayer[],
  processC: number,
  a: Ambient,
): typeof SOLVED {
  const shell = solveCandidate(v.shell[i], layers, processC, a, 0, 1);
  const qs = shell.Q,
    ts = shell.Ts;
  let ok = shell.limitOk;
  const top = solveCandidate(v.top[i], layers, processC, a, 0, 1);
  const qt = top.Q,
    tt = top.Ts;
  ok = ok && top.limitOk;
  const bottom = solveCandidate(v.bottom[i], layers, processC, a, 0, 1);
  const hot = processC >= a.airC;
  const worst = hot ? Math.max(ts, tt, bottom.Ts) : Math.min(ts, tt, bottom.Ts);
  // `bottom` is the shared SOLVED object: its part values are kept before SOLVED is overwritten.
  PART.qs = qs;
  PART.qt = qt;
  PART.qb = bottom.Q;
  PART.ts = ts;
  PART.tt = tt;
  PART.tb = bottom.Ts;
  SOLVED.Q = (qs * v.heightM + (qt + bottom.Q) * v.headM2) / v.totalM2;
  SOLVED.Ts = worst;
  SOLVED.limitOk = ok && bottom.limitOk;
  SOLVED.h = 0;
  SOLVED.ratio = 1;
  return SOLVED;
}

/** The parts of the last vessel candidate solved (shared scratch, read right after the solve): heat flow per m of shell or m² of head, surface °C. */
const PART = { qs: 0, qt: 0, qb: 0, ts: 0, tt: 0, tb: 0 };

export type VesselPart = 'shell' | 'top' | 'bottom';
export const VESSEL_PARTS: readonly VesselPart[] = ['shell', 'top', 'bottom'];
/** First candidate index at which each part meets a surface criterion (filled while sweeping). */
function trackParts(idx: (number | null)[], i: number, meets: (t: number) => boolean) {
  if (idx[0] === null && meets(PART.ts)) idx[0] = i;
  if (idx[1] === null && meets(PART.tt)) idx[1] = i;
  if (idx[2] === null && meets(PART.tb)) idx[2] = i;
}

function partsMm(idx: (number | null)[], results: CandidateResult[]): Record<VesselPart, number | null> {
  return {
    shell: idx[0] === null ? null : results[idx[0]].totalMm,
    top: idx[1] === null ? null : results[idx[1]].totalMm,
    bottom: idx[2] === null ? null : results[idx[2]].totalMm,
  };
}

export interface VesselPartDecision {
  /** The thickness this part needs on its own (the surface criteria judged on its own surface; the others as the whole vessel's). */
  recommendedMm: number | null;
  governing: CriterionId | null;
  /** Criteria no thickness meets on this part (a guard or another system for it); the thickness meets the others. */
  unmet: CriterionId[];
}

/**
 * Each part of a vessel decided on its own: a surface criterion (personnel, condensation) by the
 * part's own surface (`parts` on its outcome), every other criterion as the whole vessel's
 * requirement; then the smallest candidate at or above the largest requirement whose layers stay
 * within their limits. Pure: the engine and the line page (from stored outcomes) share it.
 */
export function vesselPartDecisions(
  outcomes: readonly Pick<CriterionOutcome, 'id' | 'requiredMm' | 'parts'>[],
  candidates: readonly { totalMm: number; serviceLimitOk: boolean }[],
): Record<VesselPart, VesselPartDecision> {
  const out = {} as Record<VesselPart, VesselPartDecision>;
  for (const p of VESSEL_PARTS) {
    let need = 0,
      governing: CriterionId | null = null;
    const unmet: CriterionId[] = [];
    for (const o of outcomes) {
      const req = o.parts ? o.parts[p] : o.requiredMm;
      if (req === null) {
        unmet.push(o.id);
        continue;
      }
      if (req > need || (governing === null && req === need && need > 0)) {
        need = req;
        governing = o.id;
      }
    }
    const c = candidates.find((x, i) => x.totalMm >= need && (i === 0 || x.serviceLimitOk));
    out[p] = { recommendedMm: c ? c.totalMm : null, governing, unmet };
  }
  return out;
}

/** What one line's sweeps share: its candidates, their prepared chains, and a vessel's parts. */
interface LineChains {
  all: (Candidate | null)[];
  layersCache: SolidLayer[][];
  chains: PreparedChain[];
  parts: VesselParts | null;
}
/** Candidate i of a sweep: solved from the sweep's hint (a vessel part by part), the sweep then told the result. */
function solveInSweep(lc: LineChains, i: number, processC: number, a: Ambient, sweep: Sweep): typeof SOLVED {
  const hint = sweepHint(lc.all, i, sweep);
  const r = lc.parts
    ? solveVesselCandidate(lc.parts, i, lc.layersCache[i], processC, a)
    : solveCandidate(lc.chains[i], lc.layersCache[i], processC, a, hint.h, hint.ratio);
  pushSweep(sweep, r.h, r.ratio);
  return r;
}

// Touch limit per jacket object, kept while the touch settings stay the same (every line of a
// project; criteria objects are built per line, so they are compared by value, not identity).
const touchCache = new WeakMap<object, { s: number | undefined; m: number; n: number; t: TouchLimit }>();
function touchLimitCached(
  crit: Criteria,
  jacket: { metal: boolean; touchSurface?: TouchSurface },
): TouchLimit {
  const c = touchCache.get(jacket);
  if (
    c &&
    c.s === crit.touchContactSeconds &&
    c.m === crit.touchLimitMetalC &&
    c.n === crit.touchLimitNonMetalC
  )
    return c.t;
  const t = touchLimitFor(crit, jacket);
  touchCache.set(jacket, {
    s: crit.touchContactSeconds,
    m: crit.touchLimitMetalC,
    n: crit.touchLimitNonMetalC,
    t,
  });
  return t;
}

/** Bare steel as a touch surface: uncoated metal. */
const BARE_STEEL_SURFACE = { metal: true, touchSurface: 'bare-metal' as const };
const ambientOf = (c: ConditionSet, emittance: number): Ambient => ({
  airC: c.airC,
  surroundingsC: c.surroundingsC ?? c.airC,
  windMs: c.windMs,
  emittance,
});

function layersOf(c: Candidate): SolidLayer[] {
  return c.layers.map((l) => ({
    thicknessM: l.thicknessMm / 1000,
    conductivity: cond(l.material),
    name: l.material.name,
    minServiceC: l.material.minServiceC,
    maxServiceC: l.material.maxServiceC,
  }));
}

/** Typical wall for the heat capacity of a stagnant line: ASME B36.10M Schedule 40 up to NPS 12, 9.53 mm (STD) above. */
const SCH40_MM: Record<string, number> = {
  '1/2': 2.77,
  '3/4': 2.87,
  '1': 3.38,
  '1-1/4': 3.56,
  '1-1/2': 3.68,
  '2': 3.91,
  '2-1/2': 5.16,
  '3': 5.49,
  '3-1/2': 5.74,
  '4': 6.02,
  '5': 6.55,
  '6': 7.11,
  '8': 8.18,
  '10': 9.27,
  '12': 10.31,
};
export function typicalWallMm(odMm: number): number {
  const p = pipeByOutsideDiameter(odMm);
  if (p && SCH40_MM[p.nps]) return SCH40_MM[p.nps];
  return odMm > 323.9 ? 9.53 : Math.max(2.0, odMm * 0.05);
}

// 4-point Gauss–Legendre nodes and weights on [−1, 1].
const GL_X = [-0.8611363115940526, -0.3399810435848563, 0.3399810435848563, 0.8611363115940526];
const GL_W = [0.3478548451374538, 0.6521451548625461, 0.6521451548625461, 0.3478548451374538];

/**
 * Properties for stagnant-water freeze times by the ISO 12241 method: water 1000 kg/m³,
 * 4190 J/(kg·K), latent heat of fusion 334 kJ/kg; carbon steel 7850 kg/m³, 460 J/(kg·K)
 * (handbook values; ISO 12241 Annex B uses the same quantities).
 */
export const FREEZE_PROPERTIES = {
  waterKgPerM3: 1000,
  waterJPerKgK: 4190,
  fusionJPerKg: 334_000,
  steelKgPerM3: 7850,
  steelJPerKgK: 460,
} as const;

function pipeRadii(odMm: number, wallMm?: number) {
  const wall = wallMm ?? typicalWallMm(odMm);
  const ro = odMm / 2000,
    ri = Math.max(0, ro - wall / 1000);
  return { ro, ri };
}

/**
 * Time for stagnant water in a pipe to cool from T0 to 0 °C, hours: lumped heat capacity of water
 * and steel per metre, C′·dT/dt = −q′(T), so t = ∫₀^T0 C′ / q′(T) dT, with q′(T) re-solved at each
 * water temperature (4-point Gauss–Legendre in T). With a constant resistance this reduces to the
 * ISO 12241 exponential form t = C′·R′·ln((T0 − Ta)/(0 − Ta)). Returns Infinity when the air is not below 0 °C.
 */
export function freezeTimeHours(o: {
  odMm: number;
  wallMm?: number;
  initialC: number;
  heatFlowAt: (waterC: number) => number;
  airC: number;
}): number {
  if (o.airC >= 0) return Infinity;
  if (o.initialC <= 0) return 0;
  const { ro, ri } = pipeRadii(o.odMm, o.wallMm);
  const P = FREEZE_PROPERTIES;
  const C =
    P.waterKgPerM3 * P.waterJPerKgK * Math.PI * ri * ri +
    P.steelKgPerM3 * P.steelJPerKgK * Math.PI * (ro * ro - ri * ri); // J/(m·K)
  const half = o.initialC / 2;
  let integral = 0;
  for (let i = 0; i < 4; i++) {
    const T = half + half * GL_X[i];
    integral += GL_W[i] * (C / o.heatFlowAt(T));
  }
  return (integral * half) / 3600;
}

/**
 * Time, after the water reached 0 °C, to freeze a fraction f of it (ISO 12241 method): the latent
 * heat of that ice over the heat flow at 0 °C, t = f·ρ·A_water·h_if / q′(0 °C), hours.
 */
export function iceFractionHours(o: {
  odMm: number;
  wallMm?: number;
  iceFractionPct: number;
  heatFlowAtZeroWPerM: number;
}): number {
  if (!(o.heatFlowAtZeroWPerM > 0)) return Infinity;
  const { ri } = pipeRadii(o.odMm, o.wallMm);
  const P = FREEZE_PROPERTIES;
  return (
    ((o.iceFractionPct / 100) * P.waterKgPerM3 * Math.PI * ri * ri * P.fusionJPerKg) /
    o.heatFlowAtZeroWPerM /
    3600
  );
}

/** Outlet temperature of a flowing line: T_out = T_a + (T_in − T_a)·exp(−U'·L / (ṁ·c_p)) (ISO 12241 exponential form). */
export function outletTempC(o: {
  inletC: number;
  airC: number;
  uPerLengthWPerMK: number;
  lengthM: number;
  massFlowKgPerS: number;
  cpJPerKgK: number;
}): number {
  return (
    o.airC +
    (o.inletC - o.airC) * Math.exp((-o.uPerLengthWPerMK * o.lengthM) / (o.massFlowKgPerS * o.cpJPerKgK))
  );
}

/**
 * Installed cost per unit of the line's extent — per metre of pipe, per m² of flat surface, per m²
 * of a vessel's bare outside area (as its heat flow is): material by volume with waste, labour per
 * layer (for pipes by size band), jacketing per m² by jacket, accessories, and the fittings — from
 * the line's own counts when it gives them (per item and layer), else as an allowance. A vessel's
 * shell layers are cylinders over its height and each head's flat layers.
 */
export function installedCost(
  line: LineCase,
  cand: Candidate,
  jacketOuterM: number,
  prices: PriceModel,
  jacketId?: string,
): number {
  const vessel = line.geometry === 'vessel',
    pipe = line.geometry !== 'vessel' && isPipe(line.geometry);
  const D = (line.pipeOuterDiameterMm ?? 0) / 1000,
    H = line.heightM ?? 1;
  const head = vessel ? (Math.PI * D * D) / 4 : 0;
  const area = vessel ? Math.PI * D * H + 2 * head : 1; // the unit the cost is per
  const labourPerM = pipe
    ? labourPerMFor(prices, pipeByOutsideDiameter(line.pipeOuterDiameterMm ?? 0)?.npsInches)
    : 0;
  let r = D / 2,
    cost = 0;
  for (const l of cand.layers) {
    const t = l.thicknessMm / 1000;
    const ring = Math.PI * ((r + t) * (r + t) - r * r);
    const vol = vessel ? ring * H + 2 * head * t : pipe ? ring : t;
    cost +=
      vol * (prices.materialPerM3[l.material.id] ?? prices.defaultMaterialPerM3) * (1 + prices.wasteFraction);
    cost += pipe ? labourPerM : prices.labourPerM2PerLayer * area;
    r += t;
  }
  if (cand.layers.length) {
    const jacketRate =
      (jacketId !== undefined ? prices.jacketPerM2ById?.[jacketId] : undefined) ?? prices.jacketPerM2;
    cost += jacketRate * (vessel ? Math.PI * jacketOuterM * H + 2 * head : pipe ? Math.PI * jacketOuterM : 1);
    cost += pipe ? (prices.accessoriesPerM ?? 0) : (prices.accessoriesPerM2 ?? 0) * area;
  }
  const f = line.fittings;
  if (pipe && f && prices.fittingItem && line.lengthM && cand.layers.length) {
    const item = prices.fittingItem;
    const perLayer =
      f.elbows * item.elbow + f.tees * item.tee + f.valves * item.valve + f.flangePairs * item.flangePair;
    return cost + (perLayer * cand.layers.length) / line.lengthM;
  }
  return (cost * (1 + prices.fittingsAllowanceFraction)) / area;
}

/**
 * Recommendation for one line: evaluates the candidates of its material system under each
 * criterion's own conditions and returns the smallest that meets every hard criterion the line
 * needs and is at least the economic optimum (when heat conservation is asked for), naming the
 * governing criterion. A criterion no candidate can meet is said so explicitly.
 */
export function recommendLine(line: LineCase, system: MaterialSystem, crit: Criteria): Recommendation {
  const vessel = line.geometry === 'vessel';
  // A vessel's shell: a vertical cylinder, or a horizontal one when the vessel lies.
  const geometry: Geometry =
    line.geometry === 'vessel'
      ? line.vesselOrientation === 'horizontal'
        ? 'horizontal-pipe'
        : 'vertical-pipe'
      : line.geometry;
  const pipe = isPipe(geometry) && !vessel;
  const warnings: string[] = [];
  const bareEps = 0.8; // bare oxidised steel
  const base = {
    geometry,
    pipeOuterDiameterM: (line.pipeOuterDiameterMm ?? 0) / 1000,
    heightM: line.heightM ?? 1,
    characteristicLengthM: line.characteristicLengthM ?? 1,
  };
  const emittance = system.jacket.emittance;
  const maxC = line.maxTempC ?? line.normalTempC;
  const cold = line.normalTempC < crit.conditions.heatLoss.airC;
  const set = candidatesFor(system, Math.max(maxC, line.normalTempC), Math.min(maxC, line.normalTempC));
  const { all, layersCache, layersOut } = set;
  const n = all.length;
  const parts = vessel
    ? vesselPartsFor(set, base.pipeOuterDiameterM, base.heightM, line.vesselOrientation === 'horizontal')
    : null;
  const chains = parts
    ? parts.shell
    : chainsFor(set, base.geometry, base.pipeOuterDiameterM, base.heightM, base.characteristicLengthM);
  const lc: LineChains = { all, layersCache, chains, parts };

  const purposes = line.purposes;
  const econ = crit.economics ?? DEFAULT_ECONOMICS;
  const prices = crit.prices ?? DEFAULT_PRICES;

  // Heat-loss conditions for every candidate: the cost curve, heat-loss limit and process drop share them.
  // Each solve starts from its thinner neighbour's surface coefficient and resistance ratio.
  const hlAmb = ambientOf(crit.conditions.heatLoss, emittance),
    hlBare = ambientOf(crit.conditions.heatLoss, bareEps);
  const hlQ = new Array<number>(n),
    hlH = new Array<number>(n);
  // A vessel's parts under the heat-loss conditions: per metre of shell, per m² of each head.
  const partQ: number[][] | null = parts
    ? [new Array<number>(n), new Array<number>(n), new Array<number>(n)]
    : null;
  const results: CandidateResult[] = new Array(n);
  // From the third candidate on the hint is extrapolated in thickness from the ones before (sweepHint).
  const sweep = newSweep();
  for (let i = 0; i < n; i++) {
    const r = solveInSweep(lc, i, line.normalTempC, i === 0 ? hlBare : hlAmb, sweep);
    hlQ[i] = r.Q;
    hlH[i] = r.h;
    if (partQ) {
      partQ[0][i] = PART.qs;
      partQ[1][i] = PART.qt;
      partQ[2][i] = PART.qb;
    }
    // Every field present from the start: one object shape for all candidates (the optional ones stay
    // undefined unless a criterion fills them, and JSON leaves them out).
    results[i] = {
      totalMm: all[i]?.totalMm ?? 0,
      layers: layersOut[i], // shared, read-only
      heatLoss: {
        heatFlow: r.Q,
        surfaceC: r.Ts,
        interfacesC: interfacesOf(chains[i], layersCache[i].length),
      },
      personnel: undefined,
      condensation: undefined,
      annualCost: undefined,
      installedCost: undefined,
      energyCostPerYear: undefined,
      serviceLimitOk: r.limitOk,
    };
  }

  const outcomes: CriterionOutcome[] = [];

  // Personnel protection (rules.ts: every accessible surface hotter than the air): hottest air, still air, the actual jacket emittance.
  if (
    personnelProtectionApplies({ accessible: line.accessible, hottestC: maxC }, crit.conditions.personnel)
  ) {
    // The limit follows the jacket's surface (ISO 13732-1 at the project's contact time, or the fixed
    // override); the bare candidate is bare steel whatever the system's jacket.
    const tl = touchLimitCached(crit, system.jacket);
    const limit = tl.limitC,
      bareLimit = touchLimitCached(crit, BARE_STEEL_SURFACE).limitC;
    const a = ambientOf(crit.conditions.personnel, emittance),
      bare = ambientOf(crit.conditions.personnel, bareEps);
    const sweep = newSweep();
    let idx: number | null = null;
    const partIdx: (number | null)[] = [null, null, null];
    for (let i = 0; i < n; i++) {
      const r = solveInSweep(lc, i, maxC, i === 0 ? bare : a, sweep);
      results[i].personnel = { surfaceC: r.Ts, interfacesC: interfacesOf(chains[i], layersCache[i].length) };
      if (parts) trackParts(partIdx, i, (t) => t <= (i === 0 ? bareLimit : limit));
      if (idx !== null) continue; // past the requirement: for display only, decides nothing
      if (!r.limitOk) results[i].serviceLimitOk = false;
      if (r.Ts <= (i === 0 ? bareLimit : limit)) {
        idx = i;
        if (!crit.sweepAllCandidates) break;
      }
    }
    const shown = Math.round(limit * 10) / 10;
    outcomes.push({
      id: 'personnel',
      conditionSet: 'personnel',
      limitC: limit,
      touchSurface: tl.surface,
      touchBasis: tl.basis,
      requiredMm: idx === null ? null : results[idx].totalMm,
      parts: parts ? partsMm(partIdx, results) : undefined,
      message:
        idx === null
          ? `No standard thickness keeps the surface at or under ${shown} °C; consider a guard or cage.`
          : `Surface ≤ ${shown} °C at ${crit.conditions.personnel.airC} °C still air (touch limit for ${TOUCH_SURFACE_LABEL[tl.surface]}${Number.isFinite(tl.contactSeconds) ? `, ${tl.contactSeconds} s contact, ISO 13732-1` : ', fixed by the project'}).`,
    });
  }

  // Condensation control (rules.ts): surface at or above the dew (frost) point plus margin under the condensation conditions.
  if (
    condensationControlApplies(
      { purposes, coldestC: line.normalTempC },
      crit.conditions.condensation,
      crit.dewPointMarginK,
    )
  ) {
    const c = crit.conditions.condensation;
    const th = condensationLimit(c, crit.dewPointMarginK);
    const need = th.needC;
    const a = ambientOf(c, emittance),
      bare = ambientOf(c, bareEps);
    const sweep = newSweep();
    let idx: number | null = null;
    const partIdx: (number | null)[] = [null, null, null];
    for (let i = 0; i < n; i++) {
      const r = solveInSweep(lc, i, line.normalTempC, i === 0 ? bare : a, sweep);
      results[i].condensation = { surfaceC: r.Ts };
      if (parts) trackParts(partIdx, i, (t) => t >= need);
      if (idx !== null) continue;
      if (r.Ts >= need) {
        idx = i;
        if (!crit.sweepAllCandidates) break;
      }
    }
    outcomes.push({
      id: 'condensation',
      conditionSet: 'condensation',
      requiredMm: idx === null ? null : results[idx].totalMm,
      parts: parts ? partsMm(partIdx, results) : undefined,
      message:
        idx === null
          ? `No standard thickness keeps the surface above ${need.toFixed(1)} °C (${th.basis} ${th.valueC.toFixed(1)} °C + ${crit.dewPointMarginK} K); add a vapour-tight system and review the design conditions.`
          : `Surface ≥ ${th.basis} ${th.valueC.toFixed(1)} °C + ${crit.dewPointMarginK} K margin at ${c.airC} °C, ${c.relativeHumidityPct ?? 80} % RH.`,
    });
  }

  // Heat-loss limit.
  const limit = pipe ? crit.heatLossLimitWPerM : crit.heatLossLimitWPerM2;
  if (limit !== undefined && (purposes.includes('heatConservation') || purposes.includes('processControl'))) {
    let idx: number | null = null;
    for (let i = 0; i < n; i++)
      if (Math.abs(hlQ[i]) <= limit) {
        idx = i;
        break;
      }
    outcomes.push({
      id: 'heatLossLimit',
      conditionSet: 'heatLoss',
      requiredMm: idx === null ? null : results[idx].totalMm,
      message:
        idx === null
          ? `No standard thickness keeps the heat flow under ${limit} ${pipe ? 'W/m' : 'W/m²'}.`
          : `Heat flow ≤ ${limit} ${pipe ? 'W/m' : 'W/m²'}.`,
    });
  }

  // Process temperature change along a flowing line, at the coldest design air and wind (the freeze
  // conditions) for a hot line — the worst case, not the annual mean.
  if (
    purposes.includes('processControl') &&
    pipe &&
    crit.maxProcessDropK !== undefined &&
    line.massFlowKgPerS &&
    line.lengthM
  ) {
    const cp = line.fluidCpJPerKgK ?? 4186;
    const pc = cold ? crit.conditions.personnel : crit.conditions.freeze; // a cold line gains most on the hottest day
    const a = ambientOf(pc, emittance),
      aBare = ambientOf(pc, bareEps);
    const q = new Array<number>(n);
    const sweep = newSweep();
    for (let i = 0; i < n; i++) q[i] = solveInSweep(lc, i, line.normalTempC, i === 0 ? aBare : a, sweep).Q;
    const drop = (i: number) => {
      const u = q[i] / (line.normalTempC - pc.airC || 1);
      const out = outletTempC({
        inletC: line.normalTempC,
        airC: pc.airC,
        uPerLengthWPerMK: u,
        lengthM: line.lengthM!,
        massFlowKgPerS: line.massFlowKgPerS!,
        cpJPerKgK: cp,
      });
      return Math.abs(line.normalTempC - out);
    };
    let idx: number | null = null;
    for (let i = 0; i < n; i++)
      if (drop(i) <= crit.maxProcessDropK) {
        idx = i;
        break;
      }
    const where = `${pc.airC} °C air, ${pc.windMs} m/s (${cold ? 'hottest' : 'coldest'} design conditions)`;
    outcomes.push({
      id: 'processDrop',
      conditionSet: cold ? 'personnel' : 'freeze',
      requiredMm: idx === null ? null : results[idx].totalMm,
      message:
        idx === null
          ? `No standard thickness keeps the temperature change over ${line.lengthM} m within ${crit.maxProcessDropK} K at ${where}.`
          : `Temperature change over ${line.lengthM} m ≤ ${crit.maxProcessDropK} K (${drop(idx).toFixed(2)} K at ${where}).`,
    });
  }

  // Freeze protection of a stagnant water line (ISO 12241 method): cooling to 0 °C, then freezing
  // the allowed ice fraction; the time to that fraction must reach the required hours.
  if (purposes.includes('freezeProtection') && pipe && crit.freeze && crit.conditions.freeze.airC < 0) {
    const f = crit.freeze,
      fc = crit.conditions.freeze;
    const a = ambientOf(fc, emittance),
      aBare = ambientOf(fc, bareEps);
    const ice = f.iceFractionPct ?? 0;
    const flowAt = (i: number, T: number) =>
      solveCandidate(chains[i], layersCache[i], T, i === 0 ? aBare : a, hlH[i], 1).Q;
    const toZero = (i: number) =>
      freezeTimeHours({
        odMm: line.pipeOuterDiameterMm!,
        wallMm: line.pipeWallMm,
        initialC: f.initialWaterTempC,
        airC: fc.airC,
        heatFlowAt: (T) => flowAt(i, T),
      });
    const toIce = (i: number, zero: number) =>
      zero +
      (ice > 0
        ? iceFractionHours({
            odMm: line.pipeOuterDiameterMm!,
            wallMm: line.pipeWallMm,
            iceFractionPct: ice,
            heatFlowAtZeroWPerM: flowAt(i, 0),
          })
        : 0);
    let idx: number | null = null,
      zeroH = 0,
      iceH = 0;
    for (let i = 0; i < n; i++) {
      const z = toZero(i),
        t = toIce(i, z);
      if (t >= f.requiredHours) {
        idx = i;
        zeroH = z;
        iceH = t;
        break;
      }
    }
    const what = ice > 0 ? `${ice} % of the water has frozen` : 'freezing starts';
    outcomes.push({
      id: 'freeze',
      conditionSet: 'freeze',
      requiredMm: idx === null ? null : results[idx].totalMm,
      hours: idx === null ? undefined : zeroH,
      iceHours: idx === null || ice === 0 ? undefined : iceH,
      message:
        idx === null
          ? `No standard thickness gives ${f.requiredHours} h before ${what} at ${fc.airC} °C; consider heat tracing or draining.`
          : `Stagnant water from ${f.initialWaterTempC} °C at ${fc.airC} °C air: ${zeroH.toFixed(1)} h to 0 °C${ice > 0 ? `, ${iceH.toFixed(1)} h to ${ice} % ice` : ''} (≥ ${f.requiredHours} h required, ISO 12241 method).`,
    });
  }

  // Energy-code minimum (ASHRAE 90.1 Table 6.8.3-1): heating and cooling piping, whatever the purposes.
  if (crit.energyCode === 'ashrae-90.1' && pipe) {
    const k = cond(system.outer);
    const m = energyCodeMinimum({
      fluidC: line.normalTempC,
      outsideDiameterMm: line.pipeOuterDiameterMm!,
      conductivityAt: (T) => k.k(T),
    });
    if (m) {
      let idx: number | null = null;
      for (let i = 0; i < n; i++)
        if (results[i].totalMm >= m.minimumMm - 1e-6) {
          idx = i;
          break;
        }
      outcomes.push({
        id: 'energyCode',
        conditionSet: 'none',
        requiredMm: idx === null ? null : results[idx].totalMm,
        tableMm: m.tableMm,
        minimumMm: m.minimumMm,
        message:
          idx === null
            ? `No standard thickness reaches the ASHRAE 90.1 minimum of ${m.minimumMm.toFixed(1)} mm.`
            : `ASHRAE 90.1 Table 6.8.3-1: ${(m.tableMm / 25.4).toFixed(1)} in (${m.tableMm.toFixed(1)} mm)${m.corrected ? `, ${m.minimumMm.toFixed(1)} mm for this insulation's conductivity (footnote formula)` : ''}.`,
      });
    }
  }

  // Economic thickness: annualised cost over the whole series (cost curve). Cold service is priced
  // as cooling (economics.cooling); the optimum and the flat range within flatRangePct of it.
  let econIdx: number | null = null;
  let econRange: { fromMm: number; toMm: number; optimumMm: number } | undefined;
  const et = energyTerms(econ, cold);
  if (purposes.includes('heatConservation')) {
    const { crf, lf } = annuityFactors(econ);
    let best = Infinity;
    for (let i = 0; i < all.length; i++) {
      const inst = all[i] ? installedCost(line, all[i]!, 2 * chains[i].rOuter, prices, system.jacket.id) : 0;
      const energy = ((Math.abs(hlQ[i]) * econ.hoursPerYear) / 1000) * et.pricePerKWh * et.boughtPerHeat;
      const annual = crf * inst + lf * energy;
      const ri = results[i];
      ri.installedCost = inst;
      ri.energyCostPerYear = energy;
      ri.annualCost = annual;
      if (results[i].serviceLimitOk && annual < best) {
        best = annual;
        econIdx = i;
      }
    }
    const optimumIdx = econIdx;
    if (optimumIdx !== null) {
      const cap = best * (1 + (econ.flatRangePct ?? 2) / 100);
      let lo = optimumIdx,
        hi = optimumIdx;
      while (lo > 0 && results[lo - 1].serviceLimitOk && results[lo - 1].annualCost! <= cap) lo--;
      while (hi < n - 1 && results[hi + 1].serviceLimitOk && results[hi + 1].annualCost! <= cap) hi++;
      econRange = {
        fromMm: results[lo].totalMm,
        toMm: results[hi].totalMm,
        optimumMm: results[optimumIdx].totalMm,
      };
      if (econ.economicChoice === 'thinnest-within-range') econIdx = lo;
    }
    const rangeText = econRange
      ? ` Within ${econ.flatRangePct ?? 2} % of the minimum from ${econRange.fromMm} to ${econRange.toMm} mm (optimum ${econRange.optimumMm} mm)${econ.economicChoice === 'thinnest-within-range' ? '; the thinnest of that range is taken' : ''}.`
      : '';
    outcomes.push({
      id: 'economic',
      conditionSet: 'heatLoss',
      requiredMm: econIdx === null ? null : results[econIdx].totalMm,
      range: econRange,
      message: `Lowest annualised cost (${(crf * 100).toFixed(1)} %/yr capital recovery, ${econ.hoursPerYear} h/yr${cold && econ.cooling ? `, cooling at COP ${econ.cooling.cop}` : ''}).${rangeText}`,
    });
  }

  // The recommendation: the largest requirement, on a candidate whose layers stay within their limits.
  let governing: CriterionId | null = null,
    need = 0;
  for (const o of outcomes) {
    if (o.requiredMm === null) {
      warnings.push(o.message);
      continue;
    }
    if (o.requiredMm > need || (governing === null && o.requiredMm === need && need > 0)) {
      need = o.requiredMm;
      governing = o.id;
    }
  }
  let recIdx = -1;
  for (let i = 0; i < n; i++)
    if (results[i].totalMm >= need && (i === 0 || results[i].serviceLimitOk)) {
      recIdx = i;
      break;
    }
  if (recIdx < 0) {
    warnings.push(
      'No candidate keeps every layer within its service temperature; choose another material system.',
    );
  }
  if (!cold && maxC > system.outer.maxServiceC && !system.inner)
    warnings.push(
      `${system.outer.name} is rated to ${system.outer.maxServiceC} °C; the line runs at ${maxC} °C. Add a higher-temperature inner layer.`,
    );
  if (cold && line.normalTempC < system.outer.minServiceC)
    warnings.push(`${system.outer.name} is rated down to ${system.outer.minServiceC} °C only.`);
  if (outcomes.length === 0) warnings.push('No criterion applies to this line: nothing requires insulation.');
  if (line.steamPressureMPaAbs) {
    // Plausibility (IAPWS-IF97): saturated steam at the stated pressure has one temperature.
    const sat = saturatedSteamAtPressure(line.steamPressureMPaAbs).temperatureC;
    if (line.normalTempC < sat - 1)
      warnings.push(
        `The line is at ${line.normalTempC} °C, ${(sat - line.normalTempC).toFixed(1)} K below the saturation temperature of steam at its pressure (${sat.toFixed(1)} °C, IAPWS-IF97): check the temperature or the pressure.`,
      );
  }

  const rec = recIdx >= 0 ? results[recIdx] : null;
  const design =
    recIdx >= 0
      ? solvePrepared(
          chains[recIdx],
          {
            geometry: base.geometry,
            pipeOuterDiameterM: base.pipeOuterDiameterM,
            heightM: base.heightM,
            characteristicLengthM: base.characteristicLengthM,
            processC: line.normalTempC,
            ambient: recIdx === 0 ? hlBare : hlAmb,
            layers: layersCache[recIdx],
          },
          hlH[recIdx],
        )
      : undefined;
  if (design) for (const w of design.warnings) if (!warnings.includes(w)) warnings.push(w);
  const extent = pipe ? (line.lengthM ?? 1) : parts ? parts.totalM2 : (line.areaM2 ?? 1);
  // A vessel's design profile is its shell's; its heat flow is the mean flux over shell and heads.
  const designFlow = design ? (parts ? hlQ[recIdx] : design.heatFlow) : 0;
  let annual: Recommendation['annual'];
  if (design) {
    const heatMWh = (Math.abs(designFlow) * extent * econ.hoursPerYear) / 1e6;
    const boughtMWh = heatMWh * et.boughtPerHeat;
    annual = {
      energyMWh: heatMWh,
      cost: boughtMWh * 1000 * et.pricePerKWh,
      co2Tonnes: (boughtMWh * 1000 * et.co2KgPerKWh) / 1000,
      source: et.source,
      scope: et.scope,
    };
  }
  const unmet: CriterionId[] = [];
  for (const o of outcomes) if (o.requiredMm === null) unmet.push(o.id);
  let condensate: number | undefined;
  if (design && line.steamPressureMPaAbs) {
    condensate = condensateKgPerHour(
      designFlow * extent,
      saturatedSteamAtPressure(line.steamPressureMPaAbs).latentHeatKJPerKg,
    );
  }
  let vesselParts: Recommendation['vesselParts'];
  if (parts && partQ) {
    const d = vesselPartDecisions(outcomes, results);
    const at = (mm: number | null) => (mm === null ? -1 : results.findIndex((x) => x.totalMm === mm));
    const is = at(d.shell.recommendedMm),
      it = at(d.top.recommendedMm),
      ib = at(d.bottom.recommendedMm);
    const shellM2PerM = Math.PI * base.pipeOuterDiameterM; // bare shell area per metre of its length
    vesselParts = {
      shell: { ...d.shell, heatFluxWPerM2: is < 0 ? null : partQ[0][is] / shellM2PerM },
      top: { ...d.top, heatFluxWPerM2: it < 0 ? null : partQ[1][it] },
      bottom: { ...d.bottom, heatFluxWPerM2: ib < 0 ? null : partQ[2][ib] },
      meanFluxWPerM2:
        is < 0 || it < 0 || ib < 0
          ? null
          : (partQ[0][is] * parts.heightM + (partQ[1][it] + partQ[2][ib]) * parts.headM2) / parts.totalM2,
      candidateFluxesWPerM2: results.map((_, i) => [partQ[0][i] / shellM2PerM, partQ[1][i], partQ[2][i]]),
    };
  }
  return {
    recommendedMm: rec?.totalMm ?? null,
    unmet,
    layers: rec?.layers ?? [],
    governing,
    outcomes,
    candidates: results,
    design,
    annual,
    condensateKgPerHour: condensate,
    vesselParts,
    warnings,
  };
}
