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
import { createWorkspace, type SolvedCandidate, type Workspace } from './workspace';

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

// Shared by every single-layer candidate; frozen so no reader can change it for the others.
const NO_INTERFACES = Object.freeze([]) as unknown as number[];
// The module-level caches below are memos, not state: each entry is a pure function of its key
// (an input object, held weakly), filled on first use and never changed afterwards, so no answer
// depends on what was solved before. Scratch memory for a solve lives in its workspace
// (workspace.ts); tests/unit/engine-no-module-state.test.ts holds the engine to this.
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
// with them the prepared resistance chains per geometry and pipe size (lines of one size share them;
// a chain is never changed after it is prepared).
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
 * One outside surface of a line: the prepared chains of every candidate (shared, never changed) and
 * the height and horizontal length the line gives it — they only enter the outside correlations, so
 * chains are cached by geometry and pipe size alone and each solve is handed the line's shape.
 */
interface Surface {
  chains: PreparedChain[];
  geometry: Geometry;
  heightM: number;
  lengthM: number;
}

/** The prepared chains of every candidate for one geometry and pipe size, with the line's height and length. */
function chainsFor(
  set: CandidateSet,
  geometry: Geometry,
  odM: number,
  heightM: number,
  lengthM: number,
): Surface {
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
  }
  return { chains, geometry, heightM, lengthM };
}

const solveOne = solveChain; // bound once (see surface.ts)
/**
 * Candidate i of a surface solved into `ws.solved` (read it before the next solve with `ws`); the
 * boundary temperatures are left in `ws.temps`.
 */
function solveCandidate(
  surface: Surface,
  i: number,
  layers: SolidLayer[],
  processC: number,
  a: Ambient,
  hintH: number,
  hintRatio: number,
  ws: Workspace,
): SolvedCandidate {
  const chain = surface.chains[i];
  const shape = ws.shape;
  shape.geometry = surface.geometry;
  shape.diameterM = 2 * chain.rOuter;
  shape.heightM = surface.heightM;
  shape.characteristicLengthM = surface.lengthM;
  const r = solveOne(chain, processC, a, hintH, hintRatio, ws, shape);
  let limitOk = true;
  const t = ws.temps,
    first = chain.els.length - layers.length;
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
  const out = ws.solved;
  out.Q = r.Q;
  out.Ts = r.Ts;
  out.h = r.h;
  out.ratio = r.resistanceRatio;
  out.limitOk = limitOk;
  return out;
}
/** Interface temperatures (between insulation layers) of the last solve with `ws`, of a chain like `chain`. */
function interfacesOf(chain: PreparedChain, layerCount: number, ws: Workspace): number[] {
  if (layerCount < 2) return NO_INTERFACES;
  const n = chain.els.length;
  return ws.temps.slice(n - layerCount, n - 1);
}

/**
 * Start values for candidate i of a sweep from the ones solved before it: surface coefficient and
 * resistance ratio extrapolated in total thickness — quadratically through the last three, linearly
 * through two for the third candidate (the previous values when that would not be positive).
 * `Sweep` keeps the history; `pushSweep` adds a solved candidate. Fills `ws.hint`.
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
function sweepHint(all: (Candidate | null)[], i: number, s: Sweep, ws: Workspace): Workspace['hint'] {
  const hint = ws.hint;
  hint.h = 0;
  hint.ratio = 1;
  if (i === 2) {
    hint.h = s.h1;
    hint.ratio = s.r1;
  } else if (i === 3) {
    const t0 = all[i - 2]!.totalMm,
      t1 = all[i - 1]!.totalMm,
      f = (all[i]!.totalMm - t1) / (t1 - t0);
    hint.h = s.h1 + (s.h1 - s.h2) * f;
    hint.ratio = s.r1 + (s.r1 - s.r2) * f;
  } else if (i > 3) {
    const t = all[i]!.totalMm,
      t1 = all[i - 1]!.totalMm,
      t2 = all[i - 2]!.totalMm,
      t3 = all[i - 3]!.totalMm;
    const l1 = ((t - t2) * (t - t3)) / ((t1 - t2) * (t1 - t3)),
      l2 = ((t - t1) * (t - t3)) / ((t2 - t1) * (t2 - t3)),
      l3 = ((t - t1) * (t - t2)) / ((t3 - t1) * (t3 - t2));
    hint.h = s.h1 * l1 + s.h2 * l2 + s.h3 * l3;
    hint.ratio = s.r1 * l1 + s.r2 * l2 + s.r3 * l3;
  }
  if (i > 2 && !(hint.h > 0 && hint.ratio > 0)) {
    hint.h = s.h1;
    hint.ratio = s.r1;
  }
  return hint;
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
  shell: Surface;
  top: Surface;
  bottom: Surface;
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
 * Candidate i of a vessel into `ws.solved`: heat flow as the mean flux over the bare area, surface
 * temperature the hottest part on hot service (the coldest on cold service), service limits checked
 * on every part; each part's own values into `ws.part`. The parts are independent solves; the shell
 * goes last so that `ws.temps` holds its boundary temperatures (a vessel's profile is its shell's).
 */
