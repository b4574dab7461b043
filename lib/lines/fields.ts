/**
 * The line-list fields Lagwise understands, with the header words that usually name them in
 * engineering line lists (our own list of synonyms) and the units a column may be in.
 */
export type FieldKind =
  | 'text'
  | 'number'
  | 'integer'
  | 'geometry'
  | 'size'
  | 'purposes'
  | 'location'
  | 'accessible'
  | 'traced'
  | 'head';
export type UnitKind =
  | 'temperature'
  | 'length-mm'
  | 'length-m'
  | 'area'
  | 'pressure'
  | 'flow'
  | 'cp'
  | 'size'
  | 'none';

export interface FieldDef {
  key: LineFieldKey;
  label: string;
  kind: FieldKind;
  unit: UnitKind;
  required?: boolean;
  synonyms: string[];
}

export type LineFieldKey =
  | 'tag'
  | 'service'
  | 'area'
  | 'geometry'
  | 'nps'
  | 'outsideDiameter'
  | 'length'
  | 'surfaceArea'
  | 'height'
  | 'shellDiameter'
  | 'shellLength'
  | 'headType'
  | 'normalTemp'
  | 'maxTemp'
  | 'steamPressure'
  | 'flow'
  | 'fluidCp'
  | 'elbows'
  | 'tees'
  | 'valves'
  | 'flanges'
  | 'purposes'
  | 'location'
  | 'accessible'
  | 'jacket'
  | 'heatTraced'
  | 'notes';

