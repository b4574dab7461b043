import { pipeByDn, pipeByNps, parseNps } from '@/lib/thermal/pipes';
import { FIELD_BY_KEY, PURPOSE_CODES, type LineFieldKey, type LineGeometry, type Purpose } from './fields';
import type { ColumnMapping } from './mapping';
import { columnLetter, type CellValue, type ParsedSheet } from './parse';

/** One line of the line list in canonical SI units. */
export interface LineInput {
  tag: string;
  service: string;
  area: string;
  geometry: LineGeometry;
  nps: string | null;
  outsideDiameterMm: number | null;
  lengthM: number | null;
  surfaceAreaM2: number | null;
  heightM: number | null;
  normalTempC: number;
  maxTempC: number | null;
  steamPressureBarG: number | null;
  flowKgPerS: number | null;
  fluidCpKJPerKgK: number | null;
  elbows: number;
  tees: number;
  valves: number;
  flanges: number;
  purposes: Purpose[];
  outdoor: boolean;
  accessible: boolean;
  accessHeightM: number | null;
  jacketId: string | null;
  notes: string;
}

export interface RowIssue { row: number; column: string | null; field: LineFieldKey | null; severity: 'error' | 'warning'; message: string }
export interface ValidationResult { lines: (LineInput & { sourceRow: number })[]; issues: RowIssue[]; errorCount: number; warningCount: number }

/** Within reach from grade or a platform: common practice takes about 2.1 m (7 ft). */
export const REACH_HEIGHT_M = 2.1;

const toSI: Record<string, (v: number) => number> = {
  '°C': (v) => v, '°F': (v) => (v - 32) / 1.8,
  mm: (v) => v, in: (v) => v * 25.4,
  m: (v) => v, ft: (v) => v * 0.3048,
  'm²': (v) => v, 'ft²': (v) => v * 0.09290304,
  'bar(g)': (v) => v, psig: (v) => v * 0.0689475729, 'kPa(g)': (v) => v / 100,
  'kg/s': (v) => v, 'kg/h': (v) => v / 3600, 't/h': (v) => v / 3.6, 'lb/h': (v) => (v * 0.45359237) / 3600,
  'kJ/(kg·K)': (v) => v, 'Btu/(lb·°F)': (v) => v * 4.1868,
};

export function convertToSI(value: number, unit: string | undefined): number {
  const f = unit ? toSI[unit] : undefined;
  return f ? f(value) : value;
}

function parseNumber(v: CellValue): number | null | 'invalid' {
  if (v === null) return null;
  if (typeof v === 'number') return Number.isFinite(v) ? v : 'invalid';
  if (typeof v === 'boolean') return 'invalid';
  const s = v.replace(/\s/g, '').replace(/,(?=\d{3}(\D|$))/g, '');
  if (/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(s)) return Number(s);
  if (/^[-+]?\d+,\d+$/.test(s)) return Number(s.replace(',', '.'));
  return 'invalid';
}

export function parseGeometry(v: string): LineGeometry | null {
  const s = v.toLowerCase().trim();
  if (/^(h|hor|horiz|horizontal|horizontal pipe|pipe|piping|line)$/.test(s)) return 'horizontal-pipe';
  if (/^(v|vert|vertical|vertical pipe|riser)$/.test(s)) return 'vertical-pipe';
  if (/^(vessel|tank|drum|column|tower|equipment|exchanger|heat exchanger|reactor)$/.test(s)) return 'vessel';
  if (/^(flat|wall|panel|duct|surface|flat surface|plate)$/.test(s)) return 'flat';
  return null;
}

export function parsePurposes(v: string): Purpose[] | null {
  const out = new Set<Purpose>();
  for (const part of v.split(/[,;/+\s]+/).filter(Boolean)) {
    const p = part.toLowerCase();
    if (PURPOSE_CODES[p]) out.add(PURPOSE_CODES[p]);
    else if (/^(hc|heat|conservation|energy)/.test(p)) out.add('heatConservation');
    else if (/^(pp|personnel|protection|burn)/.test(p)) out.add('personnelProtection');
    else if (/^(cc|cond|condensation|anti.?sweat|cold)/.test(p)) out.add('condensationControl');
    else if (/^(pc|process)/.test(p)) out.add('processControl');
    else if (/^(fp|freeze|frost|winter)/.test(p)) out.add('freezeProtection');
    else return null;
  }
  return [...out];
}

function parseYesNo(v: CellValue): boolean | null {
  if (typeof v === 'boolean') return v;
  const s = String(v).toLowerCase().trim();
  if (/^(y|yes|true|1|x|accessible)$/.test(s)) return true;
  if (/^(n|no|false|0|-|not accessible)$/.test(s)) return false;
  return null;
}

/**
 * Validates every row against the mapping: units converted to SI, every problem pinned to its
 * spreadsheet row and column. Nothing is stored here; the caller imports only when errorCount is 0.
 */