function solveVesselCandidate(
  v: VesselParts,
  i: number,
  layers: SolidLayer[],
  processC: number,
  a: Ambient,
  ws: Workspace,
): SolvedCandidate {
  const part = ws.part;
  // Each result is ws.solved: its values are copied out before the next part's solve overwrites it.
  const top = solveCandidate(v.top, i, layers, processC, a, 0, 1, ws);
  part.qt = top.Q;
  part.tt = top.Ts;
  let ok = top.limitOk;
  const bottom = solveCandidate(v.bottom, i, layers, processC, a, 0, 1, ws);
  part.qb = bottom.Q;
  part.tb = bottom.Ts;
  ok = ok && bottom.limitOk;
  const shell = solveCandidate(v.shell, i, layers, processC, a, 0, 1, ws);
  part.qs = shell.Q;
  part.ts = shell.Ts;
  ok = shell.limitOk && ok;
  const hot = processC >= a.airC;
  const out = ws.solved;
  out.Q = (part.qs * v.heightM + (part.qt + part.qb) * v.headM2) / v.totalM2;
  out.Ts = hot ? Math.max(part.ts, part.tt, part.tb) : Math.min(part.ts, part.tt, part.tb);
  out.limitOk = ok;
  out.h = 0;
  out.ratio = 1;
  return out;
}

