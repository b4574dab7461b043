import { pipeByDn, pipeByNps, parseNps } from '@/lib/thermal/pipes';
import {
  FIELD_BY_KEY,
  PURPOSE_CODES,
  UNIT_CHOICES,
  valueKey,
  type LineFieldKey,
  type LineGeometry,
  type Purpose,
  type ValueField,
} from './fields';
import type { ColumnMapping } from './mapping';
import { columnLetter, type CellValue, type ParsedSheet } from './parse';
import { HEAD_LABEL, parseHeadType, vesselAreaM2, type HeadType } from './vessel-area';

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
  /** Marked heat-traced in the line list (absent: not marked). */
  heatTraced?: boolean;
  notes: string;
}

export interface RowIssue {
  row: number;
  column: string | null;
  field: LineFieldKey | null;
  severity: 'error' | 'warning';
  message: string;
}
/** A value the file uses that we do not understand, once per distinct text, with where it occurs. */
export interface UnknownValue {
  field: ValueField;
  value: string;
  count: number;
  rows: number[];
  column: string;
}
export interface ValidationResult {
  lines: (LineInput & { sourceRow: number })[];
  issues: RowIssue[];
  errorCount: number;
  warningCount: number;
  /** Values to ask about in the mapping step (location "Pipe rack", purpose "ET" …). */
  unknownValues: UnknownValue[];
}

/** Within reach from grade or a platform: common practice takes about 2.1 m (7 ft). */
export const REACH_HEIGHT_M = 2.1;

const toSI: Record<string, (v: number) => number> = {
  '°C': (v) => v,
  '°F': (v) => (v - 32) / 1.8,
  mm: (v) => v,
  in: (v) => v * 25.4,
  m: (v) => v,
  ft: (v) => v * 0.3048,
  'm²': (v) => v,
  'ft²': (v) => v * 0.09290304,
  'bar(g)': (v) => v,
  psig: (v) => v * 0.0689475729,
  'kPa(g)': (v) => v / 100,
  'kg/s': (v) => v,
  'kg/h': (v) => v / 3600,
  't/h': (v) => v / 3.6,
  'lb/h': (v) => (v * 0.45359237) / 3600,
  'kJ/(kg·K)': (v) => v,
  'Btu/(lb·°F)': (v) => v * 4.1868,
};

export function convertToSI(value: number, unit: string | undefined): number {
  const f = unit ? toSI[unit] : undefined;
  return f ? f(value) : value;
}

/**
 * A number from a cell. Text is read as written: "1,250.5" (thousands commas), "12,5" (a decimal
 * comma), and — in a file that uses decimal commas — "1.250,5".
 */
export function parseNumber(v: CellValue, decimalComma = false): number | null | 'invalid' {
  if (v === null) return null;
  if (typeof v === 'number') return Number.isFinite(v) ? v : 'invalid';
  if (typeof v === 'boolean') return 'invalid';
  if (decimalComma) {
    const t = v.replace(/[\s\u00a0]/g, '');
    if (/^[-+]?\d{1,3}(\.\d{3})+(,\d+)?$/.test(t)) return Number(t.replace(/\./g, '').replace(',', '.'));
    if (/^[-+]?\d+(,\d+)?$/.test(t)) return Number(t.replace(',', '.'));
  }
  const s = v.replace(/[\s\u00a0]/g, '').replace(/,(?=\d{3}(\D|$))/g, '');
  if (/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(s)) return Number(s);
  if (/^[-+]?\d+,\d+$/.test(s)) return Number(s.replace(',', '.'));
  return 'invalid';
}

/** Lower case, accents and ß folded, inner spaces collapsed: "Außen" → "aussen". */
export function foldWord(v: string): string {
  return v
    .toLowerCase()
    .replace(/ß/g, 'ss')
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/\s+/g, ' ')
    .trim();
}