export const FIELDS: FieldDef[] = [
  {
    key: 'tag',
    label: 'Line / equipment tag',
    kind: 'text',
    unit: 'none',
    required: true,
    synonyms: [
      'tag',
      'line',
      'line no',
      'line number',
      'line tag',
      'item',
      'equipment',
      'equipment tag',
      'id',
      'ref',
      'line id',
      'line no.',
      'tag no',
      'tag number',
      'leitung',
      'leitungsnummer',
      'leitungs nr',
      'rohrleitung',
      'kennzeichen',
      'anlagenkennzeichen',
      'repere',
      'numero de ligne',
      'no de ligne',
      'ligne',
      'linea',
      'numero de linea',
      'n de linea',
      'identificacion',
      'leiding',
      'leidingnummer',
      'leiding nr',
      'nummer',
    ],
  },
  {
    key: 'service',
    label: 'Service',
    kind: 'text',
    unit: 'none',
    synonyms: [
      'service',
      'description',
      'fluid',
      'medium',
      'duty',
      'service description',
      'fluid description',
      'medium description',
      'commodity',
      'stoff',
      'fluide',
      'fluido',
      'servicio',
      'medio',
      'dienst',
      'product',
      'produit',
      'producto',
      'produkt',
    ],
  },
  {
    key: 'area',
    label: 'Area / unit',
    kind: 'text',
    unit: 'none',
    synonyms: [
      'area',
      'unit',
      'plant area',
      'zone',
      'section',
      'bereich',
      'anlage',
      'anlagenteil',
      'zone de l usine',
      'secteur',
      'unidad',
      'gebied',
      'eenheid',
    ],
  },
  {
    key: 'geometry',
    label: 'Geometry',
    kind: 'geometry',
    unit: 'none',
    synonyms: [
      'geometry',
      'type',
      'object',
      'orientation',
      'kind',
      'geometrie',
      'geometria',
      'lage',
      'ausrichtung',
      'orientatie',
      'orientacion',
    ],
  },
  {
    key: 'nps',
    label: 'Nominal size (NPS or DN)',
    kind: 'size',
    unit: 'size',
    synonyms: [
      'nps',
      'size',
      'nominal size',
      'dn',
      'line size',
      'pipe size',
      'dia nominal',
      'nominal bore',
      'nb',
      'bore',
      'size in',
      'nennweite',
      'nw',
      'diametre nominal',
      'dn mm',
      'diametro nominal',
      'tamano',
      'nominale diameter',
      'maat',
    ],
  },
  {
    key: 'outsideDiameter',
    label: 'Outside diameter',
    kind: 'number',
    unit: 'length-mm',
    synonyms: [
      'od',
      'outside diameter',
      'outer diameter',
      'diameter',
      'o d',
      'aussendurchmesser',
      'da',
      'diametre exterieur',
      'diametro exterior',
      'buitendiameter',
    ],
  },
  {
    key: 'length',
    label: 'Length',
    kind: 'number',
    unit: 'length-m',
    synonyms: [
      'length',
      'len',
      'run length',
      'pipe length',
      'pipe run',
      'laenge',
      'lange',
      'rohrlange',
      'longueur',
      'longitud',
      'lengte',
    ],
  },
  {
    key: 'surfaceArea',
    label: 'Surface area',
    kind: 'number',
    unit: 'area',
    synonyms: [
      'surface area',
      'area m2',
      'area ft2',
      'surface',
      'insulated area',
      'flache',
      'oberflache',
      'surface m2',
      'superficie',
      'oppervlak',
      'oppervlakte',
    ],
  },
  {
    key: 'height',
    label: 'Height',
    kind: 'number',
    unit: 'length-m',
    synonyms: ['height', 'elevation height', 'wall height', 'hohe', 'hauteur', 'altura', 'hoogte'],
  },
  {
    key: 'shellDiameter',
    label: 'Vessel shell outside diameter',
    kind: 'number',
    unit: 'length-mm',
    synonyms: [
      'shell od',
      'shell diameter',
      'shell outside diameter',
      'vessel od',
      'vessel diameter',
      'tank diameter',
      'equipment diameter',
      'od shell',
      'shell o d',
      'manteldurchmesser',
      'behalterdurchmesser',
      'diametre virole',
      'diametro de la envolvente',
      'manteldiameter',
    ],
  },
  {
    key: 'shellLength',
    label: 'Vessel shell length (tangent to tangent) or height',
    kind: 'number',
    unit: 'length-m',
    synonyms: [
      'tan tan',
      'tan to tan',
      'tangent to tangent',
      't t',
      'tt',
      't t length',
      'tt length',
      'tangent length',
      'shell length',
      'shell height',
      'tank height',
      'vessel length',
      'vessel height',
      'mantellange',
      'mantelhohe',
      'longueur virole',
      'hauteur virole',
      'longitud entre tangentes',
      'mantellengte',
    ],
  },
  {
    key: 'headType',
    label: 'Vessel head type',
    kind: 'head',
    unit: 'none',
    synonyms: [
      'head',
      'heads',
      'head type',
      'ends',
      'end type',
      'roof',
      'roof type',
      'boden',
      'bodenform',
      'boden art',
      'fond',
      'fonds',
      'type de fond',
      'fondo',
      'tipo de fondo',
      'bodem',
      'bodemtype',
    ],
  },
  {
    key: 'normalTemp',
    label: 'Normal operating temperature',
    kind: 'number',
    unit: 'temperature',
    required: true,
    synonyms: [
      'normal temperature',
      'operating temperature',
      'op temp',
      'temp',
      'temperature',
      'normal temp',
      'design temp normal',
      'not',
      'operating temp',
      'oper temp',
      'operating temperature normal',
      'normal operating temperature',
      'betriebstemperatur',
      'betriebstemp',
      'betriebs temp',
      'temperatur',
      'temp normal',
      'temperature de service',
      'temperature',
      'temperatura de operacion',
      'temperatura',
      'bedrijfstemperatuur',
      'temperatuur',
    ],
  },
  {
    key: 'maxTemp',
    label: 'Maximum operating temperature',
    kind: 'number',
    unit: 'temperature',
    synonyms: [
      'max temperature',
      'maximum temperature',
      'max temp',
      'mot',
      'max operating temperature',
      'upset temperature',
      'design temp',
      'design temperature',
      'max operating temp',
      'max oper temp',
      'maximaltemperatur',
      'max temperatur',
      'auslegungstemperatur',
      'temperature maximale',
      'temperatura maxima',
      'maximale temperatuur',
    ],
  },
  {
    key: 'steamPressure',
    label: 'Steam pressure (gauge)',
    kind: 'number',
    unit: 'pressure',
    synonyms: [
      'steam pressure',
      'pressure',
      'steam press',
      'press',
      'dampfdruck',
      'druck',
      'pression',
      'presion',
      'druk',
    ],
  },
  {
    key: 'flow',
    label: 'Mass flow',
    kind: 'number',
    unit: 'flow',
    synonyms: [
      'flow',
      'mass flow',
      'flow rate',
      'flowrate',
      'durchfluss',
      'massenstrom',
      'debit',
      'caudal',
      'debiet',
    ],
  },
  {
    key: 'fluidCp',
    label: 'Fluid specific heat',
    kind: 'number',
    unit: 'cp',
    synonyms: ['cp', 'specific heat', 'fluid cp', 'heat capacity'],
  },
  { key: 'elbows', label: 'Elbows', kind: 'integer', unit: 'none', synonyms: ['elbows', 'bends', 'elbow'] },
  { key: 'tees', label: 'Tees', kind: 'integer', unit: 'none', synonyms: ['tees', 'tee'] },
  { key: 'valves', label: 'Valves', kind: 'integer', unit: 'none', synonyms: ['valves', 'valve'] },
  {
    key: 'flanges',
    label: 'Flange pairs',
    kind: 'integer',
    unit: 'none',
    synonyms: ['flanges', 'flange pairs', 'flange'],
  },
  {
    key: 'purposes',
    label: 'Insulation purposes',
    kind: 'purposes',
    unit: 'none',
    synonyms: [
      'purpose',
      'purposes',
      'insulation purpose',
      'insulation code',
      'insulation type',
      'ins code',
      'function',
      'insulation function',
      'isolierzweck',
      'zweck',
      'dammzweck',
      'isolierart',
      'fonction',
      'but',
      'type d isolation',
      'proposito',
      'funcion',
      'tipo de aislamiento',
      'doel',
      'isolatiedoel',
      'isolatie type',
      'service class',
    ],
  },
  {
    key: 'location',
    label: 'Indoor / outdoor',
    kind: 'location',
    unit: 'none',
    synonyms: [
      'location',
      'indoor outdoor',
      'in out',
      'exposure',
      'indoor',
      'outdoor',
      'in outdoor',
      'indoor outdoor location',
      'innen aussen',
      'aufstellung',
      'aufstellungsort',
      'ort',
      'emplacement',
      'interieur exterieur',
      'ubicacion',
      'interior exterior',
      'locatie',
      'binnen buiten',
      'plaats',
    ],
  },
  {
    key: 'accessible',
    label: 'Accessible to people',
    kind: 'accessible',
    unit: 'none',
    synonyms: [
      'accessible',
      'access',
      'personnel access',
      'reach',
      'within reach',
      'access height',
      'zuganglich',
      'beruhrbar',
      'acces',
      'accesible',
      'toegankelijk',
      'bereikbaar',
    ],
  },
  {
    key: 'jacket',
    label: 'Jacket override',
    kind: 'text',
    unit: 'none',
    synonyms: [
      'jacket',
      'cladding',
      'jacketing',
      'finish',
      'ummantelung',
      'blechmantel',
      'revetement',
      'tole',
      'recubrimiento',
      'bekleding',
      'beplating',
    ],
  },
  {
    key: 'heatTraced',
    label: 'Heat traced',
    kind: 'traced',
    unit: 'none',
    synonyms: [
      'heat tracing',
      'heat traced',
      'tracing',
      'traced',
      'trace heating',
      'trace heated',
      'electric tracing',
      'electrical tracing',
      'electric heat tracing',
      'ht',
      'et',
      'eht',
      'begleitheizung',
      'rohrbegleitheizung',
      'elektrische begleitheizung',
      'beheizt',
      'begleitbeheizt',
      'tracage',
      'tracage electrique',
      'rechauffage',
      'traceado',
      'traceado electrico',
      'calefaccion electrica',
      'tracing elektrisch',
      'elektrische tracing',
      'heat tracing ja nee',
    ],
  },
  {
    key: 'notes',
    label: 'Notes',
    kind: 'text',
    unit: 'none',
    synonyms: [
      'notes',
      'remarks',
      'comment',
      'comments',
      'bemerkungen',
      'bemerkung',
      'anmerkung',
      'remarques',
      'observations',
      'observaciones',
      'notas',
      'opmerkingen',
    ],
  },
];

