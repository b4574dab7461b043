import {
  describeCuiFinding,
  compileConductivity,
  designConductivitySpec,
  condensationControlApplies,
  touchLimitFor,
  TOUCH_SURFACE_LABEL,
  condensationLimit,
  personnelProtectionApplies,
  solveSteady,
  solveVessel,
  type Ambient,
  type Conductivity,
  type InsulationMaterial,
} from '@/lib/thermal';
import { catalogueOf } from '@/lib/lines/catalogue';
import { cuiScreenFor } from '@/lib/lines/cui';
import { criteriaFor, lineCaseFor } from '@/lib/lines/solve-line';
import type { DesignBasis } from '@/lib/lines/design-basis';
import type { LineInput } from '@/lib/lines/validate';
import {
  VESSEL_PART_IDS,
  VESSEL_PART_LABEL,
  type DesignParts,
  type VesselPartId,
} from '@/lib/lines/vessel-parts';

export type FlagType = 'hot-surface' | 'sweating' | 'interface-limit' | 'below-criterion' | 'blocked' | 'cui';
export const FLAG_LABEL: Record<FlagType, string> = {
  'hot-surface': 'Surface over the touch limit',
  sweating: 'Surface under the dew point + margin',
  'interface-limit': 'Layer over its service temperature',
  'below-criterion': 'Pick below a hard criterion',
  blocked: 'Missing data blocks a decision',
  cui: 'Corrosion-under-insulation window',
};

export interface Flag {
  type: FlagType;
  message: string;
  valueC?: number;
  limitC?: number;
  conditions?: string;
}

export interface FlagInput {
  line: LineInput;
  /** The chosen design (null: nothing chosen, the line is assessed as built bare). */
  design: {
    layers: { materialId: string; thicknessMm: number }[];
    belowCriterion: string | null;
    /** A vessel picked part by part (lib/lines/vessel-parts.ts); each part is then judged with its own layers. */
    parts?: DesignParts | null;
  } | null;
  /** Jacket the design uses (from the solved system); bare lines are bare steel. */
  jacketId: string | null;
  solved: boolean;
  stale: boolean;
  unmet: string[];
}

// Compiled per material object: a project's own entry may be replaced under the same id.
const conds = new WeakMap<InsulationMaterial, Conductivity>();
const k = (m: InsulationMaterial) => {
  let c = conds.get(m);
  if (!c) {
    c = compileConductivity(designConductivitySpec(m));
    conds.set(m, c);
  }
  return c;
};

/**
 * The flags of one line under the design basis, each with the numbers behind it. Personnel
 * protection uses the hottest air in still air; a surface exactly at the limit passes. The limit
 * follows the touched surface (bare lines: bare steel) — the ISO 13732-1 burn threshold at the
 * project's contact time, or the project's fixed numbers (lib/thermal/touch.ts).
 */
const partText = (past: string[]) => (past.length ? ` (${past.join('; ')})` : '');