/** Geometry words, with the German, French, Spanish and Dutch ones our clients use. */
export function parseGeometry(v: string): LineGeometry | null {
  const s = foldWord(v);
  if (
    /^(h|hor|horiz|horizontal|horizontal pipe|pipe|piping|line|horizontale?|horizontaal|waagerecht|rohr|rohrleitung|tuyauterie|tuyau|tuberia|tubo|leiding|pijp)$/.test(
      s,
    )
  )
    return 'horizontal-pipe';
  if (/^(v|vert|vertical|vertical pipe|riser|vertikal|senkrecht|verticale|verticaal|steigleitung)$/.test(s))
    return 'vertical-pipe';
  if (
    /^(vessel|tank|drum|column|tower|equipment|exchanger|heat exchanger|reactor|behalter|behaelter|kessel|kolonne|apparat|reservoir|recipient|ballon|cuve|colonne|recipiente|tanque|deposito|columna|vat|ketel|kolom)$/.test(
      s,
    )
  )
    return 'vessel';
  if (
    /^(flat|wall|panel|duct|surface|flat surface|plate|flach|wand|kanal|plat|paroi|gaine|plano|pared|conducto|vlak|wand|kanaal)$/.test(
      s,
    )
  )
    return 'flat';
  return null;
}

/**
 * Purpose words by their start, English and the German, French, Spanish and Dutch words of
 * international line lists (our own list; accents folded first). Order matters: "anticondensation"
 * before "anti…", "protection du personnel" is personnel protection, "hors gel" freeze protection.
 */
const PURPOSE_WORDS: [RegExp, Purpose][] = [
  [
    /^(hc|heat|conservation|energy|warm|waerm|chaleur|calor|conserv|thermique|warmtebehoud|hitze|energie)/,
    'heatConservation',
  ],
  [
    /^(pp|personnel|protection|burn|person|beruhr|beruehr|beruhrungsschutz|personal|personeel|brandwond|verbrennung|proteccion|persoons)/,
    'personnelProtection',
  ],
  [
    /^(cc|cond|anti.?sweat|anti.?cond|cold|kalt|kaelt|schwitz|tauwasser|froid|frio|koude|koud|kaelteschutz)/,
    'condensationControl',
  ],
  [/^(pc|process|prozess|procede|proceso|proces)/, 'processControl'],
  [
    /^(fp|freeze|frost|winter|hors ?gel|antigel|anti.?gel|gel\b|congel|anticongel|antihielo|helada|vorst)/,
    'freezeProtection',
  ],
];
/** Words that join purpose words and mean nothing alone. */
const PURPOSE_FILLERS =
  /^(and|of|the|du|de|des|la|le|et|y|del|en|van|het|und|der|die|das|gegen|contre|contra|tegen|control|kontrolle|controle|schutz)$/;

export function parsePurposes(v: string): Purpose[] | null {
  const out = new Set<Purpose>();
  const word = (p: string): Purpose | 'filler' | null => {
    if (PURPOSE_CODES[p]) return PURPOSE_CODES[p];
    for (const [re, purpose] of PURPOSE_WORDS) if (re.test(p)) return purpose;
    return PURPOSE_FILLERS.test(p) ? 'filler' : null;
  };
  for (const part of foldWord(v)
    .split(/\s*(?:[,;/+&]|\band\b|\bund\b|\bet\b|\by\b|\ben\b)\s*/)
    .filter(Boolean)) {
    // A whole phrase first ("hors gel", "protection du personnel"), then word by word.
    const whole = word(part);
    if (whole && whole !== 'filler') {
      out.add(whole);
      continue;
    }
    let any = false;
    for (const w of part.split(/[\s-]+/).filter(Boolean)) {
      const r = word(w);
      if (r === null) return null;
      if (r !== 'filler') {
        out.add(r);
        any = true;
      }
    }
    if (!any) return null;
  }
  return out.size ? [...out] : null;
}

/** Indoor or outdoor from a word, in the languages above; null when the word is not one of ours. */
export function parseLocation(v: string): 'indoor' | 'outdoor' | null {
  const s = foldWord(v);
  if (
    /^(in|indoor|indoors|inside|i|interior|internal|innen|drinnen|halle|gebaude|interieur|dedans|binnen|inpandig)$/.test(
      s,
    )
  )
    return 'indoor';
  if (
    /^(out|outdoor|outdoors|outside|o|exterior|external|aussen|ausen|draussen|im freien|freiluft|exterieur|dehors|a l exterieur|intemperie|buiten)$/.test(
      s,
    )
  )
    return 'outdoor';
  return null;
}

