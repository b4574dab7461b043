import type { ConductivitySpec } from './conductivity';
import type { TouchSurface } from './touch';
import type { DesignFactors } from './design-conductivity';

/**
 * Generic insulation types with TYPICAL properties. Every value here is a typical or
 * specification-limit figure, not a product's data: verify against the manufacturer's declared
 * values (EN ISO 13787 / ASTM C335 tests) before issuing a design. Sources are named per entry;
 * "[recalled]" marks values recalled from memory of specification tables or data sheets.
 */
export interface InsulationMaterial {
  id: string;
  name: string;
  /** Declared conductivity against mean temperature, °C → W/(m·K) (kept as declared). */
  conductivity: ConductivitySpec;
  /**
   * EN ISO 23993 conversion factors (ageing, moisture, installation) the project applies: the engine
   * chooses thickness on the design curve, the declared curve × their product (design-conductivity.ts).
   */
  designFactors?: DesignFactors;
  minServiceC: number;
  maxServiceC: number;
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  productForm: 'pipe-section' | 'blanket' | 'board' | 'tube';
  /** Nominal single-layer thicknesses sold, mm. */
  thicknessesMm: number[];
  /** Thicker than this goes to more layers with staggered joints (common practice). */
  maxLayerMm: number;
  maxLayers: number;
  /**
   * The same product in the inch series (nominal thicknesses in inches and the thickest single
   * layer), for projects specified in US practice — common practice [recalled]: pipe sections in
   * ½-inch steps, elastomeric tube in its fractional sizes.
   */
  inchSeries?: { thicknessesIn: number[]; maxLayerIn: number };
  source: string;
}

const BTU_IN = 0.144228; // W/(m·K) per Btu·in/(h·ft²·°F)
const F = (f: number) => Math.round(((f - 32) / 1.8) * 10) / 10;
const fromUs = (pts: [number, number][]): [number, number][] =>
  pts.map(([f, k]) => [F(f), Math.round(k * BTU_IN * 1e5) / 1e5]);

const MM_PIPE = [20, 25, 30, 40, 50, 60, 70, 80, 90, 100, 110, 120];
// Inch series, common practice [recalled]: rigid pipe sections 1–4 in by ½ in, one layer up to 4 in.
const IN_PIPE = { thicknessesIn: [1, 1.5, 2, 2.5, 3, 3.5, 4], maxLayerIn: 4 };

