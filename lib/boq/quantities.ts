/**
 * Bill-of-quantities arithmetic from the saved design (pure). Allowances and fitting equivalents
 * are project factors — the defaults below are common-practice estimates, stated in the workbook.
 */
export interface BoqFactors {
  /** Material waste allowance on lengths, areas and volumes (fraction). */
  wasteFraction: number;
  /** Jacket overlap allowance on area (fraction). */
  jacketOverlapFraction: number;
  /** Insulated length counted for each fitting, in metres of the line's size (common practice). */
  equivalentLengthM: { elbow: number; tee: number; valve: number; flangePair: number };
}

export const DEFAULT_BOQ_FACTORS: BoqFactors = {
  wasteFraction: 0.05,
  jacketOverlapFraction: 0.1,
  equivalentLengthM: { elbow: 0.6, tee: 0.9, valve: 1.5, flangePair: 0.6 },
};

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
  areaM2: number;
}
export interface SurfaceRow {
  kind: 'vessel' | 'flat';
  material: string;
  layer: number;
  thicknessMm: number;
  areaM2: number;
  volumeM3: number;
}
export interface ScheduleRow {
  tag: string;
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
  schedule: ScheduleRow[];
  counted: number;
  pending: number;
  factors: BoqFactors;
}

const sizeOf = (l: BoqLine) =>
  l.nps ? `NPS ${l.nps}` : l.outsideDiameterMm ? `OD ${l.outsideDiameterMm.toFixed(1)} mm` : '—';
const r3 = (v: number) => Math.round(v * 1000) / 1000;

/** π·D·L areas, annular layer volumes and fitting equivalents, grouped as the contractor prices them. */
export function computeQuantities(
  lines: BoqLine[],
  factors: BoqFactors = DEFAULT_BOQ_FACTORS,
): BillQuantities {
  const mats = new Map<string, MaterialRow>(),
    fits = new Map<string, FittingRow>(),
    jackets = new Map<string, JacketRow>(),
    surfaces = new Map<string, SurfaceRow>();
  const schedule: ScheduleRow[] = [];
  const w = 1 + factors.wasteFraction,
    ov = 1 + factors.jacketOverlapFraction,
    eq = factors.equivalentLengthM;
  let counted = 0,
    pending = 0;
  for (const l of lines) {
    const total = l.layers.reduce((a, x) => a + x.thicknessMm, 0);
    schedule.push({
      tag: l.tag,
      area: l.area,
      size: sizeOf(l),
      lengthM: l.lengthM,
      areaM2: l.surfaceAreaM2,
      layers: l.layers.map((x) => `${x.thicknessMm} mm ${x.materialName}`).join(' + ') || 'bare',
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
    if (!l.layers.length) continue;
    const pipe = l.geometry === 'horizontal-pipe' || l.geometry === 'vertical-pipe';
    if (pipe) {
      const size = sizeOf(l);
      const fitLen =
        l.fittings.elbows * eq.elbow +
        l.fittings.tees * eq.tee +
        l.fittings.valves * eq.valve +
        l.fittings.flanges * eq.flangePair;
      const run = (l.lengthM ?? 0) + fitLen;
      let d = (l.outsideDiameterMm ?? 0) / 1000;
      l.layers.forEach((x, i) => {
        const t = x.thicknessMm / 1000;
        const key = `${x.materialName}|${x.productForm}|${i + 1}|${size}|${x.thicknessMm}`;
        const m = mats.get(key) ?? {
          material: x.materialName,
          productForm: x.productForm,
          layer: i + 1,
          size,
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
      f.equivalentLengthM += fitLen;
      fits.set(fk, f);
      const odMm = Math.round(d * 10000) / 10;
      const jk = `${l.jacketName}|${odMm}`;
      const j = jackets.get(jk) ?? { jacket: l.jacketName, outsideDiameterMm: odMm, areaM2: 0 };
      j.areaM2 += Math.PI * d * run * ov;
      jackets.set(jk, j);
    } else {
      const a = l.surfaceAreaM2 ?? 0;
      l.layers.forEach((x, i) => {
        const key = `${l.geometry}|${x.materialName}|${i + 1}|${x.thicknessMm}`;
        const s = surfaces.get(key) ?? {
          kind: l.geometry as 'vessel' | 'flat',
          material: x.materialName,
          layer: i + 1,
          thicknessMm: x.thicknessMm,
          areaM2: 0,
          volumeM3: 0,
        };
        s.areaM2 += a * w;
        s.volumeM3 += a * (x.thicknessMm / 1000) * w;
        surfaces.set(key, s);
      });
      const jk = `${l.jacketName}|flat`;
      const j = jackets.get(jk) ?? { jacket: l.jacketName, outsideDiameterMm: null, areaM2: 0 };
      j.areaM2 += a * ov;
      jackets.set(jk, j);
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
    schedule: schedule.sort((a, b) => a.tag.localeCompare(b.tag)),
    counted,
    pending,
    factors,
  };
}

export interface QuantityDelta {
  key: string;
  sheet: 'materials' | 'jackets' | 'surfaces';
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
  return rows;
}
