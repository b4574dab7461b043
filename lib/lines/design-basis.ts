import { z } from 'zod';
import { DEFAULT_COOLING, DEFAULT_ECONOMICS, DEFAULT_PRICES } from '@/lib/thermal/economics';
import { DEFAULT_EQUIVALENT_LENGTHS, DEFAULT_TRACING_SAFETY_FACTOR } from '@/lib/thermal/fittings';
import { DEFAULT_TRACER_ALLOWANCES } from '@/lib/thermal/tracing';
import { DEFAULT_CRITERIA } from '@/lib/thermal/defaults';
import { JACKETS, MATERIALS } from '@/lib/thermal/materials';
import { isCurrencyCode } from '@/lib/format';
import { DEFAULT_CONTACT_SECONDS } from '@/lib/thermal/touch';

/**
 * The project's design basis: the conditions each criterion is checked under, the limits, the
 * insulation specification by service-temperature band, and the economics. Every default is a
 * starting point labelled with where it comes from; the project overrides it.
 */
/** A number typed in a form field, with a message naming the field. */
export const num = (what: string) =>
  z.coerce
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, { error: `${what} must be a number` });
const cond = z.object({ airC: num('Air temperature').min(-60).max(60), windMs: num('Wind').min(0).max(40) });
const condRh = cond.extend({ relativeHumidityPct: num('Relative humidity').gt(0).max(100) });
// Band entries name a library material or one of the project's own (checked in checkBands).
const materialId = z.string({ error: 'Choose a material' }).trim().min(1, { error: 'Choose a material' });
const jacketId = z.string({ error: 'Choose a jacket' }).trim().min(1, { error: 'Choose a jacket' });

/** A material the project adds with its own data (e.g. a manufacturer's declared values). */
export const ownMaterialSchema = z
  .object({
    id: z.string().regex(/^own-[a-z0-9-]{1,60}$/, { error: 'Project entries have ids starting with "own-"' }),
    name: z
      .string({ error: 'Give the material a name' })
      .trim()
      .min(2, { error: 'Give the material a name (2 characters or more)' })
      .max(80, { error: 'Name: at most 80 characters' }),
    productForm: z.enum(['pipe-section', 'blanket', 'board', 'tube'], { error: 'Choose a product form' }),
    /** Conductivity against mean temperature: [°C, W/(m·K)], at least one point. */
    kPoints: z
      .array(z.tuple([z.number(), z.number()]))
      .min(1, { error: 'Give at least one conductivity point' })
      .max(20, { error: 'At most 20 conductivity points' }),
    minServiceC: num('Lowest service temperature').min(-273).max(1200),
    maxServiceC: num('Highest service temperature').min(-273).max(1200),
    densityKgPerM3: num('Density').positive().max(3000),
    specificHeatJPerKgK: num('Specific heat').positive().max(5000),
    thicknessesMm: z
      .array(z.number().positive().max(300))
      .min(1, { error: 'Give at least one thickness' })
      .max(30, { error: 'At most 30 thicknesses' }),
    maxLayerMm: num('Thickest single layer').positive().max(300),
    maxLayers: num('Most layers').int().min(1).max(8),
    source: z
      .string({ error: 'Say where the data come from' })
      .trim()
      .min(3, { error: 'Say where the data come from (data sheet, test report…)' })
      .max(300, { error: 'Source: at most 300 characters' }),
  })
  .superRefine((m, ctx) => {
    if (!(m.maxServiceC > m.minServiceC))
      ctx.addIssue({
        code: 'custom',
        path: ['maxServiceC'],
        message: 'The highest service temperature must be above the lowest',
      });
    const pts = [...m.kPoints].sort((a, b) => a[0] - b[0]);
    pts.forEach(([t, k], i) => {
      if (!(k > 0 && k < 5))
        ctx.addIssue({
          code: 'custom',
          path: ['kPoints'],
          message: `Conductivity at ${t} °C must be between 0 and 5 W/(m·K) (is ${k})`,
        });
      if (i > 0 && t === pts[i - 1][0])
        ctx.addIssue({
          code: 'custom',
          path: ['kPoints'],
          message: `Two conductivity points at ${t} °C: give each mean temperature once`,
        });
    });
    if (!m.thicknessesMm.some((t) => t <= m.maxLayerMm))
      ctx.addIssue({
        code: 'custom',
        path: ['maxLayerMm'],
        message: 'At least one thickness must be within the thickest single layer',
      });
  });