export const MATERIALS: InsulationMaterial[] = [
  {
    id: 'mineral-wool-pipe',
    name: 'Mineral wool pipe section',
    conductivity: {
      type: 'table',
      points: [
        [10, 0.034],
        [50, 0.038],
        [100, 0.044],
        [150, 0.051],
        [200, 0.059],
        [300, 0.079],
        [400, 0.104],
        [500, 0.135],
        [600, 0.172],
      ],
    },
    minServiceC: -20,
    maxServiceC: 650,
    densityKgPerM3: 120,
    specificHeatJPerKgK: 840,
    productForm: 'pipe-section',
    thicknessesMm: MM_PIPE,
    maxLayerMm: 100,
    maxLayers: 3,
    inchSeries: IN_PIPE,
    source:
      "Typical declared λ of rock-wool pipe sections [recalled from manufacturers' data sheets]; upper limit per ASTM C547 Type II (1200 °F).",
  },
  {
    id: 'mineral-wool-blanket',
    name: 'Mineral wool wired blanket',
    conductivity: {
      type: 'table',
      points: [
        [50, 0.04],
        [100, 0.046],
        [200, 0.062],
        [300, 0.084],
        [400, 0.111],
        [500, 0.145],
        [600, 0.185],
      ],
    },
    minServiceC: 0,
    maxServiceC: 650,
    densityKgPerM3: 100,
    specificHeatJPerKgK: 840,
    productForm: 'blanket',
    thicknessesMm: [25, 30, 40, 50, 60, 70, 80, 100],
    maxLayerMm: 100,
    maxLayers: 3,
    inchSeries: { thicknessesIn: [1, 1.5, 2, 3, 4], maxLayerIn: 4 },
    source: 'Typical declared λ of wired mats [recalled]; use range as ASTM C592 [recalled].',
  },
  {
    id: 'calcium-silicate',
    name: 'Calcium silicate pipe section',
    conductivity: {
      type: 'table',
      points: fromUs([
        [100, 0.41],
        [200, 0.44],
        [300, 0.5],
        [400, 0.55],
        [500, 0.6],
        [600, 0.66],
        [700, 0.72],
      ]),
    },
    minServiceC: 0,
    maxServiceC: 650,
    densityKgPerM3: 240,
    specificHeatJPerKgK: 920,
    productForm: 'pipe-section',
    thicknessesMm: [25, 40, 50, 65, 75, 90, 100],
    maxLayerMm: 100,
    maxLayers: 3,
    inchSeries: IN_PIPE,
    source:
      "ASTM C533 Type I maximum k (0.41 at 100 °F per a distributor's summary; higher temperatures [recalled]); 1200 °F limit.",
  },
  {
    id: 'cellular-glass',
    name: 'Cellular glass pipe section',
    conductivity: {
      type: 'table',
      points: fromUs([
        [0, 0.29],
        [75, 0.34],
        [200, 0.43],
        [400, 0.63],
      ]),
    },
    minServiceC: -268,
    maxServiceC: 427,
    densityKgPerM3: 120,
    specificHeatJPerKgK: 840,
    productForm: 'pipe-section',
    thicknessesMm: [25, 30, 40, 50, 60, 70, 80, 90, 100, 120],
    maxLayerMm: 100,
    maxLayers: 3,
    inchSeries: IN_PIPE,
    source: 'ASTM C552 Grade 6 Type II maximum k (NIA specification chart, 2024); use range −450 to 800 °F.',
  },
  {
    id: 'polyisocyanurate',
    name: 'Polyisocyanurate (PIR) pipe section',
    conductivity: {
      type: 'table',
      points: fromUs([
        [0, 0.2],
        [75, 0.21],
        [200, 0.28],
      ]),
    },
    minServiceC: -183,
    maxServiceC: 149,
    densityKgPerM3: 40,
    specificHeatJPerKgK: 1400,
    productForm: 'pipe-section',
    thicknessesMm: [20, 25, 30, 40, 50, 60, 70, 80, 90, 100],
    maxLayerMm: 100,
    maxLayers: 3,
    inchSeries: IN_PIPE,
    source: 'ASTM C591 range (NIA chart, values read from a garbled copy); use range −297 to 300 °F.',
  },
  {
    id: 'elastomeric-foam',
    name: 'Flexible elastomeric foam tube',
    conductivity: {
      type: 'table',
      points: fromUs([
        [0, 0.26],
        [75, 0.28],
      ]),
    },
    minServiceC: -183,
    maxServiceC: 104,
    densityKgPerM3: 60,
    specificHeatJPerKgK: 1500,
    productForm: 'tube',
    thicknessesMm: [9, 13, 19, 25, 32, 40, 50],
    maxLayerMm: 32,
    maxLayers: 3,
    inchSeries: { thicknessesIn: [0.375, 0.5, 0.75, 1, 1.5], maxLayerIn: 1.5 },
    source: 'ASTM C534 Grade 1 maximum k (NIA chart) and use range −297 to 220 °F.',
  },
  {
    id: 'aerogel-blanket',
    name: 'Aerogel blanket',
    conductivity: {
      type: 'table',
      points: [
        [0, 0.016],
        [100, 0.021],
        [200, 0.028],
        [300, 0.036],
        [400, 0.046],
        [500, 0.058],
        [600, 0.072],
      ],
    },
    minServiceC: -200,
    maxServiceC: 650,
    densityKgPerM3: 180,
    specificHeatJPerKgK: 1000,
    productForm: 'blanket',
    thicknessesMm: [5, 10],
    maxLayerMm: 10,
    maxLayers: 8,
    inchSeries: { thicknessesIn: [0.2, 0.4], maxLayerIn: 0.4 },
    source: 'Typical data-sheet values of silica aerogel blankets [recalled]; verify per product.',
  },
  {
    id: 'perlite',
    name: 'Expanded perlite pipe section',
    conductivity: {
      type: 'table',
      points: [...fromUs([[50, 0.375]]), [93, 0.065], [204, 0.079], [316, 0.094], [427, 0.11], [538, 0.128]],
    },
    minServiceC: 0,
    maxServiceC: 650,
    densityKgPerM3: 220,
    specificHeatJPerKgK: 840,
    productForm: 'pipe-section',
    thicknessesMm: [25, 40, 50, 65, 75, 90, 100],
    maxLayerMm: 100,
    maxLayers: 3,
    inchSeries: IN_PIPE,
    source:
      'k at 50 °F mean from Frankel, Facility Piping Systems Handbook, Table 5.3 (ASTM C610); higher temperatures [recalled].',
  },
];

