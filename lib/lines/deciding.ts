/**
 * The numbers that decide a line's thickness, per candidate: the surface temperature under each
 * applicable criterion's own conditions (heat loss, personnel, condensation) beside its limit, and
 * the worst margin to a limit. Whether a criterion applies comes from lib/thermal/rules.ts, the
 * one home of those rules. Server-side (the engine solves candidates the sweep did not reach).
 */
import {
  compileConductivity,
  designConductivitySpec,
  condensationControlApplies,
  touchLimitFor,
  condensationLimit,
  personnelProtectionApplies,
  solveSteady,
  solveVessel,
  type Ambient,
} from '@/lib/thermal';
import { catalogueOf } from '@/lib/lines/catalogue';
import { criteriaFor, lineCaseFor } from '@/lib/lines/solve-line';
import type { DesignBasis } from '@/lib/lines/design-basis';
import type { LineInput } from '@/lib/lines/validate';
import { decodeCandidate, type CandidateRow } from '@/lib/lines/candidate-row';

export type { CandidateRow };
export { worstMargin, type Margin } from './margin';

export interface DecidingLimits {
  /** Touch limit when personnel protection applies (the system's jacket: metal or not). */
  personnelLimitC: number | null;
  /** Dew (frost) point + margin when condensation control applies. */
  condensationNeedC: number | null;
  dewPointC: number | null;
  dewBasis: 'dew point' | 'frost point' | null;
}

export interface CandidateNumbers {
  mm: number;
  heatFlow: number;
  heatLossC: number;
  personnelC: number | null;
  condensationC: number | null;
  ok: boolean;
}

type LineFacts = Pick<LineInput, 'outdoor' | 'accessible' | 'normalTempC' | 'maxTempC' | 'purposes'>;

export function decidingLimits(basis: DesignBasis, line: LineFacts, jacketId: string | null): DecidingLimits {
  const crit = criteriaFor(basis, line.outdoor);
  const jacket = jacketId ? catalogueOf(basis).jackets.get(jacketId) : undefined;
  const hot = personnelProtectionApplies(
    { accessible: line.accessible, hottestC: line.maxTempC ?? line.normalTempC },
    crit.conditions.personnel,
  );
  const cold = condensationControlApplies(
    { purposes: line.purposes, coldestC: line.normalTempC },
    crit.conditions.condensation,
    crit.dewPointMarginK,
  );
  const th = cold ? condensationLimit(crit.conditions.condensation, crit.dewPointMarginK) : null;
  return {
    personnelLimitC: hot ? touchLimitFor(crit, jacket ?? { metal: true }).limitC : null,
    condensationNeedC: th ? th.needC : null,
    dewPointC: th ? th.valueC : null,
    dewBasis: th ? th.basis : null,
  };
}

/** The candidate rows as numbers, with the temperatures the sweep did not reach solved here. */
export function candidateNumbers(
  basis: DesignBasis,
  line: LineInput,
  jacketId: string | null,
  rows: CandidateRow[],
  limits: DecidingLimits,
): CandidateNumbers[] {
  let solver: ReturnType<typeof surfaceSolver> | null = null;
  return rows.map((row) => {
    const c = decodeCandidate(row);
    let { personnelC, condensationC } = c;
    if (limits.personnelLimitC !== null && personnelC === null)
      personnelC = (solver ??= surfaceSolver(basis, line, jacketId))('personnel', c.layers);
    if (limits.condensationNeedC !== null && condensationC === null)
      condensationC = (solver ??= surfaceSolver(basis, line, jacketId))('condensation', c.layers);
    return {
      mm: c.mm,
      heatFlow: c.heatFlow,
      heatLossC: c.heatLossC,
      personnelC,
      condensationC,
      ok: c.withinLimits,
    };
  });
}

/** Surface temperature of a candidate's layers under the personnel or condensation conditions (the worst part of a vessel). */
function surfaceSolver(basis: DesignBasis, l: LineInput, jacketId: string | null) {
  const c = lineCaseFor(l);
  const crit = criteriaFor(basis, l.outdoor);
  const cat = catalogueOf(basis);
  const D = (c.pipeOuterDiameterMm ?? 0) / 1000,
    H = c.heightM ?? 1;
  return (
    kind: 'personnel' | 'condensation',
    layerRows: { materialId: string; thicknessMm: number }[],
  ): number | null => {
    const mats = layerRows.map((l) => ({ m: cat.materials.get(l.materialId), mm: l.thicknessMm }));
    if (mats.some((x) => !x.m)) return null;
    const layers = mats.map(({ m, mm }) => ({
      thicknessM: mm / 1000,
      conductivity: compileConductivity(designConductivitySpec(m!)),
      name: m!.name,
      minServiceC: m!.minServiceC,
      maxServiceC: m!.maxServiceC,
    }));
    const jacket = layers.length ? cat.jackets.get(jacketId ?? '') : undefined;
    const cond = kind === 'personnel' ? crit.conditions.personnel : crit.conditions.condensation;
    const processC = kind === 'personnel' ? (l.maxTempC ?? l.normalTempC) : l.normalTempC;
    const ambient: Ambient = {
      airC: cond.airC,
      surroundingsC: cond.surroundingsC ?? cond.airC,
      windMs: cond.windMs,
      emittance: jacket?.emittance ?? 0.8,
    };
    if (c.geometry === 'vessel')
      return solveVessel({ diameterM: D, shellHeightM: H, processC, ambient, layers }).worstSurfaceC;
    return solveSteady({
      geometry: c.geometry,
      pipeOuterDiameterM: D,
      heightM: H,
      characteristicLengthM: 1,
      layers,
      processC,
      ambient,
    }).surfaceC;
  };
}