export function flagsForLine(basis: DesignBasis, f: FlagInput): Flag[] {
  const flags: Flag[] = [];
  const l = f.line;
  if (!f.solved || f.stale)
    flags.push({
      type: 'blocked',
      message: f.solved
        ? 'Results are stale: solve the line again before deciding.'
        : 'The line has not been solved.',
    });
  if (f.unmet.length)
    flags.push({ type: 'blocked', message: `No standard thickness meets ${f.unmet.join(', ')}.` });
  if (f.design?.belowCriterion)
    flags.push({
      type: 'below-criterion',
      message: `The chosen thickness is below what ${f.design.belowCriterion} requires.`,
    });

  const c = lineCaseFor(l);
  const crit = criteriaFor(basis, l.outdoor);
  const cat = catalogueOf(basis);
  const parts = c.geometry === 'vessel' ? (f.design?.parts ?? null) : null;
  const chosen = [
    ...(f.design?.layers ?? []),
    ...(parts ? VESSEL_PART_IDS.flatMap((p) => parts[p].layers) : []),
  ];
  const missing = [
    ...new Map(chosen.filter((x) => !cat.materials.has(x.materialId)).map((x) => [x.materialId, x])).values(),
  ];
  if (missing.length) {
    flags.push({
      type: 'blocked',
      message: `The chosen design uses ${missing.map((x) => x.materialId).join(', ')}, which is no longer in the library or the project's materials: choose the thickness again.`,
    });
    return flags;
  }
  const layersOf = (ls: { materialId: string; thicknessMm: number }[]) =>
    ls.map((x) => {
      const m = cat.materials.get(x.materialId)!;
      return {
        thicknessM: x.thicknessMm / 1000,
        conductivity: k(m),
        name: m.name,
        minServiceC: m.minServiceC,
        maxServiceC: m.maxServiceC,
      };
    });
  const layers = layersOf(f.design?.layers ?? []);
  const partLayers = parts
    ? {
        shell: layersOf(parts.shell.layers),
        top: layersOf(parts.top.layers),
        bottom: layersOf(parts.bottom.layers),
      }
    : undefined;
  const jacket = layers.length || parts ? cat.jackets.get(f.jacketId ?? '') : undefined;
  const emittance = jacket?.emittance ?? 0.8;
  const D = (c.pipeOuterDiameterMm ?? 0) / 1000,
    H = c.heightM ?? 1;
  /**
   * Outside surface temperature (the worst part of a vessel: shell, top or bottom head, each with its
   * own layers when picked part by part; `byPart` then gives each) and the solver's warnings.
   */
  const surface = (
    processC: number,
    ambient: Ambient,
  ): { surfaceC: number; warnings: string[]; byPart?: Record<VesselPartId, number> } => {
    if (c.geometry === 'vessel') {
      const v = solveVessel({ diameterM: D, shellHeightM: H, processC, ambient, layers, partLayers });
      return {
        surfaceC: v.worstSurfaceC,
        warnings: [...new Set([...v.shell.warnings, ...v.top.warnings, ...v.bottom.warnings])],
        byPart: { shell: v.shell.surfaceC, top: v.top.surfaceC, bottom: v.bottom.surfaceC },
      };
    }
    return solveSteady({
      geometry: c.geometry,
      pipeOuterDiameterM: D,
      heightM: H,
      characteristicLengthM: 1,
      layers,
      processC,
      ambient,
    });
  };
  /** With parts: which parts are past the limit ("bottom head 78.2 °C, guarded"), for the message. */
  const partsPast = (byPart: Record<VesselPartId, number> | undefined, past: (t: number) => boolean) =>
    parts && byPart
      ? VESSEL_PART_IDS.filter((p) => past(byPart[p])).map(
          (p) => `${VESSEL_PART_LABEL[p]} ${byPart[p].toFixed(1)} °C${parts[p].guarded ? ', guarded' : ''}`,
        )
      : [];
  const hotC = l.maxTempC ?? l.normalTempC;

  const pc = crit.conditions.personnel;
  if (personnelProtectionApplies({ accessible: l.accessible, hottestC: hotC }, pc)) {
    const r = surface(hotC, {
      airC: pc.airC,
      surroundingsC: pc.surroundingsC ?? pc.airC,
      windMs: pc.windMs,
      emittance,
    });
    // Bare lines are bare steel; the limit follows the surface (touch.ts, one rule with the recommendation).
    const tl = touchLimitFor(crit, jacket ?? { metal: true, touchSurface: 'bare-metal' });
    const limit = tl.limitC,
      shown = Math.round(limit * 10) / 10;
    if (r.surfaceC > limit) {
      flags.push({
        type: 'hot-surface',
        valueC: r.surfaceC,
        limitC: limit,
        conditions: `${pc.airC} °C air, ${pc.windMs} m/s, ${TOUCH_SURFACE_LABEL[tl.surface]}${Number.isFinite(tl.contactSeconds) ? `, ${tl.contactSeconds} s contact (ISO 13732-1)` : ' (fixed limit)'}, ε ${emittance}`,
        message: `Surface ${r.surfaceC.toFixed(1)} °C over the ${shown} °C touch limit${layers.length || parts ? '' : ' (bare)'}${partText(partsPast(r.byPart, (t) => t > limit))}.`,
      });
    }
    if (r.warnings.some((w) => w.includes('service temperature'))) {
      flags.push({
        type: 'interface-limit',
        message: r.warnings.filter((w) => w.includes('service temperature')).join('; '),
      });
    }
  }
  const cc = crit.conditions.condensation;
  if (
    condensationControlApplies({ purposes: l.purposes, coldestC: l.normalTempC }, cc, basis.dewPointMarginK)
  ) {
    const r = surface(l.normalTempC, {
      airC: cc.airC,
      surroundingsC: cc.surroundingsC ?? cc.airC,
      windMs: cc.windMs,
      emittance,
    });
    const th = condensationLimit(cc, basis.dewPointMarginK);
    const need = th.needC;
    if (r.surfaceC < need) {
      flags.push({
        type: 'sweating',
        valueC: r.surfaceC,
        limitC: need,
        conditions: `${cc.airC} °C, ${cc.relativeHumidityPct ?? 80} % RH, ${th.basis} ${th.valueC.toFixed(1)} °C + ${basis.dewPointMarginK} K`,
        message: `Surface ${r.surfaceC.toFixed(1)} °C under ${need.toFixed(1)} °C (${th.basis} + margin)${partText(partsPast(r.byPart, (t) => t < need))}.`,
      });
    }
  }
  // Corrosion under insulation (lib/lines/cui.ts): a screen for the reviewer, when the project asks for the flag (after the hazards, which the disposition answers).
  if (basis.cui?.reviewFlag) {
    const screen = cuiScreenFor(basis, l);
    if (screen.inWindow) {
      flags.push({
        type: 'cui',
        message: `In a corrosion-under-insulation window: ${screen.findings.map(describeCuiFinding).join('; ')}.${screen.coatingNote ? ' Coating required under the insulation.' : ''}${screen.chlorideFreeInsulation ? ' Chloride-free insulation (ASTM C795) required.' : ''}`,
      });
    }
  }
  return flags;
}
