import type { InsulationMaterial } from './materials';

export interface CandidateLayer {
  material: InsulationMaterial;
  thicknessMm: number;
}
export interface Candidate {
  totalMm: number;
  layers: CandidateLayer[];
}

export interface SeriesOptions {
  thicknessesMm: number[];
  maxLayerMm: number;
  maxLayers: number;
  maxTotalMm?: number;
}

/**
 * Total thicknesses on offer and how each is built: single layers up to the maximum single-layer
 * thickness, then 2…n layers of equal or neighbouring nominal sizes with staggered joints
 * (common practice). A total is offered with n layers only when n − 1 layers cannot reach it.
 */
export function layerSplits(o: SeriesOptions): number[][] {
  const series = [...new Set(o.thicknessesMm)]
    .filter((t) => t > 0 && t <= o.maxLayerMm)
    .sort((a, b) => a - b);
  const maxTotal = o.maxTotalMm ?? 300;
  const byTotal = new Map<number, number[]>();
  for (const t of series) byTotal.set(t, [t]);
  for (let n = 2; n <= o.maxLayers; n++) {
    for (let i = 0; i < series.length; i++) {
      const lo = series[i],
        hi = series[Math.min(i + 1, series.length - 1)];
      for (let k = 0; k < n; k++) {
        const split = [...Array(n - k).fill(lo), ...Array(k).fill(hi)];
        const total = split.reduce((a, b) => a + b, 0);
        if (total <= (n - 1) * o.maxLayerMm || total > maxTotal || byTotal.has(total)) continue;
        byTotal.set(
          total,
          split.sort((a, b) => b - a),
        ); // thicker layer inside
      }
    }
  }
  return [...byTotal.entries()].sort((a, b) => a[0] - b[0]).map(([, s]) => s);
}

/**
 * Candidates for a material system. When the process temperature exceeds the main material's limit
 * and an inner material is given, the innermost layer is of the inner (higher-temperature) material;
 * the solved interface temperature then decides whether the candidate is usable.
 */
export function buildCandidates(o: {
  outer: InsulationMaterial;
  inner?: InsulationMaterial;
  hotFaceC: number;
  coldFaceC: number;
  series?: Partial<SeriesOptions>;
}): Candidate[] {
  const needInner = !!o.inner && (o.hotFaceC > o.outer.maxServiceC || o.coldFaceC < o.outer.minServiceC);
  const splits = layerSplits({
    thicknessesMm: o.series?.thicknessesMm ?? o.outer.thicknessesMm,
    maxLayerMm: o.series?.maxLayerMm ?? o.outer.maxLayerMm,
    maxLayers: o.series?.maxLayers ?? o.outer.maxLayers,
    maxTotalMm: o.series?.maxTotalMm,
  });
  return splits.map((s) => ({
    totalMm: s.reduce((a, b) => a + b, 0),
    layers: s.map((t, i) => ({ material: needInner && i === 0 ? o.inner! : o.outer, thicknessMm: t })),
  }));
}
