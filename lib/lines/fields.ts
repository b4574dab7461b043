/**
 * The line-list fields Lagwise understands, with the header words that usually name them in
 * engineering line lists (our own list of synonyms) and the units a column may be in.
 */
export type FieldKind = 'text' | 'number' | 'integer' | 'geometry' | 'size' | 'purposes' | 'location' | 'accessible';
export type UnitKind = 'temperature' | 'length-mm' | 'length-m' | 'area' | 'pressure' | 'flow' | 'cp' | 'none';

export interface FieldDef {
  key: LineFieldKey;
  label: string;
  kind: FieldKind;
  unit: UnitKind;
  required?: boolean;
  synonyms: string[];
}

export type LineFieldKey =
  | 'tag' | 'service' | 'area' | 'geometry' | 'nps' | 'outsideDiameter' | 'length' | 'surfaceArea' | 'height'
  | 'normalTemp' | 'maxTemp' | 'steamPressure' | 'flow' | 'fluidCp'
  | 'elbows' | 'tees' | 'valves' | 'flanges' | 'purposes' | 'location' | 'accessible' | 'jacket' | 'notes';

export const FIELDS: FieldDef[] = [
  { key: 'tag', label: 'Line / equipment tag', kind: 'text', unit: 'none', required: true, synonyms: ['tag', 'line', 'line no', 'line number', 'line tag', 'item', 'equipment', 'equipment tag', 'id', 'ref'] },
  { key: 'service', label: 'Service', kind: 'text', unit: 'none', synonyms: ['service', 'description', 'fluid', 'medium', 'duty'] },
  { key: 'area', label: 'Area / unit', kind: 'text', unit: 'none', synonyms: ['area', 'unit', 'plant area', 'zone', 'section'] },
  { key: 'geometry', label: 'Geometry', kind: 'geometry', unit: 'none', synonyms: ['geometry', 'type', 'object', 'orientation', 'kind'] },
  { key: 'nps', label: 'Nominal size (NPS or DN)', kind: 'size', unit: 'none', synonyms: ['nps', 'size', 'nominal size', 'dn', 'line size', 'pipe size', 'dia nominal'] },
  { key: 'outsideDiameter', label: 'Outside diameter', kind: 'number', unit: 'length-mm', synonyms: ['od', 'outside diameter', 'outer diameter', 'diameter', 'o d'] },
  { key: 'length', label: 'Length', kind: 'number', unit: 'length-m', synonyms: ['length', 'len', 'run length', 'pipe length'] },
  { key: 'surfaceArea', label: 'Surface area', kind: 'number', unit: 'area', synonyms: ['surface area', 'area m2', 'area ft2', 'surface', 'insulated area'] },
  { key: 'height', label: 'Height', kind: 'number', unit: 'length-m', synonyms: ['height', 'elevation height', 'shell height', 'wall height'] },
  { key: 'normalTemp', label: 'Normal operating temperature', kind: 'number', unit: 'temperature', required: true, synonyms: ['normal temperature', 'operating temperature', 'op temp', 'temp', 'temperature', 'normal temp', 'design temp normal', 'not'] },
  { key: 'maxTemp', label: 'Maximum operating temperature', kind: 'number', unit: 'temperature', synonyms: ['max temperature', 'maximum temperature', 'max temp', 'mot', 'max operating temperature', 'upset temperature'] },
  { key: 'steamPressure', label: 'Steam pressure (gauge)', kind: 'number', unit: 'pressure', synonyms: ['steam pressure', 'pressure', 'steam press', 'press'] },
  { key: 'flow', label: 'Mass flow', kind: 'number', unit: 'flow', synonyms: ['flow', 'mass flow', 'flow rate', 'flowrate'] },
  { key: 'fluidCp', label: 'Fluid specific heat', kind: 'number', unit: 'cp', synonyms: ['cp', 'specific heat', 'fluid cp', 'heat capacity'] },
  { key: 'elbows', label: 'Elbows', kind: 'integer', unit: 'none', synonyms: ['elbows', 'bends', 'elbow'] },
  { key: 'tees', label: 'Tees', kind: 'integer', unit: 'none', synonyms: ['tees', 'tee'] },
  { key: 'valves', label: 'Valves', kind: 'integer', unit: 'none', synonyms: ['valves', 'valve'] },
  { key: 'flanges', label: 'Flange pairs', kind: 'integer', unit: 'none', synonyms: ['flanges', 'flange pairs', 'flange'] },
  { key: 'purposes', label: 'Insulation purposes', kind: 'purposes', unit: 'none', synonyms: ['purpose', 'purposes', 'insulation purpose', 'insulation code', 'insulation type', 'ins code', 'function'] },
  { key: 'location', label: 'Indoor / outdoor', kind: 'location', unit: 'none', synonyms: ['location', 'indoor outdoor', 'in out', 'exposure', 'indoor', 'outdoor'] },
  { key: 'accessible', label: 'Accessible to people', kind: 'accessible', unit: 'none', synonyms: ['accessible', 'access', 'personnel access', 'reach', 'within reach', 'access height'] },
  { key: 'jacket', label: 'Jacket override', kind: 'text', unit: 'none', synonyms: ['jacket', 'cladding', 'jacketing', 'finish'] },
  { key: 'notes', label: 'Notes', kind: 'text', unit: 'none', synonyms: ['notes', 'remarks', 'comment', 'comments'] },
];

export const FIELD_BY_KEY = Object.fromEntries(FIELDS.map((f) => [f.key, f])) as Record<LineFieldKey, FieldDef>;

/** Units a column of each kind may be given in; the first is the default. */
export const UNIT_CHOICES: Record<UnitKind, string[]> = {
  temperature: ['°C', '°F'],
  'length-mm': ['mm', 'in'],
  'length-m': ['m', 'ft'],
  area: ['m²', 'ft²'],
  pressure: ['bar(g)', 'psig', 'kPa(g)'],
  flow: ['kg/s', 'kg/h', 't/h', 'lb/h'],
  cp: ['kJ/(kg·K)', 'Btu/(lb·°F)'],
  none: [''],
};

export type Purpose = 'heatConservation' | 'personnelProtection' | 'condensationControl' | 'processControl' | 'freezeProtection';
export const PURPOSE_LABEL: Record<Purpose, string> = {
  heatConservation: 'Heat conservation', personnelProtection: 'Personnel protection', condensationControl: 'Condensation control',
  processControl: 'Process control', freezeProtection: 'Freeze protection',
};
/** One-letter codes accepted in a purposes cell (H, P, C, T, F) besides the words. */
export const PURPOSE_CODES: Record<string, Purpose> = { h: 'heatConservation', p: 'personnelProtection', c: 'condensationControl', t: 'processControl', f: 'freezeProtection' };

export type LineGeometry = 'horizontal-pipe' | 'vertical-pipe' | 'vessel' | 'flat';
export const GEOMETRY_LABEL: Record<LineGeometry, string> = { 'horizontal-pipe': 'Horizontal pipe', 'vertical-pipe': 'Vertical pipe', vessel: 'Vessel', flat: 'Flat surface' };
/** Vessels and flat surfaces: sized by area, heat loss per m², blanket or board rather than pipe sections. */
export const isSurfaceGeometry = (g: string) => g === 'vessel' || g === 'flat';
