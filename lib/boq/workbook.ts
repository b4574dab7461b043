import ExcelJS from 'exceljs';
import type { BillQuantities, QuantityDelta } from './quantities';
import { convert } from '@/lib/format';
import { addTracingSheet } from './tracing-sheet';

/**
 * Text that a spreadsheet could read as a formula (= + - @, and tab/CR that some programs strip)
 * is written with a leading apostrophe, as OWASP advises against formula injection.
 */
export function safeText(v: string): string {
  return /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
}

function sheet(
  wb: ExcelJS.Workbook,
  name: string,
  headers: string[],
  rows: (string | number | null)[][],
  widths?: number[],
) {
  const ws = wb.addWorksheet(name, { views: [{ state: 'frozen', ySplit: 1 }] });
  ws.addRow(headers);
  ws.getRow(1).font = { bold: true };
  for (const r of rows) ws.addRow(r.map((v) => (typeof v === 'string' ? safeText(v) : v)));
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: headers.length } };
  headers.forEach((h, i) => {
    ws.getColumn(i + 1).width = widths?.[i] ?? Math.max(12, h.length + 2);
  });
  return ws;
}

export interface BillMeta {
  projectCode: string;
  projectName: string;
  site: string;
  organization: string;
  issueNumber: number;
  issuedAt: Date;
  issuedBy: string;
  basisRevision: number;
  lineListRevision:
    | number
    | null /** Add inch columns beside the millimetres (projects on the inch series or US units). */;
  inches?: boolean;
  /** US customary: lengths in ft, areas in ft², volumes in ft³ (thickness keeps mm beside inches). */ unitSystem?:
    | 'SI'
    | 'US';
  /** ISO 4217 code of the prices; with material prices per m³ (by material name) the summary prices the material. */ currency?: string;
  materialPricePerM3?: Record<string, number>;
}

/** Millimetres as inches to 1/1000 in (1 in = 25.4 mm exactly): 76.2 → 3, 9.525 → 0.375. */
export const mmToInches = (mm: number) => Math.round((mm / 25.4) * 1000) / 1000;

