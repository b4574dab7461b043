import {
  billVesselAreasM2,
  VESSEL_PART_IDS,
  VESSEL_PART_LABEL,
  type VesselPartId,
} from '@/lib/lines/vessel-parts';
import type { TracingRow } from './tracing-sheet';
import { compareTags } from '@/lib/lines/natural-sort';

/**
 * Bill-of-quantities arithmetic from the saved design (pure). Allowances and fitting equivalents
 * are project factors — the defaults below are common-practice estimates, stated in the workbook.
 */
/** A project factor with where its value comes from (shown beside it in the workbook). */
export interface SourcedFactor {
  value: number;
  source: string;
}

export interface AccessoryFactors {
  /** Jacket bands: one every this many metres of jacketed pipe, each π·D + closure long. */
  bandSpacingM: SourcedFactor;
  bandClosureM: SourcedFactor;
  /** Tie wire on every insulation layer of pipe sections: one tie every this many metres, each π·D + twist long. */
  tieSpacingM: SourcedFactor;
  tieTwistM: SourcedFactor;
  /** Length of one pipe section (circumferential joints of cold-service sealant). */
  sectionLengthM: SourcedFactor;
  /** Jacket laps: along the seam (added to the girth) and at each circumferential joint of sheets this long. */
  jacketLongitudinalLapMm: SourcedFactor;
  jacketCircumferentialLapMm: SourcedFactor;
  jacketSheetLengthM: SourcedFactor;
  /** Jacket sheet thickness by outside diameter over the insulation (up to `maxOdMm`; null = any larger, and flat). */
  jacketSheetThickness: { rows: { maxOdMm: number | null; thicknessMm: number }[]; source: string };
  /** Cold service: vapour retarder over the outer layer with this lap allowance, and mastic per m² of it. */
  retarderLapFraction: SourcedFactor;
  masticLPerM2: SourcedFactor;
}

export interface BoqFactors {
  /** Material waste allowance on lengths, areas and volumes (fraction). */
  wasteFraction: number;
  /** Jacket overlap allowance on the area of vessels and flat surfaces (fraction); pipes use the laps. */
  jacketOverlapFraction: number;
  /** Insulated length counted for each fitting, in metres of the line's size (common practice). */
  equivalentLengthM: { elbow: number; tee: number; valve: number; flangePair: number };
  /** Valves and flange pairs get removable covers (false: the design basis leaves them bare). */
  removableCovers?: boolean;
  accessories?: AccessoryFactors;
}

const CP = "common practice [recalled]; set the project's own value from the installation specification";
export const DEFAULT_ACCESSORY_FACTORS: AccessoryFactors = {
  bandSpacingM: { value: 0.3, source: `bands at 300 mm centres on pipe jacketing, ${CP}` },
  bandClosureM: { value: 0.05, source: `50 mm per band for the seal or buckle, ${CP}` },
  tieSpacingM: { value: 0.3, source: `wire ties at 300 mm centres on each layer of pipe sections, ${CP}` },
  tieTwistM: { value: 0.15, source: `150 mm per tie for the twist, ${CP}` },
  sectionLengthM: { value: 1, source: `pipe sections in 1 m lengths (36 in in the US), ${CP}` },
  jacketLongitudinalLapMm: { value: 50, source: `50 mm longitudinal lap, ${CP}` },
  jacketCircumferentialLapMm: { value: 50, source: `50 mm circumferential lap, ${CP}` },
  jacketSheetLengthM: { value: 1, source: `jacket sheets 1 m wide along the pipe, ${CP}` },
  jacketSheetThickness: {
    rows: [
      { maxOdMm: 450, thicknessMm: 0.6 },
      { maxOdMm: 1000, thicknessMm: 0.8 },
      { maxOdMm: null, thicknessMm: 1 },
    ],
    source: `aluminium sheet 0.6 mm up to 450 mm over the insulation, 0.8 mm up to 1000 mm, 1.0 mm above and on vessels and flat surfaces, ${CP}`,
  },
  retarderLapFraction: { value: 0.1, source: `10 % for laps of the vapour retarder, ${CP}` },
  masticLPerM2: {
    value: 1.5,
    source: `1.5 L/m² wet coverage of vapour-retarder mastic; the product's data sheet decides, ${CP}`,
  },
};

