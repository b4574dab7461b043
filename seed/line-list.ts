/**
 * The demo line list — an invented Brack Point polymer works: steam and condensate at three
 * pressures, hot oil, hot water, process lines, chilled water, refrigerant suction, vessels and
 * flat surfaces, indoor and outdoor. Deterministic, so the seed and the example workbook agree.
 */
import ExcelJS from 'exceljs';

export const TEMPLATE_HEADERS = [
  'Line tag', 'Service', 'Area', 'Geometry', 'NPS', 'OD (mm)', 'Length (m)', 'Surface area (m2)', 'Height (m)',
  'Normal temp (°C)', 'Max temp (°C)', 'Steam pressure (barg)', 'Flow (kg/h)', 'Cp (kJ/kg K)',
  'Elbows', 'Tees', 'Valves', 'Flanges', 'Purpose', 'Location', 'Accessible', 'Jacket', 'Notes',
];

type Row = (string | number | null)[];

function rng(seed: number) {
  return () => { seed |= 0; seed = (seed + 0x6d2b79f5) | 0; let t = Math.imul(seed ^ (seed >>> 15), 1 | seed); t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t; return ((t ^ (t >>> 14)) >>> 0) / 4294967296; };
}

export function demoLineRows(count = 220, seed = 4471): Row[] {
  const r = rng(seed);
  const pick = <T,>(a: readonly T[]) => a[Math.floor(r() * a.length)];
  const areas = ['U20 Boiler house', 'U25 Steam mains', 'U30 Polymerisation', 'U35 Extrusion', 'U40 Utilities', 'U45 Tank farm'];
  const services = [
    { code: 'LS', name: 'Low-pressure steam', temp: 152, p: 4, sizes: ['1', '1-1/2', '2', '3', '4', '6', '8'], purpose: 'H,P' },
    { code: 'MS', name: 'Medium-pressure steam', temp: 186, p: 10.5, sizes: ['1', '2', '3', '4', '6', '8', '10'], purpose: 'H,P' },
    { code: 'HS', name: 'High-pressure steam', temp: 250, p: 39, sizes: ['2', '3', '4', '6', '8', '12'], purpose: 'H,P' },
    { code: 'SC', name: 'Steam condensate', temp: 120, p: null, sizes: ['3/4', '1', '1-1/2', '2', '3'], purpose: 'H,P' },
    { code: 'HO', name: 'Hot oil supply', temp: 290, p: null, sizes: ['2', '3', '4', '6'], purpose: 'H,P,T' },
    { code: 'HW', name: 'Hot water', temp: 85, p: null, sizes: ['1', '1-1/2', '2', '3', '4'], purpose: 'H,P' },
    { code: 'PR', name: 'Polymer melt transfer', temp: 235, p: null, sizes: ['2', '3', '4'], purpose: 'T,P,H' },
    { code: 'CW', name: 'Chilled water', temp: 6, p: null, sizes: ['2', '3', '4', '6', '8'], purpose: 'C,H' },
    { code: 'RS', name: 'Refrigerant suction', temp: -28, p: null, sizes: ['1', '1-1/2', '2', '3'], purpose: 'C' },
    { code: 'FW', name: 'Fire water ring (stagnant)', temp: 12, p: null, sizes: ['4', '6', '8'], purpose: 'F' },
  ] as const;
  const rows: Row[] = [];
  const used = new Set<string>();
  for (let i = 0; rows.length < count - 14; i++) {
    const s = pick(services);
    const nps = pick(s.sizes);
    const n = 100 + Math.floor(r() * 900);
    const tag = `${nps.replace('-', '').replace('/', '')}"-${s.code}-${n}-${pick(['A1', 'B2', 'C1', 'K3'])}`;
    if (used.has(tag)) continue;
    used.add(tag);
    const outdoor = s.code === 'FW' || r() < 0.55;
    const vertical = r() < 0.15;
    const flowKgH = s.code === 'HO' || s.code === 'PR' || s.code === 'HW' ? Math.round(2000 + r() * 40000) : null;
    const cp = s.code === 'HO' ? 2.5 : s.code === 'PR' ? 2.1 : s.code === 'HW' ? 4.19 : null;
    const access = r() < 0.6 ? 'yes' : r() < 0.5 ? 'no' : Number((1 + r() * 6).toFixed(1));
    rows.push([
      tag, s.name, pick(areas), vertical ? 'Vertical pipe' : 'Horizontal pipe', nps, null, Math.round(5 + r() * 180), null, vertical ? Math.round(4 + r() * 20) : null,
      s.temp + Math.round((r() - 0.5) * 6), s.temp + Math.round(5 + r() * 15), s.p, flowKgH, cp,
      Math.floor(r() * 12), Math.floor(r() * 4), Math.floor(r() * 5), Math.floor(r() * 6), s.purpose, outdoor ? 'Outdoor' : 'Indoor', access,
      null, r() < 0.1 ? 'Tie-in at rack crossing' : null,
    ]);
  }
  const vessels: Row[] = [
    ['V-2010', 'Deaerator', 'U20 Boiler house', 'Vessel', null, null, null, 64, 7.5, 105, 115, null, null, null, 0, 0, 0, 0, 'H,P', 'Indoor', 'yes', null, null],
    ['V-2020', 'Condensate receiver', 'U20 Boiler house', 'Vessel', null, null, null, 22, 3.2, 98, 110, null, null, null, 0, 0, 0, 0, 'H,P', 'Indoor', 'yes', null, null],
    ['T-4510', 'Hot oil expansion tank', 'U45 Tank farm', 'Vessel', null, null, null, 38, 4.0, 210, 240, null, null, null, 0, 0, 0, 0, 'H,P', 'Outdoor', 'no', 'Stainless steel', null],
    ['T-4520', 'Wax storage tank', 'U45 Tank farm', 'Vessel', null, null, null, 310, 9.0, 75, 85, null, null, null, 0, 0, 0, 0, 'H', 'Outdoor', 'no', null, 'Heated by coils'],
    ['E-3010', 'Reactor feed preheater shell', 'U30 Polymerisation', 'Vessel', null, null, null, 18, 5.5, 180, 195, 10.5, null, null, 0, 0, 0, 0, 'H,P', 'Indoor', 'yes', null, null],
    ['V-4010', 'Chilled water buffer', 'U40 Utilities', 'Vessel', null, null, null, 45, 4.5, 6, 8, null, null, null, 0, 0, 0, 0, 'C', 'Indoor', 'yes', null, null],
    ['V-4020', 'Ammonia separator', 'U40 Utilities', 'Vessel', null, null, null, 12, 3.0, -30, -28, null, null, null, 0, 0, 0, 0, 'C', 'Indoor', 'no', null, null],
    ['D-3510', 'Extruder die plate guard', 'U35 Extrusion', 'Flat', null, null, null, 4.5, 1.2, 240, 260, null, null, null, 0, 0, 0, 0, 'P', 'Indoor', 'yes', 'Mastic or cloth', null],
    ['D-2510', 'Flue gas duct', 'U20 Boiler house', 'Flat', null, null, null, 85, 2.0, 180, 220, null, null, null, 0, 0, 0, 0, 'H,P', 'Outdoor', 2.6, null, null],
    ['D-2520', 'Air preheater casing', 'U20 Boiler house', 'Flat', null, null, null, 40, 3.0, 150, 170, null, null, null, 0, 0, 0, 0, 'H,P', 'Indoor', 'yes', null, null],
    ['V-3020', 'Devolatiliser', 'U30 Polymerisation', 'Vessel', null, null, null, 56, 8.0, 245, 260, null, null, null, 0, 0, 0, 0, 'T,P', 'Indoor', 'yes', null, null],
    ['V-3030', 'Glycol drum', 'U30 Polymerisation', 'Vessel', null, null, null, 15, 2.5, 140, 150, null, null, null, 0, 0, 0, 0, 'H,P', 'Outdoor', 'yes', null, null],
    ['T-4530', 'Fire water tank (stagnant)', 'U45 Tank farm', 'Vessel', null, null, null, 420, 10, 10, 12, null, null, null, 0, 0, 0, 0, 'H', 'Outdoor', 'no', null, null],
    ['V-2030', 'Blowdown flash vessel', 'U20 Boiler house', 'Vessel', null, null, null, 9, 2.8, 165, 180, 6, null, null, 0, 0, 0, 0, 'P', 'Outdoor', 'yes', null, null],
  ];
  return [...rows, ...vessels];
}

