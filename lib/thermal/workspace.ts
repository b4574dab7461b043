import type { FilmProperties } from './air';
import type { ChainSolution } from './solve';
import type { OuterShape } from './surface';

/**
 * The scratch memory of one solve, passed down the calls explicitly instead of living in module
 * variables. The engine's hot loops allocate nothing: each level writes its intermediate values into
 * the workspace it was handed and the caller reads them right after the call, before the next call
 * with the same workspace overwrites them. Whoever starts a solve makes one (`createWorkspace()`), or
 * the exported entry points make a fresh one per call when none is given; a workspace belongs to one
 * call chain at a time and is never shared between callers that interleave.
 *
 * One factory makes every workspace, so the hot loops always see objects of one shape.
 */
export interface Workspace {
  /** air.ts `filmAt`: air properties at the last film temperature. */
  film: FilmProperties;
  /** surface.ts: d(h·ΔT)/dTs of the last convection evaluation (air properties held), W/(m²·K). */
  convectiveSlope: number;
  /** solve.ts: dTs/dQ along the chain of the last slope march. */
  dTsdQ: number;
  /** solve.ts: heat flow and iterations of the last root search. */
  heatQ: number;
  heatIterations: number;
  /** solve.ts `solveChain`: what it returns (valid until the next solve with this workspace). */
  solution: ChainSolution;
  /** solve.ts `solveChain`: boundary temperatures after each element of the last chain solved (the first `els.length` entries). */
  temps: number[];
  /** The outside surface of the chain being solved, when the caller sets it per line (recommend.ts). */
  shape: OuterShape;
  /** recommend.ts: one candidate solved (a vessel: its parts combined). */
  solved: SolvedCandidate;
  /** recommend.ts: start values for the next candidate of a sweep. */
  hint: { h: number; ratio: number };
  /** recommend.ts: a vessel candidate's parts — heat flow per m of shell or m² of head, surface °C. */
  part: { qs: number; qt: number; qb: number; ts: number; tt: number; tb: number };
}

/** One candidate solved: heat flow, surface temperature, what the next solve starts from, service limits. */
export interface SolvedCandidate {
  Q: number;
  Ts: number;
  h: number;
  ratio: number;
  limitOk: boolean;
}

export function createWorkspace(): Workspace {
  return {
    film: { k: 0, nu: 0, pr: 0, fCyl: 0, fPlate: 0, fCb: 0, beta: 0 },
    convectiveSlope: 0,
    dTsdQ: 0,
    heatQ: 0,
    heatIterations: 0,
    solution: { Q: 0, Ts: 0, iterations: 0, h: 0, resistanceRatio: 1 },
    temps: new Array<number>(16).fill(0),
    shape: { geometry: 'horizontal-pipe', diameterM: 0, heightM: 0, characteristicLengthM: 0 },
    solved: { Q: 0, Ts: 0, h: 0, ratio: 1, limitOk: true },
    hint: { h: 0, ratio: 1 },
    part: { qs: 0, qt: 0, qb: 0, ts: 0, tt: 0, tb: 0 },
  };
}