export const DEFAULT_BOQ_FACTORS: BoqFactors = {
  wasteFraction: 0.05,
  jacketOverlapFraction: 0.1,
  equivalentLengthM: { elbow: 0.6, tee: 0.9, valve: 1.5, flangePair: 0.6 },
  removableCovers: true,
  accessories: DEFAULT_ACCESSORY_FACTORS,
};

/** The sheet thickness for a jacket of this outside diameter (null: vessels and flat surfaces). */
export function jacketSheetThicknessMm(f: AccessoryFactors, odMm: number | null): number {
  const rows = f.jacketSheetThickness.rows;
  if (odMm === null) return rows[rows.length - 1].thicknessMm;
  return (rows.find((r) => r.maxOdMm === null || odMm <= r.maxOdMm) ?? rows[rows.length - 1]).thicknessMm;
}

export interface BoqLine {
  tag: string;
  area: string;
  geometry: 'horizontal-pipe' | 'vertical-pipe' | 'vessel' | 'flat';
  nps: string | null;
  outsideDiameterMm: number | null;
  lengthM: number | null;
  surfaceAreaM2: number | null;
  fittings: { elbows: number; tees: number; valves: number; flanges: number };
  /** Chosen layers inside to outside; empty = bare. */
  layers: { materialId: string; materialName: string; productForm: string; thicknessMm: number }[];
  jacketId: string;
  jacketName: string;
  /** Counted in the bill, or pending with the reason. */
  status: { counted: true } | { counted: false; reason: string };
  reviewStatus: string;
  /** Vessels: shell height, to tell the shell from the heads. */
  heightM?: number | null;
  /**
   * Vessels picked part by part: each part's layers (a guarded head may be thinner); each part's area
   * is then counted at its own thickness. Absent: `layers` all round.
   */
  parts?: Record<VesselPartId, { layers: BoqLine['layers']; guarded?: boolean }> | null;
  /** Cold service (condensation control applies): vapour retarder, mastic and joint sealant. */
  coldService?: boolean;
}

export interface MaterialRow {
  material: string;
  productForm: string;
  layer: number;
  size: string;
  thicknessMm: number;
  lengthM: number;
  areaM2: number;
  volumeM3: number;
}
export interface FittingRow {
  size: string;
  thicknessMm: number;
  elbows: number;
  tees: number;
  valves: number;
  flanges: number;
  equivalentLengthM: number;
}
export interface JacketRow {
  jacket: string;
  outsideDiameterMm: number | null;
  /** Sheet thickness for this diameter (project factor). */
  sheetThicknessMm?: number;
  areaM2: number;
}
/** Removable insulation covers for valves and flange pairs, by line size and insulation thickness. */
export interface CoverRow {
  item: 'valve' | 'flange pair';
  size: string;
  thicknessMm: number;
  count: number;
}
/** Accessories by quantity: bands, tie wire, vapour retarder, mastic, sealant. */
export interface AccessoryRow {
  item: string;
  size: string;
  unit: 'count' | 'm' | 'm²' | 'L';
  quantity: number;
}
export interface SurfaceRow {
  kind: 'vessel' | 'vessel shell' | 'vessel heads' | 'vessel top head' | 'vessel bottom head' | 'flat';
  material: string;
  /** Board or blanket: pipe sections are never listed for vessels and flat surfaces. */
  productForm?: string;
  layer: number;
  thicknessMm: number;
  areaM2: number;
  volumeM3: number;
}
export interface ScheduleRow {
  tag: string;
  /** Absent in bills issued before vessels were listed part by part. */
  geometry?: BoqLine['geometry'];
  area: string;
  size: string;
  lengthM: number | null;
  areaM2: number | null;
  layers: string;
  totalMm: number;
  jacket: string;
  status: string;
  reviewStatus: string;
}