export type OwnMaterial = z.output<typeof ownMaterialSchema>;

/** A jacket (cladding or finish) the project adds with its own emittance. */
export const ownJacketSchema = z.object({
  id: z.string().regex(/^own-[a-z0-9-]{1,60}$/, { error: 'Project entries have ids starting with "own-"' }),
  name: z
    .string({ error: 'Give the jacket a name' })
    .trim()
    .min(2, { error: 'Give the jacket a name (2 characters or more)' })
    .max(80, { error: 'Name: at most 80 characters' }),
  emittance: num('Emittance')
    .gt(0, { error: 'Emittance must be above 0' })
    .max(1, { error: 'Emittance is at most 1' }),
  metal: z.boolean(),
  /** What a hand touches (ISO 13732-1 class); unset: metal → bare metal, else plastics. */
  touchSurface: z
    .enum(['bare-metal', 'coated-metal', 'ceramic-glass-stone', 'plastic', 'wood'], {
      error: 'Touch surface: choose bare metal, coated metal, ceramics/glass/stone, plastics or wood',
    })
    .optional(),
  source: z
    .string({ error: 'Say where the emittance comes from' })
    .trim()
    .min(3, { error: 'Say where the emittance comes from' })
    .max(300, { error: 'Source: at most 300 characters' }),
});
export type OwnJacket = z.output<typeof ownJacketSchema>;

/** EN ISO 23993 conversion factors for one material, with where they come from. */
const factor = (what: string) =>
  num(what)
    .min(1, { error: `${what} must be 1 or more (a design value is not better than the declared one)` })
    .max(3, { error: `${what}: at most 3` });
export const designFactorsSchema = z.object({
  ageing: factor('Ageing factor'),
  moisture: factor('Moisture factor'),
  installation: factor('Installation factor'),
  source: z.string().trim().max(300, { error: 'Source of the factors: at most 300 characters' }).default(''),
});

export const systemBandSchema = z.object({
  /** Lines whose normal temperature is in [fromC, toC) use this system. */
  fromC: num('From').min(-273).max(1200),
  toC: num('To').min(-273).max(1200),
  outerId: materialId,
  innerId: materialId.optional().or(z.literal('').transform(() => undefined)),
  /** Main material on vessels and flat surfaces (blanket or board), when it differs from the pipe product. */
  flatOuterId: materialId.optional().or(z.literal('').transform(() => undefined)),
  jacketId,
});

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

/** Heat-tracing settings of a new project (and of bases saved before tracing existed): nothing traced unless marked. */
export const DEFAULT_HEAT_TRACING = {
  traceFreezeProtection: false,
  traceProcessControl: false,
  maintainTempC: 5,
  minAmbientC: undefined as number | undefined,
  windMs: undefined as number | undefined,
  safetyFactor: DEFAULT_TRACING_SAFETY_FACTOR,
  ...DEFAULT_TRACER_ALLOWANCES,
};