export function parseYesNo(v: CellValue): boolean | null {
  if (typeof v === 'boolean') return v;
  const s = foldWord(String(v));
  if (
    /^(y|yes|true|1|x|accessible|ja|j|oui|si|sim|zuganglich|accesible|toegankelijk|wahr|vrai|verdadero)$/.test(
      s,
    )
  )
    return true;
  if (
    /^(n|no|false|0|-|not accessible|nein|non|nee|nao|falsch|faux|falso|nicht zuganglich|inaccessible)$/.test(
      s,
    )
  )
    return false;
  return null;
}

/**
 * A heat-tracing cell: yes/no words in the languages the import reads, or a word naming tracing
 * ("ET", "electric", "traced", "beheizt", "tracé") or its absence ("none", "untraced", "ohne").
 */
export function parseTraced(v: CellValue): boolean | null {
  const yn = parseYesNo(v);
  if (yn !== null) return yn;
  const s = foldWord(String(v));
  if (
    /^(traced|heat traced|tracing|trace|ht|et|eht|electric|electrical|electric tracing|elektrisch|beheizt|begleitbeheizt|trace electrique|traceado|traza|calefaccion|verwarmd|getraced)$/.test(
      s,
    )
  )
    return true;
  if (
    /^(none|not traced|untraced|no tracing|without|ohne|nicht beheizt|sans|non trace|sin|ninguno|geen|onverwarmd)$/.test(
      s,
    )
  )
    return false;
  return null;
}

const VALUE_HINT: Record<ValueField, string> = {
  heatTraced: 'yes or no (traced or not)',
  location: 'indoor or outdoor',
  accessible: 'yes, no or a height',
  geometry: 'horizontal pipe, vertical pipe, vessel or flat',
  purposes:
    'H heat conservation, P personnel protection, C condensation control, T process control, F freeze protection',
  headType: '2:1 semi-ellipsoidal, hemispherical, torispherical, flat or cone roof',
};

/** Every field that must be mapped for a line to be read: one sentence naming those missing, or null. */
export function missingRequired(mapping: ColumnMapping): string | null {
  const has = (k: LineFieldKey) => mapping.columns[k] !== undefined && mapping.columns[k] !== null;
  const missing: string[] = [];
  if (!has('tag')) missing.push(`"${FIELD_BY_KEY.tag.label}"`);
  if (!has('normalTemp')) missing.push(`"${FIELD_BY_KEY.normalTemp.label}"`);
  if (!has('nps') && !has('outsideDiameter') && !has('surfaceArea') && !has('shellDiameter'))
    missing.push(
      `a size ("${FIELD_BY_KEY.nps.label}" or "${FIELD_BY_KEY.outsideDiameter.label}" for pipes, "${FIELD_BY_KEY.surfaceArea.label}" or "${FIELD_BY_KEY.shellDiameter.label}" for vessels, "${FIELD_BY_KEY.surfaceArea.label}" for flat surfaces)`,
    );
  if (!missing.length) return null;
  const list =
    missing.length === 1
      ? missing[0]
      : `${missing.slice(0, -1).join(', ')} and ${missing[missing.length - 1]}`;
  return `No column is mapped to ${list}, which ${missing.length === 1 ? 'is' : 'are'} required. Choose the column${missing.length === 1 ? '' : 's'} in the mapping.`;
}

/**
 * Validates every row against the mapping: units converted to SI, every problem pinned to its
 * spreadsheet row and column. Nothing is stored here; the caller imports only when errorCount is 0.
 */
/**
 * `jackets` (id and lower-case name → id, from the project's catalogue) lets a jacket override be
 * written as a name; an override it does not know is kept, with a warning that the band's jacket is used.
 */