export interface BillQuantities {
  materials: MaterialRow[];
  fittings: FittingRow[];
  jackets: JacketRow[];
  surfaces: SurfaceRow[];
  /** Absent in bills issued before covers and accessories were counted. */
  covers?: CoverRow[];
  accessories?: AccessoryRow[];
  schedule: ScheduleRow[];
  /** Traced lines among those counted (lib/boq/tracing.ts); absent when none or before tracing existed. */
  tracing?: TracingRow[];
  counted: number;
  pending: number;
  factors: BoqFactors;
}

const sizeOf = (l: BoqLine) =>
  l.nps ? `NPS ${l.nps}` : l.outsideDiameterMm ? `OD ${l.outsideDiameterMm.toFixed(1)} mm` : '—';
const r3 = (v: number) => Math.round(v * 1000) / 1000;

/**
 * π·D·L areas, annular layer volumes, fitting equivalents, removable covers and accessories, grouped
 * as the contractor prices them. Each layer after the first is sized by the outside diameter it fits
 * over (the layer below), not by the pipe's NPS.
 */
export function computeQuantities(
  lines: BoqLine[],
  factors: BoqFactors = DEFAULT_BOQ_FACTORS,
): BillQuantities {
  const mats = new Map<string, MaterialRow>(),
    fits = new Map<string, FittingRow>(),
    jackets = new Map<string, JacketRow>(),
    surfaces = new Map<string, SurfaceRow>(),
    covers = new Map<string, CoverRow>(),
    acc = new Map<string, AccessoryRow>();
  const schedule: ScheduleRow[] = [];
  const af = factors.accessories ?? DEFAULT_ACCESSORY_FACTORS;
  const withCovers = factors.removableCovers !== false;
  const w = 1 + factors.wasteFraction,
    ov = 1 + factors.jacketOverlapFraction,
    eq = factors.equivalentLengthM;
  const addAcc = (item: string, size: string, unit: AccessoryRow['unit'], quantity: number) => {
    const k = `${item}|${size}|${unit}`;
    const a = acc.get(k) ?? { item, size, unit, quantity: 0 };
    a.quantity += quantity;
    acc.set(k, a);
  };
  const odLabel = (dM: number) => `over OD ${(Math.round(dM * 10000) / 10).toFixed(1)} mm`;
  let counted = 0,
    pending = 0;
  const layerText = (ls: BoqLine['layers']) =>
    ls.map((x) => `${x.thicknessMm} mm ${x.materialName}`).join(' + ') || 'bare';
  for (const l of lines) {
    const total = l.layers.reduce((a, x) => a + x.thicknessMm, 0);
    const lp = l.geometry === 'vessel' ? l.parts : null;
    schedule.push({
      tag: l.tag,
      geometry: l.geometry,
      area: l.area,
      size: sizeOf(l),
      lengthM: l.lengthM,
      areaM2: l.surfaceAreaM2,
      layers: lp
        ? VESSEL_PART_IDS.map(
            (p) =>
              `${VESSEL_PART_LABEL[p]} ${lp[p].layers.reduce((a, x) => a + x.thicknessMm, 0)} mm${lp[p].guarded ? ', guarded' : ''}: ${layerText(lp[p].layers)}`,
          ).join(' · ')
        : layerText(l.layers),
      totalMm: total,
      jacket: l.layers.length ? l.jacketName : '—',
      status: l.status.counted ? 'counted' : `pending: ${l.status.reason}`,
      reviewStatus: l.reviewStatus,
    });
    if (!l.status.counted) {
      pending++;
      continue;
    }
    counted++;
    if (!l.layers.length && !(lp && VESSEL_PART_IDS.some((p) => lp[p].layers.length))) continue;
    const pipe = l.geometry === 'horizontal-pipe' || l.geometry === 'vertical-pipe';
    if (pipe) {
      const size = sizeOf(l);
      // Elbows and tees are insulated with sections (as equivalent lengths); valves and flange
      // pairs get removable covers, counted by size — unless the design leaves them bare.
      const sectionFit = l.fittings.elbows * eq.elbow + l.fittings.tees * eq.tee;
      const run = (l.lengthM ?? 0) + sectionFit;
      let d = (l.outsideDiameterMm ?? 0) / 1000;
      l.layers.forEach((x, i) => {
        const t = x.thicknessMm / 1000;
        const layerSize = i === 0 ? size : odLabel(d);
        const key = `${x.materialName}|${x.productForm}|${i + 1}|${layerSize}|${x.thicknessMm}`;
        const m = mats.get(key) ?? {
          material: x.materialName,
          productForm: x.productForm,
          layer: i + 1,
          size: layerSize,
          thicknessMm: x.thicknessMm,
          lengthM: 0,
          areaM2: 0,
          volumeM3: 0,
        };
        m.lengthM += run * w;
        m.areaM2 += Math.PI * (d + 2 * t) * run * w; // outer face of the layer
        m.volumeM3 += (Math.PI / 4) * ((d + 2 * t) ** 2 - d ** 2) * run * w;
        mats.set(key, m);
        d += 2 * t;
        // Every layer of sections is wired on: ties at the spacing, each once round the layer plus the twist.
        const ties = Math.ceil(run / af.tieSpacingM.value - 1e-9);
        addAcc('Tie wire', 'all sizes', 'm', ties * (Math.PI * d + af.tieTwistM.value));
        if (l.coldService) {
          // Every joint of cold insulation is sealed: the circumferential joints between sections and two seams along each section.
          const joints = Math.ceil(run / af.sectionLengthM.value - 1e-9);
          addAcc('Joint sealant (cold service)', 'all sizes', 'm', joints * Math.PI * d + 2 * run);
        }
      });
      const fk = `${size}|${total}`;
      const f = fits.get(fk) ?? {
        size,
        thicknessMm: total,
        elbows: 0,
        tees: 0,
        valves: 0,
        flanges: 0,
        equivalentLengthM: 0,
      };
      f.elbows += l.fittings.elbows;
      f.tees += l.fittings.tees;
      f.valves += l.fittings.valves;
      f.flanges += l.fittings.flanges;
      f.equivalentLengthM += sectionFit;
      fits.set(fk, f);
      if (withCovers) {
        for (const [item, n] of [
          ['valve', l.fittings.valves],
          ['flange pair', l.fittings.flanges],
        ] as const) {
          if (!n) continue;
          const ck = `${item}|${size}|${total}`;
          const c = covers.get(ck) ?? { item, size, thicknessMm: total, count: 0 };
          c.count += n;
          covers.set(ck, c);
        }
      }
      const odMm = Math.round(d * 10000) / 10;
      const jk = `${l.jacketName}|${odMm}`;
      const j = jackets.get(jk) ?? {
        jacket: l.jacketName,
        outsideDiameterMm: odMm,
        sheetThicknessMm: jacketSheetThicknessMm(af, odMm),
        areaM2: 0,
      };
      // Girth plus the longitudinal lap, times the run plus one circumferential lap per sheet.
      const lapAlong = 1 + af.jacketCircumferentialLapMm.value / 1000 / af.jacketSheetLengthM.value;
      j.areaM2 += (Math.PI * d + af.jacketLongitudinalLapMm.value / 1000) * run * lapAlong;
      jackets.set(jk, j);
      const bands = Math.ceil(run / af.bandSpacingM.value - 1e-9);
      addAcc('Jacket bands', `OD ${odMm.toFixed(1)} mm`, 'count', bands);
      addAcc('Jacket bands', `OD ${odMm.toFixed(1)} mm`, 'm', bands * (Math.PI * d + af.bandClosureM.value));
      if (l.coldService) {
        const outer = Math.PI * d * run;
        addAcc('Vapour retarder (cold service)', 'pipes', 'm²', outer * (1 + af.retarderLapFraction.value));
        addAcc('Vapour-retarder mastic (cold service)', 'pipes', 'L', outer * af.masticLPerM2.value);
      }
    } else {
      const a = l.surfaceAreaM2 ?? 0;
      // A vessel with its height: the shell (π·D·H) and the heads (the rest of the area, half each;
      // lib/lines/vessel-parts.ts), each part at its own layers when the design gives them.
      const va = l.geometry === 'vessel' ? billVesselAreasM2(l) : null;
      const parts: [SurfaceRow['kind'], number, BoqLine['layers']][] =
        l.geometry === 'flat'
          ? [['flat', a, l.layers]]
          : va && lp
            ? [
                ['vessel shell', va.shell, lp.shell.layers],
                ['vessel top head', va.top, lp.top.layers],
                ['vessel bottom head', va.bottom, lp.bottom.layers],
              ]
            : va
              ? [
                  ['vessel shell', va.shell, l.layers],
                  ['vessel heads', va.top + va.bottom, l.layers],
                ]
              : [['vessel', a, l.layers]];
      for (const [kind, area, layers] of parts) {
        if (area <= 0) continue;
        layers.forEach((x, i) => {
          // Vessels and flat surfaces take board or blanket: a pipe product named here is listed as the board or blanket of the same material.
          const form =
            x.productForm === 'pipe-section' || x.productForm === 'tube' ? 'board or blanket' : x.productForm;
          const key = `${kind}|${x.materialName}|${i + 1}|${x.thicknessMm}`;
          const s = surfaces.get(key) ?? {
            kind,
            material: x.materialName,
            productForm: form,
            layer: i + 1,
            thicknessMm: x.thicknessMm,
            areaM2: 0,
            volumeM3: 0,
          };
          s.areaM2 += area * w;
          s.volumeM3 += area * (x.thicknessMm / 1000) * w;
          surfaces.set(key, s);
        });
      }
      const jk = `${l.jacketName}|flat`;
      const j = jackets.get(jk) ?? {
        jacket: l.jacketName,
        outsideDiameterMm: null,
        sheetThicknessMm: jacketSheetThicknessMm(af, null),
        areaM2: 0,
      };
      j.areaM2 += a * ov;
      jackets.set(jk, j);
      if (l.coldService) {
        const what = l.geometry === 'flat' ? 'flat surfaces' : 'vessels';
        addAcc('Vapour retarder (cold service)', what, 'm²', a * (1 + af.retarderLapFraction.value));
        addAcc('Vapour-retarder mastic (cold service)', what, 'L', a * af.masticLPerM2.value);
      }
    }
  }
  const round = <T extends object>(rows: T[]) =>
    rows.map(
      (r) =>
        Object.fromEntries(Object.entries(r).map(([k, v]) => [k, typeof v === 'number' ? r3(v) : v])) as T,
    );
  const bySize = (a: { size: string; thicknessMm: number }, b: { size: string; thicknessMm: number }) =>
    a.size.localeCompare(b.size, undefined, { numeric: true }) || a.thicknessMm - b.thicknessMm;
  return {
    materials: round(
      [...mats.values()].sort(
        (a, b) => a.material.localeCompare(b.material) || a.layer - b.layer || bySize(a, b),
      ),
    ),
    fittings: round([...fits.values()].sort(bySize)),
    jackets: round(
      [...jackets.values()].sort(
        (a, b) =>
          a.jacket.localeCompare(b.jacket) || (a.outsideDiameterMm ?? 1e9) - (b.outsideDiameterMm ?? 1e9),
      ),
    ),
    surfaces: round(
      [...surfaces.values()].sort(
        (a, b) =>
          a.kind.localeCompare(b.kind) ||
          a.material.localeCompare(b.material) ||
          a.thicknessMm - b.thicknessMm,
      ),
    ),
    covers: [...covers.values()].sort((a, b) => a.item.localeCompare(b.item) || bySize(a, b)),
    accessories: round(
      [...acc.values()].sort(
        (a, b) =>
          a.item.localeCompare(b.item) ||
          a.size.localeCompare(b.size, undefined, { numeric: true }) ||
          a.unit.localeCompare(b.unit),
      ),
    ),
    schedule: schedule.sort((a, b) => compareTags(a.tag, b.tag)),
    counted,
    pending,
    factors,
  };
}