export const designBasisObject = z.object({
  unitSystem: z.enum(['SI', 'US']),
  /** Nominal thicknesses offered: the millimetre series or the inch series of each product. */
  thicknessSeries: z
    .enum(['mm', 'inch'], { error: 'Choose the millimetre or the inch series' })
    .default('mm'),
  /** ISO 4217 code of every price and cost of the project (display only: no result depends on it). */
  currency: z
    .string({ error: 'Currency: choose a currency' })
    .trim()
    .toUpperCase()
    .refine(isCurrencyCode, { error: 'Currency must be a three-letter ISO 4217 code such as EUR or USD' })
    .default('EUR'),
  conditions: z.object({
    heatLoss: z.object({ outdoor: cond, indoor: cond }),
    personnel: z.object({ outdoor: cond, indoor: cond }),
    condensation: z.object({ outdoor: condRh, indoor: condRh }),
    freeze: cond,
  }),
  /**
   * How the touch limit is set: from a contact time and the jacket's surface (ISO 13732-1), or the two
   * fixed numbers below as an explicit override. Bases saved before this choice existed keep their
   * fixed numbers (they were designed with them); new projects start from the contact time.
   */
  touchLimitMode: z
    .enum(['contact-time', 'fixed'], { error: 'Touch limit: choose by contact time or fixed numbers' })
    .default('fixed'),
  touchContactSeconds: num('Contact time')
    .min(1, { error: 'Contact time must be at least 1 s (the shortest ISO 13732-1 band read)' })
    .max(28800, { error: 'Contact time: at most 28 800 s (8 h; the threshold stays 43 °C beyond)' })
    .default(DEFAULT_CONTACT_SECONDS),
  touchLimitMetalC: num('Touch limit (metal jacket)').min(30).max(120),
  touchLimitNonMetalC: num('Touch limit (non-metal jacket)').min(30).max(120),
  dewPointMarginK: num('Dew-point margin').min(0).max(10),
  heatLossLimitWPerM: num('Heat-loss limit')
    .positive()
    .optional()
    .or(z.literal('').transform(() => undefined)),
  maxProcessDropK: num('Allowed temperature change').positive().max(200),
  freeze: z.object({
    initialWaterTempC: num('Starting water temperature').min(0.5).max(90),
    requiredHours: num('Required hours').positive().max(1000),
    iceFractionPct: num('Ice fraction allowed').min(0).max(100).default(25),
  }),
  systems: z.array(systemBandSchema).min(1, { error: 'Give at least one material system' }),
  ownMaterials: z.array(ownMaterialSchema).max(50, { error: 'At most 50 project materials' }).default([]),
  ownJackets: z.array(ownJacketSchema).max(30, { error: 'At most 30 project jackets' }).default([]),
  /**
   * Design conductivity (EN ISO 23993): conversion factors per material id (library or project); the
   * thickness is chosen on the declared curve × their product. Materials not named keep factor 1.
   */
  designConductivity: z.record(z.string(), designFactorsSchema).default({}),
  /**
   * Corrosion-under-insulation screening (lib/thermal/cui.ts): the metals the lines are made of,
   * whether lines stand idle at ambient, what the specification requires of screened lines, and
   * whether a screened line is flagged for review. Bases saved before screening existed raise no
   * new flag until the project turns it on (the screening is shown on the line page either way).
   */
  cui: z
    .object({
      metals: z.preprocess(
        (v) => (typeof v === 'string' ? [v] : v),
        z
          .array(
            z.enum(['carbon-steel', 'austenitic-stainless'], {
              error: 'Metals screened: carbon steel or austenitic stainless',
            }),
          )
          .default(['carbon-steel']),
      ),
      screenIdle: z.coerce.boolean().default(false),
      requireCoatingNote: z.coerce.boolean().default(false),
      requireChlorideFree: z.coerce.boolean().default(false),
      reviewFlag: z.coerce.boolean().default(false),
    })
    .default({
      metals: ['carbon-steel'],
      screenIdle: false,
      requireCoatingNote: false,
      requireChlorideFree: false,
      reviewFlag: false,
    }),
  /** An energy code whose minimum pipe insulation is a hard criterion. */
  energyCode: z
    .enum(['none', 'ashrae-90.1'], { error: 'Choose no energy code or ASHRAE 90.1' })
    .default('none'),
  /** Fittings and supports added to each pipe's heat loss as equivalent lengths (lib/thermal/fittings.ts). */
  fittings: z
    .object({
      elbowM: num('Elbow, metres of insulated pipe').min(0).max(20),
      teeM: num('Tee, metres of insulated pipe').min(0).max(20),
      valveM: num('Insulated valve, metres of insulated pipe').min(0).max(20),
      flangePairM: num('Insulated flange pair, metres of insulated pipe').min(0).max(20),
      supportM: num('Support, metres of insulated pipe').min(0).max(20),
      bareValveM: num('Bare valve, metres of bare pipe').min(0).max(20),
      bareFlangePairM: num('Bare flange pair, metres of bare pipe').min(0).max(20),
      supportsPerM: num('Supports per metre').min(0).max(5),
      valvesBare: z.coerce.boolean().default(false),
    })
    .default({ ...DEFAULT_EQUIVALENT_LENGTHS, supportsPerM: 0.33, valvesBare: false }),
  /**
   * Heat tracing (IEEE 515 / IEC/IEEE 60079-30-2 sizing basis, lib/lines/tracing.ts): which lines are
   * traced besides those the line list marks, the maintain temperature of freeze protection, the
   * minimum design ambient and wind (blank: the freeze condition set, the project's coldest), the
   * safety factor and the tracer allowance per fitting.
   */
  heatTracing: z
    .object({
      traceFreezeProtection: z.coerce.boolean().default(false),
      traceProcessControl: z.coerce.boolean().default(false),
      maintainTempC: num('Maintain temperature').min(0).max(200).default(5),
      // A blank field is "not set" (the freeze condition set), not 0.
      minAmbientC: z.preprocess(blankToUndefined, num('Minimum design ambient').min(-60).max(40).optional()),
      windMs: z.preprocess(blankToUndefined, num('Design wind for tracing').min(0).max(40).optional()),
      safetyFactor: num('Tracing safety factor')
        .min(1, { error: 'Tracing safety factor must be 1 or more' })
        .max(3, { error: 'Tracing safety factor: at most 3' })
        .default(DEFAULT_TRACING_SAFETY_FACTOR),
      elbowM: num('Tracer per elbow').min(0).max(20).default(DEFAULT_TRACER_ALLOWANCES.elbowM),
      teeM: num('Tracer per tee').min(0).max(20).default(DEFAULT_TRACER_ALLOWANCES.teeM),
      valveM: num('Tracer per valve').min(0).max(20).default(DEFAULT_TRACER_ALLOWANCES.valveM),
      flangePairM: num('Tracer per flange pair')
        .min(0)
        .max(20)
        .default(DEFAULT_TRACER_ALLOWANCES.flangePairM),
      supportM: num('Tracer per support').min(0).max(20).default(DEFAULT_TRACER_ALLOWANCES.supportM),
    })
    .default(DEFAULT_HEAT_TRACING),
  economics: z.object({
    energyPricePerKWh: num('Energy price').min(0).max(10),
    efficiency: num('Heat-generation efficiency').gt(0).max(10),
    hoursPerYear: num('Operating hours').min(0).max(8784),
    discountRate: num('Discount rate').min(0).max(1),
    lifeYears: num('Life').int().min(1).max(60),
    escalationRate: num('Price escalation').min(-0.5).max(1),
    co2KgPerKWh: num('CO₂ factor').min(0).max(2),
    /** What makes up the heat lost; names the emission scope (efficiency and CO₂ factor above are the project's figures for it). */
    heatSource: z
      .enum(['natural-gas', 'fuel-oil', 'heavy-fuel-oil', 'lpg', 'coal', 'electricity', 'district-heat'], {
        error: 'Heat source: choose one of the listed energy sources',
      })
      .default('natural-gas'),
    cooling: z
      .object({
        electricityPricePerKWh: num('Electricity price for cooling').min(0).max(10),
        cop: num('Chiller COP').gt(0).max(20),
        co2KgPerKWh: num('CO₂ factor of electricity').min(0).max(2),
        source: z
          .enum(['electric-chiller', 'district-cooling'], {
            error: 'Cooling source: choose an electric chiller or district cooling',
          })
          .default('electric-chiller'),
      })
      .default({ ...DEFAULT_COOLING, source: 'electric-chiller' }),
    economicChoice: z
      .enum(['optimum', 'thinnest-within-range'], {
        error: 'Choose the optimum or the thinnest within the range',
      })
      .default('optimum'),
    flatRangePct: num('Flat range').min(0).max(20).default(2),
  }),
  prices: z.object({
    defaultMaterialPerM3: num('Material price').min(0),
    wasteFraction: num('Waste allowance').min(0).max(1),
    labourPerMPerLayer: num('Labour per metre per layer').min(0),
    labourPerM2PerLayer: num('Labour per m² per layer').min(0),
    jacketPerM2: num('Jacket price').min(0),
    fittingsAllowanceFraction: num('Fittings allowance').min(0).max(5),
    labourByNps: z
      .array(
        z.object({
          maxNps: num('Size band').gt(0),
          perMPerLayer: num('Labour per metre per layer for the size band').min(0),
        }),
      )
      .min(1)
      .max(10)
      .default(DEFAULT_PRICES.labourByNps!),
    jacketPerM2ById: z.record(z.string(), z.number().min(0)).default(DEFAULT_PRICES.jacketPerM2ById!),
    accessoriesPerM: num('Accessories per metre').min(0).default(DEFAULT_PRICES.accessoriesPerM!),
    accessoriesPerM2: num('Accessories per m²').min(0).default(DEFAULT_PRICES.accessoriesPerM2!),
    fittingItem: z
      .object({
        elbow: num('Insulating an elbow').min(0),
        tee: num('Insulating a tee').min(0),
        valve: num('Insulating a valve').min(0),
        flangePair: num('Insulating a flange pair').min(0),
      })
      .default(DEFAULT_PRICES.fittingItem!),
    materialPerM3: z.record(z.string(), z.number().min(0)),
  }),
});

