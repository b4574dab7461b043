import { solveSteady, type SolidLayer, type SteadyResult } from './solve';
import type { Ambient } from './surface';

export interface VesselResult {
  /** Total heat flow of the vessel, W (positive = loss). */
  totalW: number;
  /** Area-weighted heat flux over the outside surface, W/m². */
  meanFluxWPerM2: number;
  shell: SteadyResult;
  top: SteadyResult;
  bottom: SteadyResult;
  /** Outside areas, m²: shell at the insulated diameter, each head as a flat disc. */
  areasM2: { shell: number; top: number; bottom: number };
  /** The hottest (or, on cold service, coldest) outside surface — what a touch or dew check needs. */
  worstSurfaceC: number;
}

/**
 * A vertical vessel as its cylindrical shell plus two heads, area-weighted: the shell as a vertical
 * cylinder (natural convection on height, wind across the diameter), the heads as horizontal flat
 * surfaces facing up and down with L = area/perimeter = D/4 (heads taken as flat: common practice
 * for an estimate; dished heads have some 10–20 % more area).
 */
export function solveVessel(o: {
  diameterM: number;
  shellHeightM: number;
  processC: number;
  ambient: Ambient;
  layers: SolidLayer[];
  /** Each part's own layers when they differ (a vessel picked part by part); else `layers` all round. */
  partLayers?: { shell: SolidLayer[]; top: SolidLayer[]; bottom: SolidLayer[] };
  horizontal?: boolean;
}): VesselResult {
  // A lying vessel (`horizontal`): the shell a horizontal cylinder of length shellHeightM, both heads
  // upright discs taken as vertical walls of height D; "top" and "bottom" are then its two ends.
  const shell = solveSteady({
    geometry: o.horizontal ? 'horizontal-pipe' : 'vertical-pipe',
    pipeOuterDiameterM: o.diameterM,
    heightM: o.horizontal ? 1 : o.shellHeightM,
    characteristicLengthM: 1,
    processC: o.processC,
    ambient: o.ambient,
    layers: o.partLayers?.shell ?? o.layers,
  });
  const head = o.horizontal
    ? {
        pipeOuterDiameterM: 0,
        heightM: o.diameterM,
        characteristicLengthM: 1,
        processC: o.processC,
        ambient: o.ambient,
        layers: o.layers,
      }
    : {
        pipeOuterDiameterM: 0,
        heightM: 1,
        characteristicLengthM: o.diameterM / 4,
        processC: o.processC,
        ambient: o.ambient,
        layers: o.layers,
      };
  const pl = o.partLayers;
  const top = solveSteady({
    geometry: o.horizontal ? 'vertical-wall' : 'horizontal-wall-up',
    ...head,
    layers: pl?.top ?? o.layers,
  });
  const bottom =
    o.horizontal && !pl
      ? top
      : solveSteady({
          geometry: o.horizontal ? 'vertical-wall' : 'horizontal-wall-down',
          ...head,
          layers: pl?.bottom ?? o.layers,
        });
  const dOut = shell.outerDiameterM ?? o.diameterM;
  const areasM2 = {
    shell: Math.PI * dOut * o.shellHeightM,
    top: (Math.PI * o.diameterM * o.diameterM) / 4,
    bottom: (Math.PI * o.diameterM * o.diameterM) / 4,
  };
  const totalW =
    shell.heatFlow * o.shellHeightM + top.heatFlow * areasM2.top + bottom.heatFlow * areasM2.bottom;
  const area = areasM2.shell + areasM2.top + areasM2.bottom;
  const hot = o.processC >= o.ambient.airC;
  const temps = [shell.surfaceC, top.surfaceC, bottom.surfaceC];
  return {
    totalW,
    meanFluxWPerM2: totalW / area,
    shell,
    top,
    bottom,
    areasM2,
    worstSurfaceC: hot ? Math.max(...temps) : Math.min(...temps),
  };
}