/** JSON with object keys sorted (a bill read back from jsonb has its keys in another order). */
function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
  if (v && typeof v === 'object')
    return `{${Object.keys(v)
      .filter((k) => (v as Record<string, unknown>)[k] !== undefined)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  return JSON.stringify(v);
}

/** True when two bills would give the contractor the same quantities, line schedule and factors. */
export function sameBill(a: BillQuantities, b: BillQuantities): boolean {
  const pick = (q: BillQuantities) =>
    canonical([
      q.materials,
      q.fittings,
      q.jackets,
      q.surfaces,
      q.covers ?? [],
      q.accessories ?? [],
      q.schedule,
      q.factors,
    ]);
  return pick(a) === pick(b);
}

export interface QuantityDelta {
  key: string;
  sheet: 'materials' | 'jackets' | 'surfaces' | 'covers' | 'accessories';
  quantity: string;
  before: number;
  after: number;
  change: number;
}

/** Change in quantities from the previous issue (materials by length and volume, jackets and surfaces by area). */
export function quantityDelta(before: BillQuantities | null, after: BillQuantities): QuantityDelta[] {
  const rows: QuantityDelta[] = [];
  const add = (
    sheet: QuantityDelta['sheet'],
    items: Record<string, number>,
    prev: Record<string, number>,
    quantity: string,
  ) => {
    for (const k of new Set([...Object.keys(items), ...Object.keys(prev)])) {
      const a = prev[k] ?? 0,
        b = items[k] ?? 0;
      if (Math.abs(b - a) > 1e-9)
        rows.push({ key: k, sheet, quantity, before: r3(a), after: r3(b), change: r3(b - a) });
    }
  };
  const m = (q: BillQuantities | null, f: (r: MaterialRow) => number) =>
    Object.fromEntries(
      (q?.materials ?? []).map((r) => [
        `${r.material} · layer ${r.layer} · ${r.size} · ${r.thicknessMm} mm`,
        f(r),
      ]),
    );
  add(
    'materials',
    m(after, (r) => r.lengthM),
    m(before, (r) => r.lengthM),
    'length m',
  );
  add(
    'materials',
    m(after, (r) => r.volumeM3),
    m(before, (r) => r.volumeM3),
    'volume m³',
  );
  const j = (q: BillQuantities | null) =>
    Object.fromEntries(
      (q?.jackets ?? []).map((r) => [
        `${r.jacket} · ${r.outsideDiameterMm === null ? 'flat' : `OD ${r.outsideDiameterMm} mm`}`,
        r.areaM2,
      ]),
    );
  add('jackets', j(after), j(before), 'area m²');
  const s = (q: BillQuantities | null) =>
    Object.fromEntries(
      (q?.surfaces ?? []).map((r) => [
        `${r.kind} · ${r.material} · layer ${r.layer} · ${r.thicknessMm} mm`,
        r.areaM2,
      ]),
    );
  add('surfaces', s(after), s(before), 'area m²');
  const c = (q: BillQuantities | null) =>
    Object.fromEntries(
      (q?.covers ?? []).map((r) => [`${r.item} · ${r.size} · ${r.thicknessMm} mm`, r.count]),
    );
  add('covers', c(after), c(before), 'count');
  for (const unit of ['count', 'm', 'm²', 'L'] as const) {
    const a = (q: BillQuantities | null) =>
      Object.fromEntries(
        (q?.accessories ?? [])
          .filter((r) => r.unit === unit)
          .map((r) => [`${r.item} · ${r.size}`, r.quantity]),
      );
    add('accessories', a(after), a(before), unit);
  }
  return rows;
}