export async function lineListWorkbook(rows: Row[], o: { withInstructions?: boolean } = {}): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Lagwise';
  const ws = wb.addWorksheet('Line list', { views: [{ state: 'frozen', ySplit: 1 }] });
  ws.addRow(TEMPLATE_HEADERS);
  ws.getRow(1).font = { bold: true };
  for (const r of rows) ws.addRow(r);
  ws.columns.forEach((c, i) => { c.width = Math.max(10, TEMPLATE_HEADERS[i].length + 2); });
  if (o.withInstructions) {
    const help = wb.addWorksheet('How to fill');
    [
      ['One row per line, vessel or flat surface. Units are in the headers; the import lets you change them (°F, in, ft, psig, lb/h).'],
      ['Geometry: Horizontal pipe, Vertical pipe, Vessel or Flat. Pipes need NPS (or OD) and length; vessels need their bare outside area (shell and both heads) and the shell height — they are solved as a shell with two flat heads; flat surfaces need area.'],
      ['Purpose: H heat conservation, P personnel protection, C condensation control, T process control, F freeze protection (comma-separated).'],
      ['Accessible: yes, no, or the height in metres above grade or platform (within 2.1 m counts as accessible, common practice).'],
      ['Jacket: leave empty for the design-basis jacket, or name one from the library or the project\'s own jackets (e.g. Stainless steel, PVC sheet).'],
    ].forEach((r) => help.addRow(r));
    help.getColumn(1).width = 120;
  }
  return Buffer.from(await wb.xlsx.writeBuffer());
}
