/**
 * A vessel's design part by part: the shell and the two heads may each get their own thickness, or a
 * head may stay thinner behind a personnel guard. The one home of the per-part rules the pick, the
 * review flags, the heat-loss budget, the bill and the pages share. Pure (server and client).
 */
import type { CriterionId } from '@/lib/thermal/recommend';
import { HARD_CRITERIA } from '@/lib/thermal/rules';
import { vesselDiameterM } from './vessel-area';

export type VesselPartId = 'shell' | 'top' | 'bottom';
export const VESSEL_PART_IDS: readonly VesselPartId[] = ['shell', 'top', 'bottom'];
export const VESSEL_PART_LABEL: Record<VesselPartId, string> = {
  shell: 'shell',
  top: 'top head',
  bottom: 'bottom head',
};

/** One part's chosen insulation. */
export interface DesignPart {
  thicknessMm: number;
  layers: { materialId: string; thicknessMm: number }[];
  /** A head left thinner than personnel protection needs because a guard keeps people off it. */
  guarded?: boolean;
}
export type DesignParts = Record<VesselPartId, DesignPart>;

/** What a part may be picked as: its thickness, and whether it is guarded (heads only). */
export type PartPick = { thicknessMm: number; guarded?: boolean };
export type PartPicks = Record<VesselPartId, PartPick>;

/** Do the parts differ from one thickness all round (else the design is kept as one thickness)? */
export function partsDiffer(p: PartPicks): boolean {
  return (
    p.top.thicknessMm !== p.shell.thicknessMm ||
    p.bottom.thicknessMm !== p.shell.thicknessMm ||
    !!p.top.guarded ||
    !!p.bottom.guarded
  );
}

/**
 * A design in words, for the table and the audit: "100 mm" for one thickness;
 * "shell 100 mm · bottom head 180 mm" naming the shell and each head that differs from it.
 */
export function describeDesign(
  thicknessMm: number,
  parts: DesignParts | null | undefined,
  thickness: (mm: number) => string = (mm) => `${mm} mm`,
): string {
  if (!parts) return thickness(thicknessMm);
  const out = [`shell ${thickness(parts.shell.thicknessMm)}`];
  const head = (id: 'top' | 'bottom') => {
    const p = parts[id];
    if (p.thicknessMm === parts.shell.thicknessMm && !p.guarded) return;
    out.push(`${VESSEL_PART_LABEL[id]} ${thickness(p.thicknessMm)}${p.guarded ? ' (guarded)' : ''}`);
  };
  head('top');
  head('bottom');
  return out.join(' · ');
}

/**
 * The engine's vessel (lib/lines/solve-line.ts): a vertical shell of diameter D and height H with two
 * flat heads, D from the bare area A and H (`vesselDiameterM`). Shell πDH, each head πD²/4 — the
 * areas the engine's per-part heat fluxes are per m² of, so Σ flux × area is the vessel's heat flow.
 */
export function engineVesselAreasM2(areaM2: number, heightM: number): Record<VesselPartId, number> {
  const D = vesselDiameterM(areaM2, heightM);
  const head = (Math.PI * D * D) / 4;
  return { shell: Math.PI * D * heightM, top: head, bottom: head };
}

/**
 * The bill's areas of a vessel: the shell π·D·H with D the line's outside diameter when it gives one
 * (else the engine's D from area and height), and each head half of the rest of the line's area (so a
 * dished head counts its own area, not a flat disc's). Null when the shell cannot be told from the heads.
 */
export function billVesselAreasM2(l: {
  surfaceAreaM2: number | null;
  heightM?: number | null;
  outsideDiameterMm: number | null;
}): Record<VesselPartId, number> | null {
  const a = l.surfaceAreaM2 ?? 0;
  if (!(a > 0) || !l.heightM) return null;
  const dM = l.outsideDiameterMm ? l.outsideDiameterMm / 1000 : vesselDiameterM(a, l.heightM);
  const shell = Math.min(a, Math.PI * dM * l.heightM);
  return { shell, top: (a - shell) / 2, bottom: (a - shell) / 2 };
}

/**
 * The hard criteria each part's pick is below: a surface criterion (personnel, condensation) by the
 * part's own requirement (`parts` on the outcome), the others as the whole vessel's. A guarded head
 * answers personnel protection by its guard, so personnel is not held against it.
 */
export function partsBelow(
  outcomes: readonly {
    id: CriterionId | string;
    requiredMm: number | null;
    parts?: Record<VesselPartId, number | null>;
  }[],
  picks: PartPicks,
): { part: VesselPartId; criteria: string[] }[] {
  const out: { part: VesselPartId; criteria: string[] }[] = [];
  for (const part of VESSEL_PART_IDS) {
    const p = picks[part];
    const criteria: string[] = [];
    for (const o of outcomes) {
      if (!HARD_CRITERIA.has(o.id as CriterionId)) continue;
      if (o.id === 'personnel' && p.guarded) continue;
      const req = o.parts ? o.parts[part] : o.requiredMm;
      if (req !== null && req !== undefined && p.thicknessMm < req) criteria.push(o.id);
    }
    if (criteria.length) out.push({ part, criteria });
  }
  return out;
}

/**
 * A vessel's heat flow (W) with each part at its own thickness, heat-loss conditions: Σ over shell
 * and heads of the part's flux at its thickness × the part's bare area (`engineVesselAreasM2`). The
 * flux is the stored per-part one (candidate row field 9); a result stored before that field carries
 * only the vessel's mean flux per thickness, which is then used for each part (an approximation the
 * next solve replaces). Null when a part's thickness is not a stored candidate.
 */
export function vesselPartsHeatW(
  candidates: readonly { mm: number; heatFlow: number; partFluxesWPerM2: [number, number, number] | null }[],
  parts: Record<VesselPartId, { thicknessMm: number }>,
  areaM2: number,
  heightM: number,
): number | null {
  const areas = engineVesselAreasM2(areaM2, heightM);
  let w = 0;
  for (const [i, p] of VESSEL_PART_IDS.entries()) {
    const c = candidates.find((x) => x.mm === parts[p].thicknessMm);
    if (!c) return null;
    w += (c.partFluxesWPerM2 ? c.partFluxesWPerM2[i] : c.heatFlow) * areas[p];
  }
  return w;
}
