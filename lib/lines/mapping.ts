import { FIELDS, UNIT_CHOICES, type LineFieldKey, type ValueAnswers } from './fields';

export interface ColumnMapping {
  /** Column index (0-based) per field; absent = not mapped. */
  columns: Partial<Record<LineFieldKey, number>>;
  /** Unit chosen per field (from UNIT_CHOICES). */
  units: Partial<Record<LineFieldKey, string>>;
  /** Answers to value questions (a client's own words for location, purposes, geometry, access). */
  values?: ValueAnswers;
}

/** Lower-case words only, accents dropped: "Op. Temp [°F]" → "op temp f", "Länge" → "lange", "T/T" → "tt". */
export function normalizeHeader(h: string): string {
  return String(h ?? '')
    .toLowerCase()
    .replace(/\bt\s*[/-]\s*t\b/g, 'tt')
    .replace(/°/g, ' ')
    .replace(/[²]/g, '2')
    .replace(/ß/g, 'ss')
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9]+/g, ' ')
    .trim();
}

const UNIT_HINTS: [RegExp, string][] = [
  [/(^|\s)(deg\s*)?f(\s|$)|fahrenheit/, '°F'],
  [/(^|\s)(deg\s*)?c(\s|$)|celsius/, '°C'],
  [/(^|\s)mm(\s|$)/, 'mm'],
  [/(^|\s)(in|inch|inches)(\s|$)/, 'in'],
  [/(^|\s)(ft|feet)(\s|$)/, 'ft'],
  [/(^|\s)m(\s|$)/, 'm'],
  [/ft2|sq ft|square feet/, 'ft²'],
  [/m2|sq m/, 'm²'],
  [/psig|psi/, 'psig'],
  [/kpa/, 'kPa(g)'],
  [/bar/, 'bar(g)'],
  [/kg h|kg hr/, 'kg/h'],
  [/t h|tph/, 't/h'],
  [/lb h|lb hr/, 'lb/h'],
  [/kg s/, 'kg/s'],
  [/btu/, 'Btu/(lb·°F)'],
  [/kj/, 'kJ/(kg·K)'],
  // A size column: "DN", "Size (mm)", "Nennweite" hold DN numbers; "NPS", "Size (in)" inches.
  [/(^|\s)(dn|mm|nennweite|nw)(\s|$)/, 'DN'],
  [/(^|\s)(nps|in|inch|inches|zoll)(\s|$)/, 'NPS'],
];

function unitFromHeader(norm: string, key: LineFieldKey): string | undefined {
  const field = FIELDS.find((f) => f.key === key)!;
  const choices = UNIT_CHOICES[field.unit];
  for (const [re, unit] of UNIT_HINTS) if (re.test(norm) && choices.includes(unit)) return unit;
  return undefined;
}

/** Strips unit words so "Length (ft)" matches the synonym "length". */
function stripUnits(norm: string): string {
  return norm
    .replace(
      /\b(deg|c|f|mm|in|inch|inches|ft|feet|m|m2|ft2|psig|psi|kpa|bar|barg|g|kg|h|hr|s|t|lb|kj|btu|k|dn|zoll)\b/g,
      ' ',
    )
    .replace(/\s+/g, ' ')
    .trim();
}

const PASSES: ((n: string, syn: string) => boolean)[] = [
  (n, s) => n === s,
  (n, s) => stripUnits(n) === s,
  (n, s) => s.length >= 4 && ` ${n} `.includes(` ${s} `),
];

/**
 * The field a header names, with how sure the match is (0 exact, 1 after removing units, 2 a
 * synonym inside the header), or null. Header-row detection scores rows with it.
 */
export function matchHeader(header: string): { key: LineFieldKey; pass: number } | null {
  const n = normalizeHeader(header);
  if (!n) return null;
  const hit = MATCH_CACHE.get(n);
  if (hit !== undefined) return hit;
  let found: { key: LineFieldKey; pass: number } | null = null;
  for (let p = 0; p < PASSES.length && !found; p++)
    for (const f of FIELDS)
      if (f.synonyms.some((s) => PASSES[p](n, s))) {
        found = { key: f.key, pass: p };
        break;
      }
  if (MATCH_CACHE.size > 5000) MATCH_CACHE.clear();
  MATCH_CACHE.set(n, found);
  return found;
}
/** Header detection scores the same texts over and over (a merged title, repeated data words). */
const MATCH_CACHE = new Map<string, { key: LineFieldKey; pass: number } | null>();

/**
 * Suggests a mapping from header names: exact synonym, then synonym after removing unit words,
 * then a synonym contained in the header. Each column is used at most once; units come from the
 * header where it names one. A remembered mapping (by header text) wins when headers match.
 */
export function suggestMapping(
  headers: string[],
  remembered?: { headers: string[]; mapping: ColumnMapping },
): ColumnMapping {
  const norm = headers.map(normalizeHeader);
  const columns: ColumnMapping['columns'] = {};
  const units: ColumnMapping['units'] = {};
  const used = new Set<number>();
  const values = remembered?.mapping.values ? structuredClone(remembered.mapping.values) : undefined;
  if (remembered) {
    for (const [key, idx] of Object.entries(remembered.mapping.columns) as [LineFieldKey, number][]) {
      const header = remembered.headers[idx];
      const at = headers.indexOf(header);
      if (at >= 0 && !used.has(at)) {
        columns[key] = at;
        used.add(at);
        if (remembered.mapping.units[key]) units[key] = remembered.mapping.units[key];
      }
    }
  }
  for (const pass of PASSES) {
    for (const f of FIELDS) {
      if (columns[f.key] !== undefined) continue;
      const idx = norm.findIndex((n, i) => !used.has(i) && n && f.synonyms.some((s) => pass(n, s)));
      if (idx >= 0) {
        columns[f.key] = idx;
        used.add(idx);
      }
    }
  }
  for (const [key, idx] of Object.entries(columns) as [LineFieldKey, number][]) {
    units[key] ??= unitFromHeader(norm[idx], key) ?? UNIT_CHOICES[FIELDS.find((f) => f.key === key)!.unit][0];
  }
  return values ? { columns, units, values } : { columns, units };
}
