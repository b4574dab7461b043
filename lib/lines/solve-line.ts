import { createHash, Hash } from 'node:crypto';
import {
  CALCULATION_VERSION,
  barGaugeToMPaAbs,
  recommendLine,
  seriesOf,
  type Criteria,
  type LineCase,
  type MaterialSystem,
  type Recommendation,
} from '@/lib/thermal';
import type { DesignBasis } from './design-basis';
import { isSurfaceGeometry } from './fields';
import { vesselDiameterM } from './vessel-area';
import { catalogueOf } from './catalogue';
import type { LineInput } from './validate';

/** The material system the design basis gives a line (by its normal temperature), with any jacket override (library or the project's own). */
export function systemForLine(
  basis: DesignBasis,
  line: Pick<LineInput, 'normalTempC' | 'jacketId'> & Partial<Pick<LineInput, 'geometry'>>,
  cache = new Map<string, MaterialSystem>(),
): MaterialSystem {
  const band =
    basis.systems.find((s) => line.normalTempC >= s.fromC && line.normalTempC < s.toC) ??
    basis.systems[basis.systems.length - 1];
  const cat = catalogueOf(basis);
  const jacket = line.jacketId && cat.jackets.has(line.jacketId) ? line.jacketId : band.jacketId;
  // Vessels and flat surfaces take the band's blanket or board when it names one.
  const outerId =
    line.geometry && isSurfaceGeometry(line.geometry) && band.flatOuterId ? band.flatOuterId : band.outerId;
  const key = `${outerId}|${band.innerId ?? ''}|${jacket}|${basis.thicknessSeries}`;
  let s = cache.get(key);
  if (!s) {
    const outer = cat.materials.get(outerId)!;
    s = {
      outer,
      inner: band.innerId ? cat.materials.get(band.innerId) : undefined,
      jacket: cat.jackets.get(jacket)!,
    };
    if (basis.thicknessSeries === 'inch' && outer.inchSeries) s.series = seriesOf(outer, 'inch');
    cache.set(key, s);
  }
  return s;
}

export function criteriaFor(basis: DesignBasis, outdoor: boolean): Criteria {
  const side = outdoor ? 'outdoor' : 'indoor';
  return {
    conditions: {
      heatLoss: basis.conditions.heatLoss[side],
      personnel: basis.conditions.personnel[side],
      condensation: basis.conditions.condensation[side],
      freeze: outdoor
        ? basis.conditions.freeze
        : { airC: Math.max(basis.conditions.freeze.airC, 5), windMs: 0 },
    },
    touchLimitMetalC: basis.touchLimitMetalC,
    touchLimitNonMetalC: basis.touchLimitNonMetalC,
    touchContactSeconds: basis.touchLimitMode === 'contact-time' ? basis.touchContactSeconds : undefined,
    dewPointMarginK: basis.dewPointMarginK,
    heatLossLimitWPerM: basis.heatLossLimitWPerM,
    maxProcessDropK: basis.maxProcessDropK,
    freeze: basis.freeze,
    energyCode: basis.energyCode === 'ashrae-90.1' ? 'ashrae-90.1' : undefined,
    economics: basis.economics,
    prices: { ...basis.prices },
    sweepAllCandidates: true,
  };
}

/** Line list geometry → engine geometry (a vessel's diameter from its area and height: `vesselDiameterM`). */
export { vesselDiameterM };

export function lineCaseFor(l: LineInput): LineCase {
  const base = {
    normalTempC: l.normalTempC,
    maxTempC: l.maxTempC ?? undefined,
    purposes: l.purposes,
    accessible: l.accessible,
    steamPressureMPaAbs:
      l.steamPressureBarG !== null && l.steamPressureBarG !== undefined && l.steamPressureBarG >= 0
        ? barGaugeToMPaAbs(l.steamPressureBarG)
        : undefined,
    massFlowKgPerS: l.flowKgPerS ?? undefined,
    fluidCpJPerKgK: l.fluidCpKJPerKgK ? l.fluidCpKJPerKgK * 1000 : undefined,
  };
  if (l.geometry === 'vessel') {
    const H = l.heightM ?? 1,
      A = l.surfaceAreaM2 ?? 1;
    return {
      ...base,
      geometry: 'vessel',
      pipeOuterDiameterMm: vesselDiameterM(A, H) * 1000,
      heightM: H,
      areaM2: A,
    };
  }
  if (l.geometry === 'flat')
    return { ...base, geometry: 'vertical-wall', heightM: l.heightM ?? 2, areaM2: l.surfaceAreaM2 ?? 1 };
  const counted = l.elbows + l.tees + l.valves + l.flanges > 0;
  return {
    ...base,
    geometry: l.geometry,
    pipeOuterDiameterMm: l.outsideDiameterMm ?? undefined,
    heightM: l.heightM ?? 6,
    lengthM: l.lengthM ?? 1,
    // The line's own fitting counts price its fittings item by item (else an allowance).
    fittings: counted
      ? { elbows: l.elbows, tees: l.tees, valves: l.valves, flangePairs: l.flanges }
      : undefined,
  };
}

/** The basis' JSON hashed once, for `inputHash` over many lines. */
export function basisHashOf(basisJson: string): Hash {
  return createHash('sha1').update(basisJson);
}

/** Hash of everything the answer depends on: calculation version, design basis (or its JSON, when hashing many lines) and the line's inputs. */
export function inputHash(basis: DesignBasis | string | Hash, l: LineInput): string {
  const relevant = [
    CALCULATION_VERSION,
    l.geometry,
    l.outsideDiameterMm,
    l.lengthM,
    l.surfaceAreaM2,
    l.heightM,
    l.normalTempC,
    l.maxTempC,
    l.steamPressureBarG,
    l.flowKgPerS,
    l.fluidCpKJPerKgK,
    [...l.purposes].sort(),
    l.outdoor,
    l.accessible,
    l.jacketId,
    // Only when marked, so hashes of lines stored before the flag existed stay as they were.
    ...(l.heatTraced ? ['heat-traced'] : []),
  ];
  // A Hash is the basis already hashed (`basisHashOf`): copied per line, the same digest without
  // hashing the basis' JSON again for every line of a solve.
  const h =
    basis instanceof Hash
      ? basis.copy()
      : createHash('sha1').update(typeof basis === 'string' ? basis : JSON.stringify(basis));
  return h.update(JSON.stringify(relevant)).digest('hex').slice(0, 20);
}

export interface SolvedLine {
  recommendation: Recommendation;
  system: MaterialSystem;
  /** Heat flow of the whole line (W) at the recommendation; per metre × length or per m² × area. */
  totalHeatW: number | null;
  bareHeatW: number;
  perUnit: 'W/m' | 'W/m²';
}

export function solveLine(
  basis: DesignBasis,
  l: LineInput,
  systems?: Map<string, MaterialSystem>,
): SolvedLine {
  const system = systemForLine(basis, l, systems);
  const c = lineCaseFor(l);
  const r = recommendLine(c, system, criteriaFor(basis, l.outdoor));
  const areal = isSurfaceGeometry(l.geometry);
  const extent = areal ? (c.areaM2 ?? 1) : (c.lengthM ?? 1);
  const chosen = r.candidates.find((x) => x.totalMm === r.recommendedMm);
  return {
    recommendation: r,
    system,
    totalHeatW: chosen ? chosen.heatLoss.heatFlow * extent : null,
    bareHeatW: r.candidates[0].heatLoss.heatFlow * extent,
    perUnit: areal ? 'W/m²' : 'W/m',
  };
}