export const FIELD_BY_KEY = Object.fromEntries(FIELDS.map((f) => [f.key, f])) as Record<
  LineFieldKey,
  FieldDef
>;

/** Units a column of each kind may be given in; the first is the default. */
export const UNIT_CHOICES: Record<UnitKind, string[]> = {
  temperature: ['°C', '°F'],
  'length-mm': ['mm', 'in'],
  'length-m': ['m', 'ft', 'mm'],
  area: ['m²', 'ft²'],
  pressure: ['bar(g)', 'psig', 'kPa(g)'],
  flow: ['kg/s', 'kg/h', 't/h', 'lb/h'],
  cp: ['kJ/(kg·K)', 'Btu/(lb·°F)'],
  /** A size column in inches (NPS) or in DN; "DN 50" and '2"' are read either way. */
  size: ['NPS', 'DN'],
  none: [''],
};

export type Purpose =
  | 'heatConservation'
  | 'personnelProtection'
  | 'condensationControl'
  | 'processControl'
  | 'freezeProtection';
export const PURPOSE_LABEL: Record<Purpose, string> = {
  heatConservation: 'Heat conservation',
  personnelProtection: 'Personnel protection',
  condensationControl: 'Condensation control',
  processControl: 'Process control',
  freezeProtection: 'Freeze protection',
};
/** One-letter codes accepted in a purposes cell (H, P, C, T, F) besides the words. */
export const PURPOSE_CODES: Record<string, Purpose> = {
  h: 'heatConservation',
  p: 'personnelProtection',
  c: 'condensationControl',
  t: 'processControl',
  f: 'freezeProtection',
};