/** The contractor's workbook: numbers as numbers, units in the headers, frozen headers and filters. */
export async function billWorkbook(
  q: BillQuantities,
  meta: BillMeta,
  delta: QuantityDelta[],
): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Lagwise';
  wb.created = meta.issuedAt;
  // With inches, each thickness column is followed by the same thickness in inches.
  const inch = meta.inches === true;
  const th = (label: string) => (inch ? [label, label.replace('(mm)', '(in)')] : [label]);
  const tv = (mm: number) => (inch ? [mm, mmToInches(mm)] : [mm]);
  const tw = (w: number) => (inch ? [w, w] : [w]);
  const us = meta.unitSystem === 'US';
  const r4 = (v: number) => Math.round(v * 1e4) / 1e4;
  const len = (m: number | null) => (m === null ? null : us ? r4(convert.mToFt(m)) : m);
  const area = (m2: number | null) => (m2 === null ? null : us ? r4(convert.m2ToFt2(m2)) : m2);
  const vol = (m3: number) => (us ? r4(m3 / (0.3048 * 0.3048 * 0.3048)) : m3);
  const LU = us ? 'ft' : 'm',
    AU = us ? 'ft²' : 'm²',
    VU = us ? 'ft³' : 'm³';
  const priced = meta.currency && meta.materialPricePerM3;
  const price = (name: string, m3: number) => {
    const p = meta.materialPricePerM3?.[name];
    return p === undefined ? null : Math.round(p * m3 * 100) / 100;
  };
  sheet(
    wb,
    'Summary',
    [
      'Material',
      'Product form',
      'Layer',
      'Size',
      ...th('Thickness (mm)'),
      `Length incl. waste (${LU})`,
      `Outer-face area (${AU})`,
      `Volume (${VU})`,
      ...(priced ? [`Material at design-basis price (${meta.currency})`] : []),
    ],
    q.materials.map((r) => [
      r.material,
      r.productForm,
      r.layer,
      r.size,
      ...tv(r.thicknessMm),
      len(r.lengthM),
      area(r.areaM2),
      vol(r.volumeM3),
      ...(priced ? [price(r.material, r.volumeM3)] : []),
    ]),
    [32, 14, 8, 16, ...tw(14), 22, 20, 14, 30],
  );
  sheet(
    wb,
    'Fittings',
    [
      'Size',
      ...th('Insulation thickness (mm)'),
      'Elbows (count)',
      'Tees (count)',
      'Valves (count)',
      'Flange pairs (count)',
      `Equivalent length (${LU})`,
    ],
    q.fittings.map((r) => [
      r.size,
      ...tv(r.thicknessMm),
      r.elbows,
      r.tees,
      r.valves,
      r.flanges,
      len(r.equivalentLengthM),
    ]),
  );
  sheet(
    wb,
    'Removable covers',
    ['Item', 'Line size', ...th('Insulation thickness (mm)'), 'Covers (count)'],
    (q.covers ?? []).map((r) => [r.item, r.size, ...tv(r.thicknessMm), r.count]),
    [14, 16, ...tw(26), 16],
  );
  sheet(
    wb,
    'Jacketing',
    [
      'Jacket',
      ...th('Outside diameter over insulation (mm)'),
      'Sheet thickness (mm)',
      `Area incl. laps (${AU})`,
    ],
    q.jackets.map((r) => [
      r.jacket,
      ...(inch
        ? [r.outsideDiameterMm, r.outsideDiameterMm === null ? null : mmToInches(r.outsideDiameterMm)]
        : [r.outsideDiameterMm]),
      r.sheetThicknessMm ?? null,
      area(r.areaM2),
    ]),
    [28, ...tw(34), 20, 22],
  );
  const accUnit = (u: string) => (u === 'm' ? LU : u === 'm²' ? AU : u);
  const accVal = (u: string, v: number) => (u === 'm' ? len(v) : u === 'm²' ? area(v) : v);
  sheet(
    wb,
    'Accessories',
    ['Item', 'Size', 'Unit', 'Quantity'],
    (q.accessories ?? []).map((r) => [r.item, r.size, accUnit(r.unit), accVal(r.unit, r.quantity)]),
    [38, 18, 8, 14],
  );
  sheet(
    wb,
    'Vessels and flat',
    [
      'Surface',
      'Material',
      'Product form',
      'Layer',
      ...th('Thickness (mm)'),
      `Area incl. waste (${AU})`,
      `Volume (${VU})`,
    ],
    q.surfaces.map((r) => [
      r.kind,
      r.material,
      r.productForm ?? '',
      r.layer,
      ...tv(r.thicknessMm),
      area(r.areaM2),
      vol(r.volumeM3),
    ]),
    [14, 32, 18, 8, ...tw(14), 20, 14],
  );
  sheet(
    wb,
    'Line schedule',
    [
      'Tag',
      'Area',
      'Size',
      `Length (${LU})`,
      `Area (${AU})`,
      'Layers',
      ...th('Total thickness (mm)'),
      'Jacket',
      'Bill status',
      'Review status',
    ],
    q.schedule.map((r) => [
      r.tag,
      r.area,
      r.size,
      len(r.lengthM),
      area(r.areaM2),
      r.layers,
      ...tv(r.totalMm),
      r.jacket,
      r.status,
      r.reviewStatus,
    ]),
    [20, 20, 14, 11, 11, 48, ...tw(18), 22, 40, 22],
  );
  if (q.tracing?.length) addTracingSheet(wb, q.tracing, { us });
  sheet(
    wb,
    'Change from previous',
    ['Sheet', 'Item', 'Quantity', 'Previous issue', 'This issue', 'Change'],
    delta.map((d) => [d.sheet, d.key, d.quantity, d.before, d.after, d.change]),
    [12, 60, 12, 16, 14, 12],
  );
  const f = q.factors;
  const notes = wb.addWorksheet('Notes');
  [
    ['Project', `${meta.projectCode} — ${meta.projectName}`],
    ['Site', meta.site],
    ['Organization', meta.organization],
    ['Bill issue', meta.issueNumber],
    ['Issued', `${meta.issuedAt.toISOString().slice(0, 16).replace('T', ' ')} UTC`],
    ['Issued by', meta.issuedBy],
    ['Design-basis revision', meta.basisRevision],
    ['Line-list revision', meta.lineListRevision ?? '—'],
    ['Lines counted', q.counted],
    ['Lines pending (not counted)', q.pending],
    ['Waste allowance', f.wasteFraction],
    ['Jacket overlap allowance (vessels and flat surfaces)', f.jacketOverlapFraction],
    [`Equivalent length per elbow (${LU})`, len(f.equivalentLengthM.elbow)],
    [`Equivalent length per tee (${LU})`, len(f.equivalentLengthM.tee)],
    [
      'Valves and flange pairs',
      f.removableCovers === false
        ? 'left bare (design basis): no covers counted'
        : 'removable covers, counted by line size (sheet Removable covers)',
    ],
    ['Later layers', 'sized by the outside diameter they fit over (the layer below), not by the pipe size'],
    [
      'Basis of factors',
      'Allowances and fitting equivalents are common-practice estimates set for the project; confirm them against the installation specification.',
    ],
    [
      'Caution',
      'Thicknesses come from engineering estimates by published methods with typical material data (verify with the manufacturer). Personnel-protection and condensation decisions follow local codes and a qualified person.',
    ],
    [
      'Pending lines',
      'Lines not yet decided, needing re-decision, or awaiting safety sign-off are listed in the line schedule as pending and are not in the quantities.',
    ],
    [
      'Units',
      us
        ? 'US customary: ft, ft², ft³ (1 ft = 0.3048 m exactly); thicknesses in mm and in.'
        : 'SI: m, m², m³; thicknesses in mm.',
    ],
    ...(priced
      ? [
          [
            'Currency',
            `${meta.currency} (ISO 4217): material prices per m³ from the design basis, waste included; labour, jacketing and accessories are not in this column.`,
          ],
        ]
      : []),
    ...(f.accessories
      ? [
          ['Accessory factors', 'value', 'source'],
          ...Object.entries(f.accessories).map(([k, v]) =>
            'rows' in v
              ? [
                  k,
                  v.rows
                    .map(
                      (r: { maxOdMm: number | null; thicknessMm: number }) =>
                        `${r.thicknessMm} mm${r.maxOdMm === null ? ' above' : ` up to OD ${r.maxOdMm} mm`}`,
                    )
                    .join('; '),
                  v.source,
                ]
              : [k, v.value, v.source],
          ),
        ]
      : []),
  ].forEach((r) => {
    notes.addRow(r.map((v) => (typeof v === 'string' ? safeText(v) : v)));
  });
  notes.getColumn(1).width = 36;
  notes.getColumn(2).width = 110;
  notes.getColumn(3).width = 90;
  notes.getColumn(1).font = { bold: true };
  return Buffer.from(await wb.xlsx.writeBuffer());
}