export interface Jacket {
  id: string;
  name: string;
  emittance: number;
  metal: boolean;
  /** What a hand touches, for the ISO 13732-1 burn threshold (touch.ts); unset: metal → bare metal, else plastics. */
  touchSurface?: TouchSurface;
  source: string;
}

/** Outside-surface emittance of common jackets — typical values, common practice [recalled from handbook tables]; dirt and ageing raise them. */
export const JACKETS: Jacket[] = [
  {
    id: 'aluminium-bright',
    name: 'Aluminium, bright',
    emittance: 0.05,
    metal: true,
    source: 'typical [recalled]',
  },
  {
    id: 'aluminium-oxidised',
    name: 'Aluminium, oxidised',
    emittance: 0.13,
    metal: true,
    source: 'typical [recalled]',
  },
  {
    id: 'stainless-steel',
    name: 'Stainless steel',
    emittance: 0.15,
    metal: true,
    source: 'typical [recalled]',
  },
  {
    id: 'galvanised-steel',
    name: 'Galvanised steel, new',
    emittance: 0.26,
    metal: true,
    source: 'typical [recalled]',
  },
  {
    id: 'galvanised-steel-dusty',
    name: 'Galvanised steel, dusty',
    emittance: 0.44,
    metal: true,
    source: 'typical [recalled]',
  },
  {
    id: 'painted-metal',
    name: 'Painted metal',
    emittance: 0.9,
    metal: true,
    touchSurface: 'coated-metal',
    source: 'typical [recalled]',
  },
  { id: 'pvc', name: 'PVC sheet', emittance: 0.9, metal: false, source: 'typical [recalled]' },
  { id: 'mastic-cloth', name: 'Mastic or cloth', emittance: 0.9, metal: false, source: 'typical [recalled]' },
  {
    id: 'bare-steel',
    name: 'Bare steel, oxidised',
    emittance: 0.8,
    metal: true,
    source: 'typical [recalled]; used for bare lines',
  },
];

export const materialById = (id: string) => MATERIALS.find((m) => m.id === id);
export const jacketById = (id: string) => JACKETS.find((j) => j.id === id);

/** The nominal thickness series a project uses. */
export type ThicknessSeries = 'mm' | 'inch';
/** Thicknesses (mm) and thickest single layer (mm) of a material in a series; the material's own list when it has no inch series. */
export function seriesOf(
  m: InsulationMaterial,
  series: ThicknessSeries,
): { thicknessesMm: number[]; maxLayerMm: number } {
  if (series === 'inch' && m.inchSeries)
    return {
      thicknessesMm: m.inchSeries.thicknessesIn.map((t) => Math.round(t * 25.4 * 1000) / 1000),
      maxLayerMm: Math.round(m.inchSeries.maxLayerIn * 25.4 * 1000) / 1000,
    };
  return { thicknessesMm: m.thicknessesMm, maxLayerMm: m.maxLayerMm };
}
