/** The bill workbook's "Heat tracing" sheet (pure: no database), from the schedule of lib/boq/tracing.ts. */
import type ExcelJS from 'exceljs';
import { convert } from '@/lib/format';
import { TRACING_STANDARD } from '@/lib/lines/tracing-labels';
import { safeText } from './workbook';

export interface TracingRow {
  tag: string;
  area: string;
  size: string;
  reason: string;
  thicknessMm: number;
  maintainC: number;
  ambientC: number;
  windMs: number;
  heatLossWPerM: number;
  safetyFactor: number;
  requiredWPerM: number;
  runM: number;
  tracerM: number;
  requiredW: number;
}

const r = (v: number, d = 3) => Math.round(v * 10 ** d) / 10 ** d;

/** The "Heat tracing" sheet: one row per traced line, totals below, units in the headers. */
export function addTracingSheet(wb: ExcelJS.Workbook, rows: TracingRow[], o: { us: boolean }) {
  const LU = o.us ? 'ft' : 'm';
  const len = (m: number) => (o.us ? r(convert.mToFt(m)) : m);
  const temp = (c: number) => (o.us ? r(convert.cToF(c), 1) : c);
  const TU = o.us ? '°F' : '°C';
  const perLen = (w: number) => (o.us ? r(w * 0.3048) : w);
  const PU = o.us ? 'W/ft' : 'W/m';
  const headers = [
    'Tag',
    'Area',
    'Size',
    'Traced because',
    'Insulation (mm)',
    `Maintain (${TU})`,
    `Min. ambient (${TU})`,
    'Wind (m/s)',
    `Heat loss at maintain (${PU})`,
    'Safety factor',
    `Required tracer output (${PU})`,
    `Pipe run (${LU})`,
    `Tracer length (${LU})`,
    'Duty (kW electrical)',
  ];
  const ws = wb.addWorksheet('Heat tracing', { views: [{ state: 'frozen', ySplit: 1 }] });
  ws.addRow(headers);
  ws.getRow(1).font = { bold: true };
  for (const t of rows)
    ws.addRow([
      safeText(t.tag),
      safeText(t.area),
      t.size,
      t.reason,
      t.thicknessMm,
      temp(t.maintainC),
      temp(t.ambientC),
      t.windMs,
      perLen(t.heatLossWPerM),
      t.safetyFactor,
      perLen(t.requiredWPerM),
      len(t.runM),
      len(t.tracerM),
      r(t.requiredW / 1000, 4),
    ]);
  ws.autoFilter = { from: { row: 1, column: 1 }, to: { row: 1, column: headers.length } };
  headers.forEach((h, i) => {
    ws.getColumn(i + 1).width = Math.max(12, h.length + 2);
  });
  ws.addRow([]);
  ws.addRow([
    'Total',
    '',
    '',
    `${rows.length} lines`,
    null,
    null,
    null,
    null,
    null,
    null,
    null,
    r(len(rows.reduce((s, t) => s + t.runM, 0))),
    r(len(rows.reduce((s, t) => s + t.tracerM, 0))),
    r(rows.reduce((s, t) => s + t.requiredW, 0) / 1000, 4),
  ]).font = { bold: true };
  ws.addRow([]);
  ws.addRow([
    'Basis',
    `${TRACING_STANDARD}: required output = heat loss at the maintain temperature in the minimum design ambient and wind, at the chosen thickness, × safety factor, with fittings as equivalent lengths spread over the run. Tracer length = run + allowance per fitting and support (common practice). Tracer selection, circuits, sheath temperature and hazardous-area limits follow the manufacturer and the local electrical code.`,
  ]);
  return ws;
}