const LIBRARY_MATERIAL_IDS = new Set(MATERIALS.map((m) => m.id));
const LIBRARY_JACKET_IDS = new Set(JACKETS.map((j) => j.id));

export function checkBandRanges(b: { systems: { fromC: number; toC: number }[] }, ctx: z.RefinementCtx) {
  b.systems.forEach((s, i) => {
    if (!(s.toC > s.fromC))
      ctx.addIssue({ code: 'custom', path: ['systems', i, 'toC'], message: '"To" must be above "From"' });
  });
}

export function checkBands(
  b: {
    systems: {
      fromC: number;
      toC: number;
      outerId: string;
      innerId?: string;
      flatOuterId?: string;
      jacketId: string;
    }[];
    ownMaterials?: { id: string }[];
    ownJackets?: { id: string }[];
    designConductivity?: Record<string, unknown>;
  },
  ctx: z.RefinementCtx,
) {
  checkBandRanges(b, ctx);
  const materials = new Set([...LIBRARY_MATERIAL_IDS, ...(b.ownMaterials ?? []).map((m) => m.id)]);
  for (const id of Object.keys(b.designConductivity ?? {})) {
    if (!materials.has(id))
      ctx.addIssue({
        code: 'custom',
        path: ['designConductivity', id],
        message: `Design conductivity: "${id}" is not in the library or the project's materials`,
      });
  }
  const jackets = new Set([...LIBRARY_JACKET_IDS, ...(b.ownJackets ?? []).map((j) => j.id)]);
  b.systems.forEach((s, i) => {
    for (const field of ['outerId', 'flatOuterId', 'innerId'] as const) {
      const id = s[field];
      if (id !== undefined && !materials.has(id))
        ctx.addIssue({
          code: 'custom',
          path: ['systems', i, field],
          message: `Band ${i + 1}: "${id}" is not in the library or the project's materials`,
        });
    }
    if (!jackets.has(s.jacketId))
      ctx.addIssue({
        code: 'custom',
        path: ['systems', i, 'jacketId'],
        message: `Band ${i + 1}: "${s.jacketId}" is not in the library or the project's jackets`,
      });
  });
  const ids = [...(b.ownMaterials ?? []), ...(b.ownJackets ?? [])].map((x) => x.id);
  if (new Set(ids).size !== ids.length)
    ctx.addIssue({ code: 'custom', path: ['ownMaterials'], message: 'Two project entries share an id' });
}
export const designBasisSchema = designBasisObject.superRefine(checkBands);
export type DesignBasis = z.output<typeof designBasisSchema>;

