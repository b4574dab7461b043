/**
 * A line's stored result row, from the line and the design basis: pure (no database), so the job
 * worker can build rows on worker threads (lib/lines/solve-pool.ts) exactly as in-process solves do.
 */
import type { Line } from '@/db/schema';
import { CALCULATION_VERSION, type MaterialSystem } from '@/lib/thermal';
import { encodeCandidate } from './candidate-row';
import type { DesignBasis } from './design-basis';
import type { Hash } from 'node:crypto';
import { basisHashOf, inputHash, solveLine } from './solve-line';
import { tracingOfSolved } from './tracing';
import type { LineInput } from './validate';

export function inputOf(l: Line): LineInput {
  return {
    tag: l.tag,
    service: l.service,
    area: l.area,
    geometry: l.geometry,
    nps: l.nps,
    outsideDiameterMm: l.outsideDiameterMm,
    lengthM: l.lengthM,
    surfaceAreaM2: l.surfaceAreaM2,
    heightM: l.heightM,
    normalTempC: l.normalTempC,
    maxTempC: l.maxTempC,
    steamPressureBarG: l.steamPressureBarG,
    flowKgPerS: l.flowKgPerS,
    fluidCpKJPerKgK: l.fluidCpKJPerKgK,
    elbows: l.elbows,
    tees: l.tees,
    valves: l.valves,
    flanges: l.flanges,
    purposes: l.purposes as LineInput['purposes'],
    outdoor: l.outdoor,
    accessible: l.accessible,
    accessHeightM: l.accessHeightM,
    jacketId: l.jacketId,
    heatTraced: l.heatTraced,
    notes: l.notes,
  };
}

/** The system as built: only the materials of the layers actually chosen (inner first); the outer material when bare. */
export function systemLabelOf(system: MaterialSystem, layers: { materialId: string }[]): string {
  const ids = [...new Set(layers.map((l) => l.materialId))];
  const name = (id: string) =>
    id === system.inner?.id ? system.inner.name : id === system.outer.id ? system.outer.name : id;
  return ids.length ? ids.map(name).join(' + ') : system.outer.name;
}

/** What every line of one solve shares: the basis (serialised once for the input hashes) and the systems cache. */
export interface ResultContext {
  basis: DesignBasis;
  basisJson: string;
  /** The basis' JSON hashed once (inputHash copies it per line). */
  basisHash: Hash;
  revision: number;
  projectId: string;
  systems: Map<string, MaterialSystem>;
}

export function resultContext(o: { basis: DesignBasis; revision: number; projectId: string }): ResultContext {
  const basisJson = JSON.stringify(o.basis);
  return { ...o, basisJson, basisHash: basisHashOf(basisJson), systems: new Map() };
}

export function resultRow(ctx: ResultContext, line: Line) {
  const input = inputOf(line);
  const s = solveLine(ctx.basis, input, ctx.systems);
  const r = s.recommendation;
  const chosen = r.candidates.find((c) => c.totalMm === r.recommendedMm);
  return {
    lineId: line.id,
    projectId: ctx.projectId,
    calcVersion: CALCULATION_VERSION,
    basisRevision: ctx.revision,
    inputVersion: line.inputVersion,
    inputHash: inputHash(ctx.basisHash, input),
    recommendedMm: r.recommendedMm,
    governing: r.governing,
    layers: r.layers,
    systemLabel: systemLabelOf(s.system, r.layers),
    jacketId: s.system.jacket.id,
    outcomes: r.outcomes,
    unmet: r.unmet,
    warnings: r.warnings,
    // Compact cost curve and candidate table, one row per thickness (lib/lines/candidate-row.ts).
    candidates: r.candidates.map((c, i) => encodeCandidate(c, r.vesselParts?.candidateFluxesWPerM2[i])),
    design: r.design
      ? {
          profileC: r.design.profileC,
          overall: r.design.overall,
          convective: r.design.convectiveWPerM2K,
          radiative: r.design.radiativeWPerM2K,
        }
      : null,
    heatFlowPerUnit: chosen?.heatLoss.heatFlow ?? null,
    totalHeatW: s.totalHeatW,
    bareHeatW: s.bareHeatW,
    surfaceTempC: chosen?.heatLoss.surfaceC ?? null,
    personnelSurfaceC: chosen?.personnel?.surfaceC ?? null,
    annualMWh: r.annual?.energyMWh ?? null,
    annualCost: r.annual?.cost ?? null,
    co2Tonnes: r.annual?.co2Tonnes ?? null,
    condensateKgPerH: r.condensateKgPerHour ?? null,
    tracing: tracingOfSolved(ctx.basis, input, s.system, r.candidates),
    solvedAt: new Date(),
  };
}

export type ResultRow = ReturnType<typeof resultRow>;