/**
 * `jackets` (id and lower-case name → id, from the project's catalogue) lets a jacket override be
 * written as a name; an override it does not know is kept, with a warning that the band's jacket is used.
 */
export function validateSheet(sheet: ParsedSheet, mapping: ColumnMapping, jackets?: Map<string, string>): ValidationResult {
  const issues: RowIssue[] = [];
  const lines: (LineInput & { sourceRow: number })[] = [];
  const formula = new Set(sheet.formulaCells), merged = new Set(sheet.mergedCells);
  const col = (k: LineFieldKey) => mapping.columns[k];
  for (const req of ['tag', 'normalTemp'] as LineFieldKey[]) {
    if (col(req) === undefined) issues.push({ row: sheet.headerRow, column: null, field: req, severity: 'error', message: `No column is mapped to "${FIELD_BY_KEY[req].label}", which is required.` });
  }
  if (issues.length) return { lines, issues, errorCount: issues.length, warningCount: 0 };
  if (sheet.rows.length === 0) {
    issues.push({ row: sheet.headerRow, column: null, field: null, severity: 'error', message: `Sheet "${sheet.name}" has a header row but no lines.` });
    return { lines, issues, errorCount: 1, warningCount: 0 };
  }

  const seen = new Map<string, number>();
  for (const { row, cells } of sheet.rows) {
    let bad = false;
    const err = (k: LineFieldKey | null, message: string) => { bad = true; issues.push({ row, column: k && col(k) !== undefined ? columnLetter(col(k)!) : null, field: k, severity: 'error', message }); };
    const warn = (k: LineFieldKey | null, message: string) => issues.push({ row, column: k && col(k) !== undefined ? columnLetter(col(k)!) : null, field: k, severity: 'warning', message });
    const raw = (k: LineFieldKey): CellValue => {
      const c = col(k);
      if (c === undefined) return null;
      const ref = `${columnLetter(c)}${row}`;
      if (formula.has(ref)) warn(k, `Cell ${ref} holds a formula; its last calculated value was used.`);
      if (merged.has(ref)) warn(k, `Cell ${ref} is part of a merged range; the merged value was used.`);
      return cells[c] ?? null;
    };
    const text = (k: LineFieldKey) => { const v = raw(k); return v === null ? '' : String(v).trim(); };
    const num = (k: LineFieldKey, o: { min?: number; max?: number; integer?: boolean } = {}): number | null => {
      const v = raw(k);
      const n = parseNumber(v);
      if (n === 'invalid') { err(k, `${FIELD_BY_KEY[k].label} must be a number; the cell holds "${String(v)}".`); return null; }
      if (n === null) return null;
      const si = convertToSI(n, mapping.units[k]);
      if (o.integer && !Number.isInteger(n)) { err(k, `${FIELD_BY_KEY[k].label} must be a whole number; the cell holds ${n}.`); return null; }
      if (o.min !== undefined && si < o.min) { err(k, `${FIELD_BY_KEY[k].label} ${n} ${mapping.units[k] ?? ''} is below the allowed minimum.`.replace(/ {2}/g, ' ')); return null; }
      if (o.max !== undefined && si > o.max) { err(k, `${FIELD_BY_KEY[k].label} ${n} ${mapping.units[k] ?? ''} is above the allowed maximum.`.replace(/ {2}/g, ' ')); return null; }
      return si;
    };

    const tag = text('tag');
    if (!tag) err('tag', 'The tag is empty; every line needs a unique tag.');
    else if (seen.has(tag.toUpperCase())) err('tag', `Duplicate tag "${tag}": also in row ${seen.get(tag.toUpperCase())}.`);
    else seen.set(tag.toUpperCase(), row);

    const normalTempC = num('normalTemp', { min: -200, max: 1000 });
    if (normalTempC === null && raw('normalTemp') === null) err('normalTemp', 'The normal operating temperature is empty.');
    const maxTempC = num('maxTemp', { min: -200, max: 1000 });
    if (normalTempC !== null && maxTempC !== null && maxTempC < normalTempC) err('maxTemp', `The maximum temperature (${maxTempC.toFixed(1)} °C) is below the normal temperature (${normalTempC.toFixed(1)} °C).`);

    // Geometry: given, or inferred from the size and area columns.
    const gText = text('geometry');
    let geometry: LineGeometry | null = gText ? parseGeometry(gText) : null;
    if (gText && !geometry) err('geometry', `Unknown geometry "${gText}"; use horizontal pipe, vertical pipe, vessel or flat.`);
    const npsText = text('nps');
    let od = num('outsideDiameter', { min: 5, max: 10000 });
    const lengthM = num('length', { min: 0, max: 100000 });
    const surfaceAreaM2 = num('surfaceArea', { min: 0, max: 1e6 });
    const heightM = num('height', { min: 0, max: 500 });
    if (!gText) geometry = npsText || od !== null ? 'horizontal-pipe' : surfaceAreaM2 !== null ? (heightM !== null ? 'vessel' : 'flat') : null;
    if (!geometry && !gText) err('geometry', 'Give the geometry, or a size (NPS or outside diameter) for a pipe, or an area for a vessel or flat surface.');

    let nps: string | null = null;
    const pipe = geometry === 'horizontal-pipe' || geometry === 'vertical-pipe';
    if (npsText) {
      if (!pipe && geometry) err('nps', `A ${geometry === 'vessel' ? 'vessel' : 'flat surface'} has no nominal pipe size; clear "${npsText}" or change the geometry.`);
      else {
        const dn = /^dn\s*(\d+)$/i.exec(npsText);
        const size = dn ? pipeByDn(Number(dn[1])) : pipeByNps(npsText);
        if (!size) err('nps', `"${npsText}" is not a nominal pipe size (NPS ⅛–48 or DN 6–1200).`);
        else {
          nps = size.nps;
          if (od !== null && Math.abs(od - size.outsideDiameterMm) > 1) warn('outsideDiameter', `Outside diameter ${od.toFixed(1)} mm differs from NPS ${size.nps} (${size.outsideDiameterMm} mm); the diameter given was used.`);
          od ??= size.outsideDiameterMm;
        }
      }
    } else if (npsText === '' && raw('nps') === null && !Number.isNaN(parseNps(''))) { /* no size given */ }
    if (pipe && od === null && !bad) err(npsText ? 'nps' : 'outsideDiameter', 'A pipe needs its NPS or outside diameter.');
    if (pipe && lengthM === null && !bad) err('length', 'A pipe needs its length.');
    if (!pipe && geometry && surfaceAreaM2 === null) err('surfaceArea', `A ${geometry === 'vessel' ? 'vessel' : 'flat surface'} needs its surface area.`);
    if (geometry === 'vessel' && heightM === null) err('height', 'A vessel needs its height.');

    const pText = text('purposes');
    let purposes: Purpose[] = [];
    if (pText) {
      const p = parsePurposes(pText);
      if (!p) err('purposes', `Unknown purpose in "${pText}"; use H (heat conservation), P (personnel protection), C (condensation control), T (process control), F (freeze protection).`);
      else purposes = p;
    }

    const lText = text('location').toLowerCase();
    let outdoor = true;
    if (lText) {
      if (/^(in|indoor|indoors|inside|i)$/.test(lText)) outdoor = false;
      else if (!/^(out|outdoor|outdoors|outside|o)$/.test(lText)) err('location', `Location "${lText}" is neither indoor nor outdoor.`);
    }
    const aRaw = raw('accessible');
    let accessible = true, accessHeightM: number | null = null;
    if (aRaw !== null) {
      const n = parseNumber(aRaw);
      if (typeof n === 'number') { accessHeightM = convertToSI(n, mapping.units.height ?? 'm'); accessible = accessHeightM <= REACH_HEIGHT_M; }
      else {
        const yn = parseYesNo(aRaw);
        if (yn === null) err('accessible', `Accessible must be yes, no or a height in metres; the cell holds "${String(aRaw)}".`);
        else accessible = yn;
      }
    }

    const counts = (['elbows', 'tees', 'valves', 'flanges'] as const).map((k) => num(k, { min: 0, max: 100000, integer: true }) ?? 0);
    const flowKgPerS = num('flow', { min: 0, max: 1e5 });
    const fluidCp = num('fluidCp', { min: 0.1, max: 20 });
    const steam = num('steamPressure', { min: -1, max: 160 });
    if (steam !== null && normalTempC !== null && steam > 0 && !pText) purposes = ['heatConservation', 'personnelProtection'];

    if (!bad && normalTempC !== null && geometry) {
      if (purposes.length === 0) {
        purposes = normalTempC < 15 ? ['condensationControl'] : ['heatConservation', 'personnelProtection'];
        warn('purposes', `No purpose given; assumed ${normalTempC < 15 ? 'condensation control (cold line)' : 'heat conservation and personnel protection (hot line)'}.`);
      }
      let jacketId = text('jacket') || null;
      if (jacketId && jackets) {
        const known = jackets.get(jacketId) ?? jackets.get(jacketId.toLowerCase());
        if (known) jacketId = known;
        else warn('jacket', `Jacket "${jacketId}" is not in the library or the project's jackets; the specification band's jacket is used.`);
      }
      lines.push({
        sourceRow: row, tag, service: text('service'), area: text('area') || 'Unassigned', geometry, nps,
        outsideDiameterMm: pipe ? od : null, lengthM: pipe ? lengthM : null, surfaceAreaM2: pipe ? null : surfaceAreaM2, heightM,
        normalTempC, maxTempC, steamPressureBarG: steam, flowKgPerS, fluidCpKJPerKgK: fluidCp,
        elbows: counts[0], tees: counts[1], valves: counts[2], flanges: counts[3],
        purposes, outdoor, accessible, accessHeightM, jacketId, notes: text('notes'),
      });
    }
  }
  const errorCount = issues.filter((i) => i.severity === 'error').length;
  return { lines, issues, errorCount, warningCount: issues.length - errorCount };
}