const C = DEFAULT_CRITERIA.conditions;

/** Defaults for a new project; sources named in DEFAULT_BASIS_NOTES. */
export const DEFAULT_DESIGN_BASIS: DesignBasis = {
  unitSystem: 'SI',
  thicknessSeries: 'mm',
  currency: 'EUR',
  conditions: {
    // Outdoor conditions and the limits are the engine's defaults; indoor ones are set here.
    heatLoss: {
      outdoor: { airC: C.heatLoss.airC, windMs: C.heatLoss.windMs },
      indoor: { airC: 20, windMs: 0 },
    },
    personnel: {
      outdoor: { airC: C.personnel.airC, windMs: C.personnel.windMs },
      indoor: { airC: 35, windMs: 0 },
    },
    condensation: {
      outdoor: {
        airC: C.condensation.airC,
        windMs: C.condensation.windMs,
        relativeHumidityPct: C.condensation.relativeHumidityPct!,
      },
      indoor: { airC: 25, windMs: 0, relativeHumidityPct: 70 },
    },
    freeze: { airC: C.freeze.airC, windMs: C.freeze.windMs },
  },
  touchLimitMode: 'contact-time',
  touchContactSeconds: DEFAULT_CONTACT_SECONDS,
  touchLimitMetalC: DEFAULT_CRITERIA.touchLimitMetalC,
  touchLimitNonMetalC: DEFAULT_CRITERIA.touchLimitNonMetalC,
  dewPointMarginK: DEFAULT_CRITERIA.dewPointMarginK,
  maxProcessDropK: DEFAULT_CRITERIA.maxProcessDropK!,
  freeze: { ...DEFAULT_CRITERIA.freeze!, iceFractionPct: DEFAULT_CRITERIA.freeze!.iceFractionPct ?? 25 },
  systems: [
    {
      fromC: -200,
      toC: 0,
      outerId: 'polyisocyanurate',
      innerId: 'cellular-glass',
      jacketId: 'aluminium-oxidised',
    },
    { fromC: 0, toC: 20, outerId: 'elastomeric-foam', jacketId: 'pvc' },
    {
      fromC: 20,
      toC: 600,
      outerId: 'mineral-wool-pipe',
      flatOuterId: 'mineral-wool-blanket',
      jacketId: 'aluminium-oxidised',
    },
    {
      fromC: 600,
      toC: 1000,
      outerId: 'mineral-wool-pipe',
      innerId: 'calcium-silicate',
      flatOuterId: 'mineral-wool-blanket',
      jacketId: 'stainless-steel',
    },
  ],
  ownMaterials: [],
  ownJackets: [],
  designConductivity: {},
  cui: {
    metals: ['carbon-steel'],
    screenIdle: false,
    requireCoatingNote: false,
    requireChlorideFree: false,
    reviewFlag: true,
  },
  energyCode: 'none',
  fittings: { ...DEFAULT_EQUIVALENT_LENGTHS, supportsPerM: 0.33, valvesBare: false },
  heatTracing: { ...DEFAULT_HEAT_TRACING },
  economics: {
    ...DEFAULT_ECONOMICS,
    heatSource: 'natural-gas',
    cooling: { ...DEFAULT_COOLING, source: 'electric-chiller' },
    economicChoice: 'optimum',
    flatRangePct: 2,
  },
  prices: {
    ...DEFAULT_PRICES,
    labourByNps: DEFAULT_PRICES.labourByNps!.map((b) => ({ ...b })),
    jacketPerM2ById: { ...DEFAULT_PRICES.jacketPerM2ById! },
    accessoriesPerM: DEFAULT_PRICES.accessoriesPerM!,
    accessoriesPerM2: DEFAULT_PRICES.accessoriesPerM2!,
    fittingItem: { ...DEFAULT_PRICES.fittingItem! },
  },
};