export type LineGeometry = 'horizontal-pipe' | 'vertical-pipe' | 'vessel' | 'flat';
export const GEOMETRY_LABEL: Record<LineGeometry, string> = {
  'horizontal-pipe': 'Horizontal pipe',
  'vertical-pipe': 'Vertical pipe',
  vessel: 'Vessel',
  flat: 'Flat surface',
};
/** Vessels and flat surfaces: sized by area, heat loss per m², blanket or board rather than pipe sections. */
export const isSurfaceGeometry = (g: string) => g === 'vessel' || g === 'flat';
/**
 * A pipe imported without its length (blank or "TBD" in the line list): solved per metre, left out
 * of the heat-loss totals and of the bill until a revision gives the length. The one rule for it.
 */
export const isIncompleteLine = (l: { geometry: string; lengthM: number | null }) =>
  !isSurfaceGeometry(l.geometry) && l.lengthM === null;

/**
 * Fields whose cells hold words from a small vocabulary. A client's own word for one of them (a
 * location "Pipe rack", a purpose "ET") is asked once in the mapping step and remembered with the
 * column mapping; the answers are keyed by the cell text in lower case, trimmed.
 */
export type ValueField = 'location' | 'purposes' | 'geometry' | 'accessible' | 'headType' | 'heatTraced';
export const VALUE_FIELDS: ValueField[] = [
  'geometry',
  'headType',
  'purposes',
  'location',
  'accessible',
  'heatTraced',
];
export const VALUE_CHOICES: Record<ValueField, { value: string; label: string }[]> = {
  location: [
    { value: 'outdoor', label: 'Outdoor' },
    { value: 'indoor', label: 'Indoor' },
  ],
  accessible: [
    { value: 'yes', label: 'Accessible to people' },
    { value: 'no', label: 'Out of reach' },
  ],
  heatTraced: [
    { value: 'yes', label: 'Heat traced' },
    { value: 'no', label: 'Not traced' },
  ],
  geometry: [
    { value: 'horizontal-pipe', label: 'Horizontal pipe' },
    { value: 'vertical-pipe', label: 'Vertical pipe' },
    { value: 'vessel', label: 'Vessel' },
    { value: 'flat', label: 'Flat surface' },
  ],
  headType: [
    { value: 'ellipsoidal', label: '2:1 semi-ellipsoidal heads' },
    { value: 'hemispherical', label: 'Hemispherical heads' },
    { value: 'torispherical', label: 'Torispherical (F&D) heads' },
    { value: 'flat', label: 'Flat ends' },
    { value: 'cone-roof', label: 'Cone roof (tank)' },
  ],
  purposes: [
    { value: 'H', label: 'Heat conservation' },
    { value: 'P', label: 'Personnel protection' },
    { value: 'H,P', label: 'Heat conservation + personnel protection' },
    { value: 'C', label: 'Condensation control' },
    { value: 'T', label: 'Process control' },
    { value: 'F', label: 'Freeze protection' },
    { value: 'T,H', label: 'Process control + heat conservation' },
    { value: 'none', label: 'No insulation purpose (leave the line out)' },
  ],
};
/** Answers to value questions: field → lower-case cell text → one of VALUE_CHOICES' values. */
export type ValueAnswers = Partial<Record<ValueField, Record<string, string>>>;
/** The key an answer is stored under: trimmed, lower case, inner spaces collapsed. */
export const valueKey = (v: string) => v.trim().toLowerCase().replace(/\s+/g, ' ');