export function validateSheet(
  sheet: ParsedSheet,
  mapping: ColumnMapping,
  jackets?: Map<string, string>,
): ValidationResult {
  const issues: RowIssue[] = [];
  const lines: (LineInput & { sourceRow: number })[] = [];
  const formula = new Set(sheet.formulaCells),
    merged = new Set(sheet.mergedCells);
  const col = (k: LineFieldKey) => mapping.columns[k] ?? undefined;
  const unknownValues: UnknownValue[] = [];
  const sheetError = (field: LineFieldKey | null, message: string) =>
    issues.push({ row: sheet.headerRow, column: null, field, severity: 'error', message });
  const missing = missingRequired(mapping);
  if (missing) sheetError(null, missing);
  const width = Math.max(sheet.headers.length, ...sheet.rows.slice(0, 50).map((r) => r.cells.length));
  for (const [k, c] of Object.entries(mapping.columns) as [LineFieldKey, number | undefined][]) {
    if (c === undefined || c === null) continue;
    if (!FIELD_BY_KEY[k]) {
      sheetError(null, `"${k}" is not a field Lagwise reads; remove it from the mapping.`);
      continue;
    }
    if (!Number.isInteger(c) || c < 0 || c >= width)
      sheetError(
        k,
        `The column chosen for "${FIELD_BY_KEY[k].label}" is not a column of sheet "${sheet.name}"; choose one of its columns.`,
      );
  }
  for (const [k, u] of Object.entries(mapping.units) as [LineFieldKey, string | undefined][]) {
    const f = FIELD_BY_KEY[k];
    if (!f || u === undefined || u === '' || f.unit === 'none') continue;
    if (!UNIT_CHOICES[f.unit].includes(u))
      sheetError(k, `"${u}" is not a unit for "${f.label}"; use ${UNIT_CHOICES[f.unit].join(', ')}.`);
  }
  if (
    col('length') === undefined &&
    (col('nps') !== undefined || col('outsideDiameter') !== undefined) &&
    col('surfaceArea') === undefined &&
    col('shellDiameter') === undefined
  ) {
    sheetError(
      'length',
      `No column is mapped to "${FIELD_BY_KEY.length.label}"; pipes need their length. Choose the length column in the mapping.`,
    );
  }
  if (issues.length) return { lines, issues, errorCount: issues.length, warningCount: 0, unknownValues };
  if (sheet.rows.length === 0) {
    issues.push({
      row: sheet.headerRow,
      column: null,
      field: null,
      severity: 'error',
      message: `Sheet "${sheet.name}" has a header row but no lines below it (header on row ${sheet.headerRow}).`,
    });
    return { lines, issues, errorCount: 1, warningCount: 0, unknownValues };
  }
  const decimalComma = sheet.decimalComma ?? false;
  // A value we do not know is one question (and one problem) per distinct text, not one per row.
  const unknown = new Map<string, UnknownValue>();
  const answer = (f: ValueField, v: string): string | undefined => mapping.values?.[f]?.[valueKey(v)];
  const noteUnknown = (f: ValueField, v: string, row: number) => {
    const key = `${f}\u0000${valueKey(v)}`;
    const u = unknown.get(key);
    if (u) {
      u.count++;
      if (u.rows.length < 5) u.rows.push(row);
    } else unknown.set(key, { field: f, value: v, count: 1, rows: [row], column: columnLetter(col(f)!) });
  };

  const seen = new Map<string, number>();
  let headAssumed = false;
  for (const { row, cells } of sheet.rows) {
    let bad = false;
    const err = (k: LineFieldKey | null, message: string) => {
      bad = true;
      issues.push({
        row,
        column: k && col(k) !== undefined ? columnLetter(col(k)!) : null,
        field: k,
        severity: 'error',
        message,
      });
    };
    const warn = (k: LineFieldKey | null, message: string) =>
      issues.push({
        row,
        column: k && col(k) !== undefined ? columnLetter(col(k)!) : null,
        field: k,
        severity: 'warning',
        message,
      });
    const raw = (k: LineFieldKey): CellValue => {
      const c = col(k);
      if (c === undefined) return null;
      const ref = `${columnLetter(c)}${row}`;
      if (formula.has(ref)) warn(k, `Cell ${ref} holds a formula; its last calculated value was used.`);
      if (merged.has(ref)) warn(k, `Cell ${ref} is part of a merged range; the merged value was used.`);
      return cells[c] ?? null;
    };
    const text = (k: LineFieldKey) => {
      const v = raw(k);
      return v === null ? '' : String(v).trim();
    };
    const num = (
      k: LineFieldKey,
      o: { min?: number; max?: number; integer?: boolean } = {},
    ): number | null => {
      const v = raw(k);
      const n = parseNumber(v, decimalComma);
      if (n === 'invalid') {
        err(k, `${FIELD_BY_KEY[k].label} must be a number; the cell holds "${String(v)}".`);
        return null;
      }
      if (n === null) return null;
      // A length in metres may be written in millimetres (equipment lists give T/T lengths in mm).
      const si =
        FIELD_BY_KEY[k].unit === 'length-m' && mapping.units[k] === 'mm'
          ? n / 1000
          : convertToSI(n, mapping.units[k]);
      if (o.integer && !Number.isInteger(n)) {
        err(k, `${FIELD_BY_KEY[k].label} must be a whole number; the cell holds ${n}.`);
        return null;
      }
      if (o.min !== undefined && si < o.min) {
        err(
          k,
          `${FIELD_BY_KEY[k].label} ${n} ${mapping.units[k] ?? ''} is below the allowed minimum.`.replace(
            / {2}/g,
            ' ',
          ),
        );
        return null;
      }
      if (o.max !== undefined && si > o.max) {
        err(
          k,
          `${FIELD_BY_KEY[k].label} ${n} ${mapping.units[k] ?? ''} is above the allowed maximum.`.replace(
            / {2}/g,
            ' ',
          ),
        );
        return null;
      }
      return si;
    };

    const tag = text('tag');
    if (!tag) err('tag', 'The tag is empty; every line needs a unique tag.');
    else if (seen.has(tag.toUpperCase()))
      err('tag', `Duplicate tag "${tag}": also in row ${seen.get(tag.toUpperCase())}.`);
    else seen.set(tag.toUpperCase(), row);

    const normalTempC = num('normalTemp', { min: -200, max: 1000 });
    if (normalTempC === null && raw('normalTemp') === null)
      err('normalTemp', 'The normal operating temperature is empty.');
    const maxTempC = num('maxTemp', { min: -200, max: 1000 });
    if (normalTempC !== null && maxTempC !== null && maxTempC < normalTempC)
      err(
        'maxTemp',
        `The maximum temperature (${maxTempC.toFixed(1)} °C) is below the normal temperature (${normalTempC.toFixed(1)} °C).`,
      );

    // Geometry: given, or inferred from the size and area columns.
    const gText = text('geometry');
    const gAnswer = gText ? answer('geometry', gText) : undefined;
    let geometry: LineGeometry | null = gText
      ? ((gAnswer as LineGeometry | undefined) ?? parseGeometry(gText))
      : null;
    if (gText && !geometry) {
      bad = true;
      noteUnknown('geometry', gText, row);
    }
    const npsText = text('nps');
    let od = num('outsideDiameter', { min: 5, max: 10000 });
    // "TBD" and the like mean the length is not known yet: the line imports as incomplete.
    const lenCell = col('length') === undefined ? null : (cells[col('length')!] ?? null);
    const lengthTbd =
      typeof lenCell === 'string' &&
      /^(tbd|tba|tbc|n\/?a|\?+|-+|—|later|offen|a definir|à définir|a confirmar|por definir|nnb)$/i.test(
        lenCell.trim(),
      );
    const lengthM = lengthTbd ? null : num('length', { min: 0, max: 100000 });
    let surfaceAreaM2 = num('surfaceArea', { min: 0, max: 1e6 });
    let heightM = num('height', { min: 0, max: 500 });
    // Equipment given by its shell: outside diameter, length (tangent to tangent) or height, head type.
    const shellMm = num('shellDiameter', { min: 50, max: 100000 });
    if (shellMm !== null) {
      const horizontal = geometry === 'horizontal-pipe';
      if (geometry === 'flat')
        err(
          'geometry',
          `"${gText}" is a flat surface, but the row gives a vessel shell diameter; clear one of them.`,
        );
      else if (geometry || !gText) geometry = 'vessel';
      const shellL = num('shellLength', { min: 0, max: 500 });
      const hText = text('headType');
      let head: HeadType | null = null;
      if (hText) {
        head = (answer('headType', hText) as HeadType | undefined) ?? parseHeadType(hText);
        if (!head) {
          bad = true;
          noteUnknown('headType', hText, row);
        }
      } else {
        head = 'ellipsoidal';
        if (col('headType') !== undefined)
          warn('headType', 'No head type given; 2:1 semi-ellipsoidal heads assumed for the area.');
        else if (!headAssumed) {
          headAssumed = true;
          issues.push({
            row: sheet.headerRow,
            column: null,
            field: 'headType',
            severity: 'warning',
            message:
              "No column gives the vessels' head type; 2:1 semi-ellipsoidal heads are assumed for their areas.",
          });
        }
      }
      if (shellL === null && raw('shellLength') === null)
        err(
          col('shellLength') === undefined ? 'shellDiameter' : 'shellLength',
          'A vessel given by its shell diameter needs its shell length (tangent to tangent) or height.',
        );
      if (!bad && shellL !== null && head && geometry === 'vessel') {
        const area = vesselAreaM2(shellMm / 1000, shellL, head);
        if (surfaceAreaM2 !== null && Math.abs(surfaceAreaM2 - area) > 0.1 * area)
          warn(
            'surfaceArea',
            `The area given (${surfaceAreaM2.toFixed(1)} m²) differs from the shell and ${HEAD_LABEL[head].toLowerCase()} ${head === 'cone-roof' ? '' : 'heads '}(${area.toFixed(1)} m²); the area given was used.`,
          );
        surfaceAreaM2 ??= area;
        if (horizontal) {
          heightM ??= shellMm / 1000;
          warn(
            'geometry',
            'A horizontal vessel is solved as a vertical shell of the same outside area, as tall as its diameter (horizontal vessels are not a geometry of their own yet).',
          );
        } else heightM ??= shellL;
      }
    }
    if (!gText && shellMm === null)
      geometry =
        npsText || od !== null
          ? 'horizontal-pipe'
          : surfaceAreaM2 !== null
            ? heightM !== null
              ? 'vessel'
              : 'flat'
            : null;
    if (!geometry && !gText)
      err(
        'geometry',
        'Give the geometry, or a size (NPS or outside diameter) for a pipe, or an area for a vessel or flat surface.',
      );

    let nps: string | null = null;
    const pipe = geometry === 'horizontal-pipe' || geometry === 'vertical-pipe';
    if (npsText) {
      if (!pipe && geometry)
        err(
          'nps',
          `A ${geometry === 'vessel' ? 'vessel' : 'flat surface'} has no nominal pipe size; clear "${npsText}" or change the geometry.`,
        );
      else {
        const dn =
          /^dn\s*(\d+)$/i.exec(npsText) ??
          (mapping.units.nps === 'DN' ? /^(\d+)(?:\s*mm)?$/i.exec(npsText) : null);
        const size = dn
          ? pipeByDn(Number(dn[1]))
          : pipeByNps(decimalComma ? npsText.replace(',', '.') : npsText);
        if (!size && /^\S+\s*[x×]\s*\S+$/i.test(npsText))
          err(
            'nps',
            `"${npsText}" is a reducer (two sizes); give the line one size, or split it into a line per size.`,
          );
        else if (!size)
          err(
            'nps',
            `"${npsText}" is not a nominal pipe size (NPS ⅛–48 or DN 6–1200)${mapping.units.nps === 'DN' ? '' : '; if the column holds DN numbers, choose the unit DN'}.`,
          );
        else {
          nps = size.nps;
          if (od !== null && Math.abs(od - size.outsideDiameterMm) > 1)
            warn(
              'outsideDiameter',
              `Outside diameter ${od.toFixed(1)} mm differs from NPS ${size.nps} (${size.outsideDiameterMm} mm); the diameter given was used.`,
            );
          od ??= size.outsideDiameterMm;
        }
      }
    } else if (npsText === '' && raw('nps') === null && !Number.isNaN(parseNps(''))) {
      /* no size given */
    }
    if (pipe && od === null && !bad)
      err(npsText ? 'nps' : 'outsideDiameter', 'A pipe needs its NPS or outside diameter.');
    if (pipe && lengthM === null && !bad)
      warn(
        'length',
        `${lengthTbd ? `Length "${String(lenCell).trim()}"` : 'No length'}: the line imports as incomplete — solved per metre, left out of the heat-loss totals and the bill until a revision gives its length.`,
      );
    if (!pipe && geometry && surfaceAreaM2 === null && shellMm === null)
      err('surfaceArea', `A ${geometry === 'vessel' ? 'vessel' : 'flat surface'} needs its surface area.`);
    if (geometry === 'vessel' && heightM === null && shellMm === null)
      err('height', 'A vessel needs its height.');

    const pText = text('purposes');
    let purposes: Purpose[] = [];
    let noPurpose = false;
    if (pText) {
      const a = answer('purposes', pText);
      const p = a === 'none' ? [] : parsePurposes(a ?? pText);
      if (a === 'none') noPurpose = true;
      else if (!p) {
        bad = true;
        noteUnknown('purposes', pText, row);
      } else purposes = p;
    }

    const lText = text('location');
    let outdoor = true;
    if (lText) {
      const loc = (answer('location', lText) as 'indoor' | 'outdoor' | undefined) ?? parseLocation(lText);
      if (!loc) {
        bad = true;
        noteUnknown('location', lText, row);
      } else outdoor = loc === 'outdoor';
    }
    const aRaw = raw('accessible');
    let accessible = true,
      accessHeightM: number | null = null;
    if (aRaw !== null) {
      const n = parseNumber(aRaw, decimalComma);
      const a = answer('accessible', String(aRaw));
      if (a) accessible = a === 'yes';
      else if (typeof n === 'number') {
        accessHeightM = convertToSI(n, mapping.units.height ?? 'm');
        accessible = accessHeightM <= REACH_HEIGHT_M;
      } else {
        const yn = parseYesNo(aRaw);
        if (yn === null) {
          bad = true;
          noteUnknown('accessible', String(aRaw).trim(), row);
        } else accessible = yn;
      }
    }

    const tRaw = raw('heatTraced');
    let heatTraced = false;
    if (tRaw !== null && String(tRaw).trim() !== '') {
      const a = answer('heatTraced', String(tRaw));
      const t = a ? a === 'yes' : parseTraced(tRaw);
      if (t === null) {
        bad = true;
        noteUnknown('heatTraced', String(tRaw).trim(), row);
      } else heatTraced = t;
    }

    const counts = (['elbows', 'tees', 'valves', 'flanges'] as const).map(
      (k) => num(k, { min: 0, max: 100000, integer: true }) ?? 0,
    );
    const flowKgPerS = num('flow', { min: 0, max: 1e5 });
    const fluidCp = num('fluidCp', { min: 0.1, max: 20 });
    const steam = num('steamPressure', { min: -1, max: 160 });
    if (steam !== null && normalTempC !== null && steam > 0 && !pText)
      purposes = ['heatConservation', 'personnelProtection'];

    if (noPurpose) {
      warn('purposes', `"${pText}" was answered as no insulation purpose; the line is left out.`);
      continue;
    }
    if (!bad && normalTempC !== null && geometry) {
      if (purposes.length === 0) {
        purposes = normalTempC < 15 ? ['condensationControl'] : ['heatConservation', 'personnelProtection'];
        warn(
          'purposes',
          `No purpose given; assumed ${normalTempC < 15 ? 'condensation control (cold line)' : 'heat conservation and personnel protection (hot line)'}.`,
        );
      }
      let jacketId = text('jacket') || null;
      if (jacketId && jackets) {
        const known = jackets.get(jacketId) ?? jackets.get(jacketId.toLowerCase());
        if (known) jacketId = known;
        else
          warn(
            'jacket',
            `Jacket "${jacketId}" is not in the library or the project's jackets; the specification band's jacket is used.`,
          );
      }
      lines.push({
        sourceRow: row,
        tag,
        service: text('service'),
        area: text('area') || 'Unassigned',
        geometry,
        nps,
        outsideDiameterMm: pipe ? od : null,
        lengthM: pipe ? lengthM : null,
        surfaceAreaM2: pipe ? null : surfaceAreaM2,
        heightM,
        normalTempC,
        maxTempC,
        steamPressureBarG: steam,
        flowKgPerS,
        fluidCpKJPerKgK: fluidCp,
        elbows: counts[0],
        tees: counts[1],
        valves: counts[2],
        flanges: counts[3],
        purposes,
        outdoor,
        accessible,
        accessHeightM,
        jacketId,
        heatTraced,
        notes: text('notes'),
      });
    }
  }
  for (const u of unknown.values()) {
    const label = FIELD_BY_KEY[u.field].label;
    const where =
      u.count === 1
        ? `row ${u.rows[0]}`
        : `${u.count} rows (${u.rows.join(', ')}${u.count > u.rows.length ? ', …' : ''})`;
    issues.push({
      row: u.rows[0],
      column: u.column,
      field: u.field,
      severity: 'error',
      message: `${label} "${u.value}" in ${where} is not a word Lagwise knows (${VALUE_HINT[u.field]}); say what it means under "Values to answer".`,
    });
    unknownValues.push(u);
  }
  issues.sort((a, b) => a.row - b.row);
  const errorCount = issues.filter((i) => i.severity === 'error').length;
  return { lines, issues, errorCount, warningCount: issues.length - errorCount, unknownValues };
}