export type VesselPart = 'shell' | 'top' | 'bottom';
export const VESSEL_PARTS: readonly VesselPart[] = ['shell', 'top', 'bottom'];
/** First candidate index at which each part meets a surface criterion (filled while sweeping, from `ws.part`). */
function trackParts(
  idx: (number | null)[],
  i: number,
  part: Workspace['part'],
  meets: (t: number) => boolean,
) {
  if (idx[0] === null && meets(part.ts)) idx[0] = i;
  if (idx[1] === null && meets(part.tt)) idx[1] = i;
  if (idx[2] === null && meets(part.tb)) idx[2] = i;
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
  /** The line's surface (a vessel: its shell). */
  surface: Surface;
  parts: VesselParts | null;
}
/** Candidate i of a sweep: solved from the sweep's hint (a vessel part by part), the sweep then told the result. */
function solveInSweep(
  lc: LineChains,
  i: number,
  processC: number,
  a: Ambient,
  sweep: Sweep,
  ws: Workspace,
): SolvedCandidate {
  const hint = sweepHint(lc.all, i, sweep, ws);
  const r = lc.parts
    ? solveVesselCandidate(lc.parts, i, lc.layersCache[i], processC, a, ws)
    : solveCandidate(lc.surface, i, lc.layersCache[i], processC, a, hint.h, hint.ratio, ws);
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
 * A line being decided, as every criterion's evaluator reads it: the line and its basis, the
 * candidates of its material system (bare first) already solved under the heat-loss conditions, and
 * the workspace its sweeps solve with. Evaluators add their own numbers to `results`.
 */
export interface LineScan {
  line: LineCase;
  system: MaterialSystem;
  crit: Criteria;
  /** A pipe (not a vessel, not a flat surface). */
  pipe: boolean;
  /** Cold service: the line is colder than the heat-loss air. */
  cold: boolean;
  /** The hottest the line runs (personnel protection). */
  maxC: number;
  /** The jacket's emittance (the bare candidate is solved with bare steel's). */
  emittance: number;
  lc: LineChains;
  n: number;
  results: CandidateResult[];
  /** Heat flow of each candidate under the heat-loss conditions (a vessel: the mean flux), and its surface coefficient. */
  hlQ: number[];
  hlH: number[];
  ws: Workspace;
}

/** What the line's basis is for `applies`: the criteria and the material system. */
export interface DecisionBasis {
  crit: Criteria;
  system: MaterialSystem;
}

/** A criterion judged: the first candidate index meeting it (null: none), its sentence and its own details. */
export interface Verdict {
  conditionSet: CriterionOutcome['conditionSet'];
  index: number | null;
  message: string;
  detail?: Partial<CriterionOutcome>;
}

/**
 * One criterion of the recommendation: whether the line asks for it, and its verdict over the
 * candidates (null: nothing to judge, e.g. no table row for the line). Adding a criterion is adding
 * a row to `CRITERION_EVALUATORS` (and its id to `CriterionId`).
 */
export interface CriterionEvaluator {
  id: CriterionId;
  applies(line: LineCase, basis: DecisionBasis): boolean;
  evaluate(scan: LineScan): Verdict | null;
}

const BARE_EMITTANCE = 0.8; // bare oxidised steel
const isPipeLine = (line: LineCase) => line.geometry !== 'vessel' && isPipe(line.geometry);
const hottestC = (line: LineCase) => line.maxTempC ?? line.normalTempC;
const isCold = (line: LineCase, crit: Criteria) => line.normalTempC < crit.conditions.heatLoss.airC;

/** The first candidate index for which `meets` holds, or null. */
function firstMeeting(n: number, meets: (i: number) => boolean): number | null {
  for (let i = 0; i < n; i++) if (meets(i)) return i;
  return null;
}

/**
 * A surface criterion swept under its own conditions: each candidate solved in turn (the bare one
 * with bare steel's emittance) until the first whose surface meets it — or on through every candidate
 * when the criteria ask for the whole sweep (for display; it decides nothing) — with a vessel's parts
 * tracked one by one. `record` keeps a candidate's numbers; `beforeMet` sees each candidate up to the
 * one that meets it.
 */
function sweepSurface(
  s: LineScan,
  processC: number,
  conditions: ConditionSet,
  meets: (surfaceC: number, i: number) => boolean,
  record: (i: number, r: SolvedCandidate) => void,
  beforeMet?: (i: number, r: SolvedCandidate) => void,
): { index: number | null; parts: Record<VesselPart, number | null> | undefined } {
  const a = ambientOf(conditions, s.emittance),
    bare = ambientOf(conditions, BARE_EMITTANCE);
  const sweep = newSweep();
  let index: number | null = null;
  const partIdx: (number | null)[] = [null, null, null];
  for (let i = 0; i < s.n; i++) {
    const r = solveInSweep(s.lc, i, processC, i === 0 ? bare : a, sweep, s.ws);
    record(i, r);
    if (s.lc.parts) trackParts(partIdx, i, s.ws.part, (t) => meets(t, i));
    if (index !== null) continue; // past the requirement: for display only, decides nothing
    beforeMet?.(i, r);
    if (meets(r.Ts, i)) {
      index = i;
      if (!s.crit.sweepAllCandidates) break;
    }
  }
  return { index, parts: s.lc.parts ? partsMm(partIdx, s.results) : undefined };
}

/** Personnel protection (rules.ts: every accessible surface hotter than the air): hottest air, still air, the actual jacket emittance. */
const personnelCriterion: CriterionEvaluator = {
  id: 'personnel',
  applies: (line, { crit }) =>
    personnelProtectionApplies(
      { accessible: line.accessible, hottestC: hottestC(line) },
      crit.conditions.personnel,
    ),
  evaluate(s) {
    const { crit, results } = s;
    // The limit follows the jacket's surface (ISO 13732-1 at the project's contact time, or the fixed
    // override); the bare candidate is bare steel whatever the system's jacket.
    const tl = touchLimitCached(crit, s.system.jacket);
    const limit = tl.limitC,
      bareLimit = touchLimitCached(crit, BARE_STEEL_SURFACE).limitC;
    const { index, parts } = sweepSurface(
      s,
      s.maxC,
      crit.conditions.personnel,
      (t, i) => t <= (i === 0 ? bareLimit : limit),
      (i, r) => {
        results[i].personnel = {
          surfaceC: r.Ts,
          interfacesC: interfacesOf(s.lc.surface.chains[i], s.lc.layersCache[i].length, s.ws),
        };
      },
      // A layer past its service limit at the hottest conditions rules the candidate out.
      (i, r) => {
        if (!r.limitOk) results[i].serviceLimitOk = false;
      },
    );
    const shown = Math.round(limit * 10) / 10;
    return {
      conditionSet: 'personnel',
      index,
      detail: { limitC: limit, touchSurface: tl.surface, touchBasis: tl.basis, parts },
      message:
        index === null
          ? `No standard thickness keeps the surface at or under ${shown} °C; consider a guard or cage.`
          : `Surface ≤ ${shown} °C at ${crit.conditions.personnel.airC} °C still air (touch limit for ${TOUCH_SURFACE_LABEL[tl.surface]}${Number.isFinite(tl.contactSeconds) ? `, ${tl.contactSeconds} s contact, ISO 13732-1` : ', fixed by the project'}).`,
    };
  },
};

/** Condensation control (rules.ts): surface at or above the dew (frost) point plus margin under the condensation conditions. */
const condensationCriterion: CriterionEvaluator = {
  id: 'condensation',
  applies: (line, { crit }) =>
    condensationControlApplies(
      { purposes: line.purposes, coldestC: line.normalTempC },
      crit.conditions.condensation,
      crit.dewPointMarginK,
    ),
  evaluate(s) {
    const c = s.crit.conditions.condensation;
    const th = condensationLimit(c, s.crit.dewPointMarginK);
    const need = th.needC;
    const { index, parts } = sweepSurface(
      s,
      s.line.normalTempC,
      c,
      (t) => t >= need,
      (i, r) => {
        s.results[i].condensation = { surfaceC: r.Ts };
      },
    );
    return {
      conditionSet: 'condensation',
      index,
      detail: { parts },
      message:
        index === null
          ? `No standard thickness keeps the surface above ${need.toFixed(1)} °C (${th.basis} ${th.valueC.toFixed(1)} °C + ${s.crit.dewPointMarginK} K); add a vapour-tight system and review the design conditions.`
          : `Surface ≥ ${th.basis} ${th.valueC.toFixed(1)} °C + ${s.crit.dewPointMarginK} K margin at ${c.airC} °C, ${c.relativeHumidityPct ?? 80} % RH.`,
    };
  },
};

const heatLossLimitOf = (line: LineCase, crit: Criteria) =>
  isPipeLine(line) ? crit.heatLossLimitWPerM : crit.heatLossLimitWPerM2;

/** Heat-loss limit under the heat-loss conditions, per metre of pipe or per m² of surface. */
const heatLossLimitCriterion: CriterionEvaluator = {
  id: 'heatLossLimit',
  applies: (line, { crit }) =>
    heatLossLimitOf(line, crit) !== undefined &&
    (line.purposes.includes('heatConservation') || line.purposes.includes('processControl')),
  evaluate(s) {
    const limit = heatLossLimitOf(s.line, s.crit)!;
    const unit = s.pipe ? 'W/m' : 'W/m²';
    const index = firstMeeting(s.n, (i) => Math.abs(s.hlQ[i]) <= limit);
    return {
      conditionSet: 'heatLoss',
      index,
      message:
        index === null
          ? `No standard thickness keeps the heat flow under ${limit} ${unit}.`
          : `Heat flow ≤ ${limit} ${unit}.`,
    };
  },
};

/**
 * Process temperature change along a flowing line, at the coldest design air and wind (the freeze
 * conditions) for a hot line — the worst case, not the annual mean; a cold line gains most on the
 * hottest day (the personnel conditions).
 */
const processDropCriterion: CriterionEvaluator = {
  id: 'processDrop',
  applies: (line, { crit }) =>
    line.purposes.includes('processControl') &&
    isPipeLine(line) &&
    crit.maxProcessDropK !== undefined &&
    !!line.massFlowKgPerS &&
    !!line.lengthM,
  evaluate(s) {
    const { line, crit, n, cold } = s;
    const cp = line.fluidCpJPerKgK ?? 4186;
    const pc = cold ? crit.conditions.personnel : crit.conditions.freeze;
    const a = ambientOf(pc, s.emittance),
      aBare = ambientOf(pc, BARE_EMITTANCE);
    const q = new Array<number>(n);
    const sweep = newSweep();
    for (let i = 0; i < n; i++)
      q[i] = solveInSweep(s.lc, i, line.normalTempC, i === 0 ? aBare : a, sweep, s.ws).Q;
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
    const index = firstMeeting(n, (i) => drop(i) <= crit.maxProcessDropK!);
    const where = `${pc.airC} °C air, ${pc.windMs} m/s (${cold ? 'hottest' : 'coldest'} design conditions)`;
    return {
      conditionSet: cold ? 'personnel' : 'freeze',
      index,
      message:
        index === null
          ? `No standard thickness keeps the temperature change over ${line.lengthM} m within ${crit.maxProcessDropK} K at ${where}.`
          : `Temperature change over ${line.lengthM} m ≤ ${crit.maxProcessDropK} K (${drop(index).toFixed(2)} K at ${where}).`,
    };
  },
};

/**
 * Freeze protection of a stagnant water line (ISO 12241 method): cooling to 0 °C, then freezing the
 * allowed ice fraction; the time to that fraction must reach the required hours.
 */
const freezeCriterion: CriterionEvaluator = {
  id: 'freeze',
  applies: (line, { crit }) =>
    line.purposes.includes('freezeProtection') &&
    isPipeLine(line) &&
    !!crit.freeze &&
    crit.conditions.freeze.airC < 0,
  evaluate(s) {
    const { line, lc, ws } = s;
    const f = s.crit.freeze!,
      fc = s.crit.conditions.freeze;
    const a = ambientOf(fc, s.emittance),
      aBare = ambientOf(fc, BARE_EMITTANCE);
    const ice = f.iceFractionPct ?? 0;
    const flowAt = (i: number, T: number) =>
      solveCandidate(lc.surface, i, lc.layersCache[i], T, i === 0 ? aBare : a, s.hlH[i], 1, ws).Q;
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
    let zeroH = 0,
      iceH = 0;
    const index = firstMeeting(s.n, (i) => {
      const z = toZero(i),
        t = toIce(i, z);
      if (t < f.requiredHours) return false;
      zeroH = z;
      iceH = t;
      return true;
    });
    const what = ice > 0 ? `${ice} % of the water has frozen` : 'freezing starts';
    return {
      conditionSet: 'freeze',
      index,
      detail: {
        hours: index === null ? undefined : zeroH,
        iceHours: index === null || ice === 0 ? undefined : iceH,
      },
      message:
        index === null
          ? `No standard thickness gives ${f.requiredHours} h before ${what} at ${fc.airC} °C; consider heat tracing or draining.`
          : `Stagnant water from ${f.initialWaterTempC} °C at ${fc.airC} °C air: ${zeroH.toFixed(1)} h to 0 °C${ice > 0 ? `, ${iceH.toFixed(1)} h to ${ice} % ice` : ''} (≥ ${f.requiredHours} h required, ISO 12241 method).`,
    };
  },
};

/** Energy-code minimum (ASHRAE 90.1 Table 6.8.3-1): heating and cooling piping, whatever the purposes. */
const energyCodeCriterion: CriterionEvaluator = {
  id: 'energyCode',
  applies: (line, { crit }) => crit.energyCode === 'ashrae-90.1' && isPipeLine(line),
  evaluate(s) {
    const k = cond(s.system.outer);
    const m = energyCodeMinimum({
      fluidC: s.line.normalTempC,
      outsideDiameterMm: s.line.pipeOuterDiameterMm!,
      conductivityAt: (T) => k.k(T),
    });
    if (!m) return null; // no table row for this service: nothing to judge
    const index = firstMeeting(s.n, (i) => s.results[i].totalMm >= m.minimumMm - 1e-6);
    return {
      conditionSet: 'none',
      index,
      detail: { tableMm: m.tableMm, minimumMm: m.minimumMm },
      message:
        index === null
          ? `No standard thickness reaches the ASHRAE 90.1 minimum of ${m.minimumMm.toFixed(1)} mm.`
          : `ASHRAE 90.1 Table 6.8.3-1: ${(m.tableMm / 25.4).toFixed(1)} in (${m.tableMm.toFixed(1)} mm)${m.corrected ? `, ${m.minimumMm.toFixed(1)} mm for this insulation's conductivity (footnote formula)` : ''}.`,
    };
  },
};

/**
 * Economic thickness: annualised cost over the whole series (cost curve), written onto every
 * candidate. Cold service is priced as cooling (economics.cooling); the optimum and the flat range
 * within flatRangePct of it. Runs after personnel protection, which rules candidates out.
 */
const economicCriterion: CriterionEvaluator = {
  id: 'economic',
  applies: (line) => line.purposes.includes('heatConservation'),
  evaluate(s) {
    const { line, results, n, cold } = s;
    const all = s.lc.all,
      chains = s.lc.surface.chains;
    const econ = s.crit.economics ?? DEFAULT_ECONOMICS;
    const prices = s.crit.prices ?? DEFAULT_PRICES;
    const et = energyTerms(econ, cold);
    const { crf, lf } = annuityFactors(econ);
    let econIdx: number | null = null;
    let econRange: { fromMm: number; toMm: number; optimumMm: number } | undefined;
    let best = Infinity;
    for (let i = 0; i < all.length; i++) {
      const inst = all[i]
        ? installedCost(line, all[i]!, 2 * chains[i].rOuter, prices, s.system.jacket.id)
        : 0;
      const energy = ((Math.abs(s.hlQ[i]) * econ.hoursPerYear) / 1000) * et.pricePerKWh * et.boughtPerHeat;
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
    return {
      conditionSet: 'heatLoss',
      index: econIdx,
      detail: { range: econRange },
      message: `Lowest annualised cost (${(crf * 100).toFixed(1)} %/yr capital recovery, ${econ.hoursPerYear} h/yr${cold && econ.cooling ? `, cooling at COP ${econ.cooling.cop}` : ''}).${rangeText}`,
    };
  },
};

/**
 * The criteria of a recommendation, in the order their outcomes are listed (and judged: personnel
 * protection rules out candidates whose layers pass their service limit before the economic
 * criterion prices them).
 */
export const CRITERION_EVALUATORS: readonly CriterionEvaluator[] = [
  personnelCriterion,
  condensationCriterion,
  heatLossLimitCriterion,
  processDropCriterion,
  freezeCriterion,
  energyCodeCriterion,
  economicCriterion,
];

/** The heat-loss sweep every line gets: each candidate solved under the heat-loss conditions, bare first. */
interface HeatLossSweep {
  results: CandidateResult[];
  hlQ: number[];
  hlH: number[];
  /** A vessel's parts under the heat-loss conditions: per metre of shell, per m² of each head. */
  partQ: number[][] | null;
}
/**
 * Heat-loss conditions for every candidate: the cost curve, heat-loss limit and process drop share
 * them. Each solve starts from its thinner neighbours' surface coefficient and resistance ratio
 * (from the third candidate on, extrapolated in thickness: sweepHint).
 */
function sweepHeatLoss(
  lc: LineChains,
  layersOut: CandidateSet['layersOut'],
  processC: number,
  hlBare: Ambient,
  hlAmb: Ambient,
  ws: Workspace,
): HeatLossSweep {
  const { all, layersCache } = lc;
  const chains = lc.surface.chains;
  const n = all.length;
  const hlQ = new Array<number>(n),
    hlH = new Array<number>(n);
  const partQ: number[][] | null = lc.parts
    ? [new Array<number>(n), new Array<number>(n), new Array<number>(n)]
    : null;
  const results: CandidateResult[] = new Array(n);
  const sweep = newSweep();
  for (let i = 0; i < n; i++) {
    const r = solveInSweep(lc, i, processC, i === 0 ? hlBare : hlAmb, sweep, ws);
    hlQ[i] = r.Q;
    hlH[i] = r.h;
    if (partQ) {
      partQ[0][i] = ws.part.qs;
      partQ[1][i] = ws.part.qt;
      partQ[2][i] = ws.part.qb;
    }
    // Every field present from the start: one object shape for all candidates (the optional ones stay
    // undefined unless a criterion fills them, and JSON leaves them out).
    results[i] = {
      totalMm: all[i]?.totalMm ?? 0,
      layers: layersOut[i], // shared, read-only
      heatLoss: {
        heatFlow: r.Q,
        surfaceC: r.Ts,
        interfacesC: interfacesOf(chains[i], layersCache[i].length, ws),
      },
      personnel: undefined,
      condensation: undefined,
      annualCost: undefined,
      installedCost: undefined,
      energyCostPerYear: undefined,
      serviceLimitOk: r.limitOk,
    };
  }
  return { results, hlQ, hlH, partQ };
}

/** Each criterion the line asks for, judged over the candidates (`CRITERION_EVALUATORS`, in order). */
function judgeCriteria(scan: LineScan): CriterionOutcome[] {
  const basis: DecisionBasis = { crit: scan.crit, system: scan.system };
  const outcomes: CriterionOutcome[] = [];
  for (const criterion of CRITERION_EVALUATORS) {
    if (!criterion.applies(scan.line, basis)) continue;
    const v = criterion.evaluate(scan);
    if (!v) continue;
    outcomes.push({
      id: criterion.id,
      conditionSet: v.conditionSet,
      requiredMm: v.index === null ? null : scan.results[v.index].totalMm,
      ...v.detail,
      message: v.message,
    });
  }
  return outcomes;
}

/**
 * The recommendation: the largest requirement, on a candidate whose layers stay within their limits
 * (-1: none). An unmet criterion's message becomes a warning.
 */
function chooseCandidate(
  outcomes: CriterionOutcome[],
  results: CandidateResult[],
  warnings: string[],
): { governing: CriterionId | null; index: number } {
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
  let index = -1;
  for (let i = 0; i < results.length; i++)
    if (results[i].totalMm >= need && (i === 0 || results[i].serviceLimitOk)) {
      index = i;
      break;
    }
  if (index < 0) {
    warnings.push(
      'No candidate keeps every layer within its service temperature; choose another material system.',
    );
  }
  return { governing, index };
}

/** What the line and its system say about themselves: service ratings, nothing to decide, steam plausibility. */
function lineWarnings(s: LineScan, outcomeCount: number, warnings: string[]) {
  const { line, system, cold, maxC } = s;
  if (!cold && maxC > system.outer.maxServiceC && !system.inner)
    warnings.push(
      `${system.outer.name} is rated to ${system.outer.maxServiceC} °C; the line runs at ${maxC} °C. Add a higher-temperature inner layer.`,
    );
  if (cold && line.normalTempC < system.outer.minServiceC)
    warnings.push(`${system.outer.name} is rated down to ${system.outer.minServiceC} °C only.`);
  if (outcomeCount === 0) warnings.push('No criterion applies to this line: nothing requires insulation.');
  if (line.steamPressureMPaAbs) {
    // Plausibility (IAPWS-IF97): saturated steam at the stated pressure has one temperature.
    const sat = saturatedSteamAtPressure(line.steamPressureMPaAbs).temperatureC;
    if (line.normalTempC < sat - 1)
      warnings.push(
        `The line is at ${line.normalTempC} °C, ${(sat - line.normalTempC).toFixed(1)} K below the saturation temperature of steam at its pressure (${sat.toFixed(1)} °C, IAPWS-IF97): check the temperature or the pressure.`,
      );
  }
}

/** A vessel's parts at their own thicknesses: each part's heat flux per m² of its bare area, and the mean. */
function vesselPartsSummary(
  parts: VesselParts,
  partQ: number[][],
  outcomes: CriterionOutcome[],
  results: CandidateResult[],
  diameterM: number,
): Recommendation['vesselParts'] {
  const d = vesselPartDecisions(outcomes, results);
  const at = (mm: number | null) => (mm === null ? -1 : results.findIndex((x) => x.totalMm === mm));
  const is = at(d.shell.recommendedMm),
    it = at(d.top.recommendedMm),
    ib = at(d.bottom.recommendedMm);
  const shellM2PerM = Math.PI * diameterM; // bare shell area per metre of its length
  return {
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

/**
 * Recommendation for one line: evaluates the candidates of its material system under each
 * criterion's own conditions (`CRITERION_EVALUATORS`) and returns the smallest that meets every
 * hard criterion the line needs and is at least the economic optimum (when heat conservation is
 * asked for), naming the governing criterion. A criterion no candidate can meet is said so
 * explicitly. `ws` is the solve's scratch memory (a fresh one per call when not given).
 */
export function recommendLine(
  line: LineCase,
  system: MaterialSystem,
  crit: Criteria,
  ws: Workspace = createWorkspace(),
): Recommendation {
  const vessel = line.geometry === 'vessel';
  // A vessel's shell: a vertical cylinder, or a horizontal one when the vessel lies.
  const geometry: Geometry =
    line.geometry === 'vessel'
      ? line.vesselOrientation === 'horizontal'
        ? 'horizontal-pipe'
        : 'vertical-pipe'
      : line.geometry;
  const pipe = isPipeLine(line);
  const base = {
    geometry,
    pipeOuterDiameterM: (line.pipeOuterDiameterMm ?? 0) / 1000,
    heightM: line.heightM ?? 1,
    characteristicLengthM: line.characteristicLengthM ?? 1,
  };
  const emittance = system.jacket.emittance;
  const maxC = hottestC(line);
  const cold = isCold(line, crit);
  const set = candidatesFor(system, Math.max(maxC, line.normalTempC), Math.min(maxC, line.normalTempC));
  const { all, layersCache } = set;
  const parts = vessel
    ? vesselPartsFor(set, base.pipeOuterDiameterM, base.heightM, line.vesselOrientation === 'horizontal')
    : null;
  const surface = parts
    ? parts.shell
    : chainsFor(set, base.geometry, base.pipeOuterDiameterM, base.heightM, base.characteristicLengthM);
  const lc: LineChains = { all, layersCache, surface, parts };

  const hlAmb = ambientOf(crit.conditions.heatLoss, emittance),
    hlBare = ambientOf(crit.conditions.heatLoss, BARE_EMITTANCE);
  const { results, hlQ, hlH, partQ } = sweepHeatLoss(lc, set.layersOut, line.normalTempC, hlBare, hlAmb, ws);
  const n = all.length;
  const scan: LineScan = { line, system, crit, pipe, cold, maxC, emittance, lc, n, results, hlQ, hlH, ws };
  const outcomes = judgeCriteria(scan);

  const warnings: string[] = [];
  const { governing, index: recIdx } = chooseCandidate(outcomes, results, warnings);
  lineWarnings(scan, outcomes.length, warnings);

  // The design solved in full at the recommendation, under the heat-loss conditions.
  const rec = recIdx >= 0 ? results[recIdx] : null;
  const design =
    recIdx >= 0
      ? solvePrepared(
          surface.chains[recIdx],
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
          ws,
        )
      : undefined;
  if (design) for (const w of design.warnings) if (!warnings.includes(w)) warnings.push(w);
  const extent = pipe ? (line.lengthM ?? 1) : parts ? parts.totalM2 : (line.areaM2 ?? 1);
  // A vessel's design profile is its shell's; its heat flow is the mean flux over shell and heads.
  const designFlow = design ? (parts ? hlQ[recIdx] : design.heatFlow) : 0;
  const econ = crit.economics ?? DEFAULT_ECONOMICS;
  const et = energyTerms(econ, cold);
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
    vesselParts:
      parts && partQ
        ? vesselPartsSummary(parts, partQ, outcomes, results, base.pipeOuterDiameterM)
        : undefined,
    warnings,
  };
}