export const DEFAULT_BASIS_NOTES: Record<string, string> = {
  touchLimit:
    'By contact time (default): the limit is the ISO 13732-1 burn threshold of the surface a hand touches — bare metal, coated metal, plastics and other non-metal finishes — for the contact time chosen here (5 s: common practice for industrial workers after ASTM C1055; the lower end of each published band is used). ISO 13732-1 gives thresholds for healthy adult skin, not limit values: where children, the elderly or people who cannot withdraw may touch, or a local code sets a value, use a longer contact time or fixed numbers, and follow the code and a qualified person. Fixed numbers: the two limits below apply to every line instead.',
  touchLimitMetalC:
    '60 °C for metal jackets: industry convention (common practice), consistent with ASTM C1055 guidance for 5 s industrial contact; not a value the standard mandates.',
  touchLimitNonMetalC:
    'Non-metal finishes conduct less heat into skin, so a higher surface temperature gives the same contact temperature (ASTM C1055, ISO 13732-1); 65 °C is a starting point to confirm.',
  dewPointMarginK: '2 K above the dew point: common practice margin for condensation control.',
  personnel: 'Hottest expected air, still air: the worst case for a touch check.',
  condensation: 'Design air temperature and humidity at low wind: the worst case for sweating.',
  co2KgPerKWh:
    'Natural gas, IPCC 2006 Guidelines Vol. 2 Table 2.2: 56 100 kg CO₂/TJ (net calorific value) = 0.202 kg/kWh.',
  heatSource:
    "CO₂ = energy lost ÷ efficiency (or ÷ COP for cooling) × the factor of the energy bought. Fuel burnt in the plant's own boilers is Scope 1, bought electricity, heat, steam and cooling Scope 2 (GHG Protocol Corporate Standard). Choosing a source does not change the figures typed here: the table gives each source's default factor and efficiency with its source; electricity and district energy have no universal factor — use the supplier's or grid's for the site and year.",
  freeze:
    'Stagnant water by the ISO 12241 method: cooling to 0 °C, then freezing the allowed fraction of the water (latent heat 334 kJ/kg). 25 % ice by the required time is common practice for water lines; set 0 to require the water stay above 0 °C.',
  fittings:
    "Each fitting adds the heat loss of so many metres of the same pipe (the simplified thermal-bridge approach of ISO 12241; VDI 2055 Part 1 and ASTM C1129 give values of this kind). The defaults are common-practice estimates recalled from design guides, not read from those standards: put the project specification's own. Supports: one every 3 m by default (common practice).",
  heatTracing:
    'Heat-tracing duty on the sizing basis of IEEE 515 and IEC/IEEE 60079-30-2: the heat loss of the insulated pipe at the maintain temperature in the minimum design ambient and wind, at the chosen thickness, times the safety factor, with the fittings (equivalent lengths above) spread over the run. Lines marked traced in the line list are traced; freeze-protected and process-control lines too when ticked here. Freeze-protected lines hold the maintain temperature (5 °C: common practice, a margin above 0 °C); process-control lines hold their normal temperature. Minimum ambient and wind left blank take the freeze condition set (the coldest of the project); indoor lines see at least 5 °C and still air, as for freezing.',
  tracingSafetyFactor:
    'Common practice [recalled]: IEEE 515 and IEC/IEEE 60079-30-2 ask for a margin on the calculated heat loss (insulation ageing and damage, supply voltage) and leave its size to the designer; 10–25 % is usual, 1.2 is the default.',
  tracerAllowances:
    "Extra tracer per fitting, looped on it: common practice [recalled] — about 1 m on a small-bore valve, 0.3 m on a flange pair, support, elbow or tee. Use the tracer manufacturer's allowances for the sizes installed. The duty and lengths are for budgeting: tracer selection, circuit lengths, sheath temperature and hazardous-area limits follow the manufacturer and the local electrical code.",
  energyCode:
    "ASHRAE 90.1 Table 6.8.3-1 minimum pipe insulation (2016 and later editions; the IECC carries the same table), corrected for the insulation's conductivity by the table's footnote; a hard criterion for every heating and cooling pipe when chosen.",
  cooling:
    "Cold lines gain heat that a chiller removes: priced as electricity ÷ COP with the grid's CO₂ factor (COP 3 is a common-practice estimate; set the plant's own).",
  flatRange:
    'Annual-cost curves are flat near the optimum; the range within this percentage is shown, and the project may take its thinnest thickness (common practice leans to the thinner).',
  economics: "Energy price, efficiency, hours and rates are placeholders: set the plant's own figures.",
  systems:
    'Material systems per normal-temperature band: a generic starting specification (common practice), to be replaced by the project specification. Vessels and flat surfaces take blanket or board where a band names one (pipe sections do not fit them).',
  currency:
    'Every price on the design basis and every cost shown (budget, bill, economics) is in this currency (ISO 4217 code). Changing it relabels; it converts nothing.',
  thicknessSeries:
    'Millimetre series as sold in metric markets, or the inch series (pipe sections 1–4 in by ½ in, elastomeric tube ⅜–1½ in): common practice. Project materials keep their own thicknesses.',
  designConductivity:
    "Design conductivity after EN ISO 23993: the declared curve (λ against mean temperature) is kept and shown; the thickness is chosen on the declared curve times the ageing, moisture and installation factors set here per material. ISO 23993 gives the method, not the numbers: take them from the manufacturer (ageing of foams, for example), the project specification or the contractor's installation practice, and say where. 1.00 (no allowance) until set.",
  cui: "Corrosion-under-insulation screen: a line whose operating temperature, the range it cycles through (normal to maximum) or, when lines stand idle, the ambient air falls in the carbon-steel or austenitic-stainless window of AMPP/NACE SP0198 or API RP 583 is named with the window and the document (windows as recalled: verify against the edition your specification cites). The line list does not give the pipe metal: choose the metals the project uses. A coating note and chloride-free insulation to ASTM C795 (for austenitic stainless) can be required of screened lines; the screen is no substitute for the owner's inspection programme.",
  own: 'Add the products the project specifies with their declared data (manufacturer data sheet, test to ASTM C335 / EN ISO 8497 for pipe insulation). Library values are typical only.',
};

/** A zod issue path as the form field name conform uses ("systems[0].outerId"). */
export function fieldName(path: readonly PropertyKey[]): string {
  return path.reduce<string>(
    (a, p) => (typeof p === 'number' ? `${a}[${p}]` : a ? `${a}.${String(p)}` : String(p)),
    '',
  );
}
