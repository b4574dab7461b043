/**
 * Economic thickness arithmetic. Annualised cost = CRF·installed cost + levelised annual energy cost,
 * the textbook life-cycle method (e.g. ISO 12241 economics; VDI 2055-1; the McMillan principle).
 */

/** Capital recovery factor i(1+i)^n / ((1+i)^n − 1); 1/n at zero interest. */
export function capitalRecoveryFactor(rate: number, years: number): number {
  if (rate === 0) return 1 / years;
  const f = Math.pow(1 + rate, years);
  return (rate * f) / (f - 1);
}

/**
 * Levelising factor for an energy price escalating at e per year over n years discounted at i:
 * LF = CRF(i, n) · Σₖ₌₁ⁿ (1+e)^(k−1) / (1+i)^k. LF = 1 when e = 0.
 */
export function levelisingFactor(rate: number, escalation: number, years: number): number {
  let pv = 0;
  for (let k = 1; k <= years; k++) pv += Math.pow(1 + escalation, k - 1) / Math.pow(1 + rate, k);
  return capitalRecoveryFactor(rate, years) * pv;
}

export interface Economics {
  /** Price of the energy that makes up the loss (fuel or refrigeration), per kWh of fuel/electricity. */
  energyPricePerKWh: number;
  /** Heat-generation efficiency (boiler), or COP for refrigeration; heat lost ÷ this = energy bought. */
  efficiency: number;
  hoursPerYear: number;
  discountRate: number;
  lifeYears: number;
  escalationRate: number;
  /** kg CO₂ per kWh of energy bought. */
  co2KgPerKWh: number;
  /**
   * Cold service is priced as cooling, not as fuel: the heat gained is removed by a chiller
   * (electricity ÷ COP). Absent: cold lines are priced like hot ones (older design bases).
   */
  cooling?: CoolingEconomics;
  /** What makes up the heat lost (names its emission scope; `efficiency` and `co2KgPerKWh` are the project's figures for it). Absent: natural gas. */
  heatSource?: HeatSourceId;
  /**
   * Which thickness the economic criterion asks for: the optimum, or the thinnest within
   * `flatRangePct` of the minimum annual cost (common practice leans to the thinner on a flat curve).
   */
  economicChoice?: 'optimum' | 'thinnest-within-range';
  /** Width of the flat range around the optimum, % of the minimum annual cost (default 2). */
  flatRangePct?: number;
}

export interface CoolingEconomics {
  /** Electricity price per kWh. */
  electricityPricePerKWh: number;
  /** Chiller coefficient of performance: heat removed ÷ electricity used. */
  cop: number;
  /** kg CO₂ per kWh of electricity. */
  co2KgPerKWh: number;
  /** What removes the heat gained: an electric chiller on grid electricity (default) or bought district cooling (then COP 1: cooling bought as delivered). */
  source?: CoolingSourceId;
}

export type HeatSourceId =
  | 'natural-gas'
  | 'fuel-oil'
  | 'heavy-fuel-oil'
  | 'lpg'
  | 'coal'
  | 'electricity'
  | 'district-heat';
export type CoolingSourceId = 'electric-chiller' | 'district-cooling';

/**
 * An energy source: its default CO₂ factor per kWh of energy bought, the emission scope it falls
 * in (GHG Protocol Corporate Standard: Scope 1 — fuel burnt in the plant's own boilers; Scope 2 —
 * electricity, heat, steam or cooling bought from others), and the default conversion efficiency
 * (boiler efficiency, or 1 for heat bought as delivered), each with its source.
 */
export interface EnergySource {
  label: string;
  scope: 'Scope 1' | 'Scope 2';
  co2KgPerKWh: number;
  co2Source: string;
  efficiency: number;
  efficiencySource: string;
}

/** kg CO₂ per kWh from kg per TJ (1 TJ = 10¹² J; 1 kWh = 3.6·10⁶ J). */
const perTJ = (kgPerTJ: number) => (kgPerTJ / 1e12) * 3.6e6;
const IPCC = 'IPCC 2006 Guidelines Vol. 2 Ch. 2 Table 2.2, on net calorific value';
const BOILER = 'common practice for a fired boiler (DOE Steam Tip Sheet #2 example uses 80 %)';

export const HEAT_SOURCES: Record<HeatSourceId, EnergySource> = {
  'natural-gas': {
    label: 'Natural gas (own boiler)',
    scope: 'Scope 1',
    co2KgPerKWh: perTJ(56100),
    co2Source: `${IPCC}: 56 100 kg/TJ`,
    efficiency: 0.85,
    efficiencySource: BOILER,
  },
  'fuel-oil': {
    label: 'Gas/diesel oil (own boiler)',
    scope: 'Scope 1',
    co2KgPerKWh: perTJ(74100),
    co2Source: `${IPCC}: 74 100 kg/TJ`,
    efficiency: 0.85,
    efficiencySource: BOILER,
  },
  'heavy-fuel-oil': {
    label: 'Residual fuel oil (own boiler)',
    scope: 'Scope 1',
    co2KgPerKWh: perTJ(77400),
    co2Source: `${IPCC}: 77 400 kg/TJ`,
    efficiency: 0.83,
    efficiencySource: BOILER,
  },
  lpg: {
    label: 'LPG (own boiler)',
    scope: 'Scope 1',
    co2KgPerKWh: perTJ(63100),
    co2Source: `${IPCC}: 63 100 kg/TJ`,
    efficiency: 0.85,
    efficiencySource: BOILER,
  },
  coal: {
    label: 'Bituminous coal (own boiler)',
    scope: 'Scope 1',
    co2KgPerKWh: perTJ(94600),
    co2Source: `${IPCC}: other bituminous coal 94 600 kg/TJ`,
    efficiency: 0.8,
    efficiencySource: BOILER,
  },
  electricity: {
    label: 'Grid electricity (electric heating)',
    scope: 'Scope 2',
    co2KgPerKWh: 0.35,
    co2Source: "placeholder: set the grid's or supplier's factor for the site and year (no universal value)",
    efficiency: 0.99,
    efficiencySource: 'common practice for resistance heating',
  },
  'district-heat': {
    label: 'District heat or bought steam',
    scope: 'Scope 2',
    co2KgPerKWh: 0.2,
    co2Source: "placeholder: set the supplier's declared factor (no universal value)",
    efficiency: 1,
    efficiencySource: 'heat bought as delivered at the site boundary',
  },
};

export const COOLING_SOURCES: Record<CoolingSourceId, EnergySource> = {
  'electric-chiller': {
    label: 'Electric chiller on grid electricity',
    scope: 'Scope 2',
    co2KgPerKWh: 0.35,
    co2Source: "placeholder: set the grid's or supplier's factor for the site and year (no universal value)",
    efficiency: 3,
    efficiencySource: 'COP 3, common practice for an estimate',
  },
  'district-cooling': {
    label: 'District cooling (bought chilled water)',
    scope: 'Scope 2',
    co2KgPerKWh: 0.1,
    co2Source: "placeholder: set the supplier's declared factor (no universal value)",
    efficiency: 1,
    efficiencySource: 'cooling bought as delivered',
  },
};

/** Energy bought per kWh of heat lost (hot) or gained (cold), its price and CO₂, per the service, with the source and its emission scope. */
export function energyTerms(
  econ: Economics,
  cold: boolean,
): {
  boughtPerHeat: number;
  pricePerKWh: number;
  co2KgPerKWh: number;
  source: string;
  scope: 'Scope 1' | 'Scope 2';
} {
  if (cold && econ.cooling) {
    const s = COOLING_SOURCES[econ.cooling.source ?? 'electric-chiller'];
    return {
      boughtPerHeat: 1 / econ.cooling.cop,
      pricePerKWh: econ.cooling.electricityPricePerKWh,
      co2KgPerKWh: econ.cooling.co2KgPerKWh,
      source: s.label,
      scope: s.scope,
    };
  }
  const s = HEAT_SOURCES[econ.heatSource ?? 'natural-gas'];
  return {
    boughtPerHeat: 1 / econ.efficiency,
    pricePerKWh: econ.energyPricePerKWh,
    co2KgPerKWh: econ.co2KgPerKWh,
    source: s.label,
    scope: s.scope,
  };
}

export interface PriceModel {
  /** Installed material price per m³ by material id, with a fallback. */
  materialPerM3: Record<string, number>;
  defaultMaterialPerM3: number;
  /** Waste allowance on material, fraction. */
  wasteFraction: number;
  labourPerMPerLayer: number;
  /** For flat surfaces: labour per m² per layer. */
  labourPerM2PerLayer: number;
  jacketPerM2: number;
  /** Fittings and supports as a fraction added to the straight-run cost (used when a line gives no fitting counts). */
  fittingsAllowanceFraction: number;
  /**
   * Pipe labour per metre per layer by nominal size band (the first band whose `maxNps` is at or
   * above the pipe's NPS); replaces `labourPerMPerLayer` for pipes when given.
   */
  labourByNps?: { maxNps: number; perMPerLayer: number }[];
  /** Jacketing per m² by jacket id (type and sheet thickness); `jacketPerM2` for the rest. */
  jacketPerM2ById?: Record<string, number>;
  /** Bands, wire, screws and sealant per metre of pipe (per m² of flat surface or vessel). */
  accessoriesPerM?: number;
  accessoriesPerM2?: number;
  /** Insulating one fitting, labour and material, per layer, when the line gives its counts. */
  fittingItem?: { elbow: number; tee: number; valve: number; flangePair: number };
}

/** Natural gas: IPCC 2006 Guidelines Vol. 2 Table 2.2, 56 100 kg CO₂/TJ on net calorific value = 0.20196 kg/kWh. */
export const CO2_NATURAL_GAS_KG_PER_KWH = (56100 / 1e12) * 3.6e6;

/**
 * Cooling defaults: an electric chiller with COP 3 (common practice for an estimate), electricity
 * at 0.15 per kWh and 0.35 kg CO₂/kWh of grid electricity — placeholders for the plant's own figures.
 */
export const DEFAULT_COOLING: CoolingEconomics = {
  electricityPricePerKWh: 0.15,
  cop: 3,
  co2KgPerKWh: 0.35,
  source: 'electric-chiller',
};

export const DEFAULT_ECONOMICS: Economics = {
  energyPricePerKWh: 0.045,
  efficiency: 0.85,
  hoursPerYear: 8000,
  discountRate: 0.08,
  lifeYears: 15,
  escalationRate: 0.02,
  co2KgPerKWh: CO2_NATURAL_GAS_KG_PER_KWH,
  heatSource: 'natural-gas',
  cooling: DEFAULT_COOLING,
  economicChoice: 'optimum',
  flatRangePct: 2,
};

export const DEFAULT_PRICES: PriceModel = {
  materialPerM3: {
    'mineral-wool-pipe': 450,
    'mineral-wool-blanket': 300,
    'calcium-silicate': 900,
    'cellular-glass': 1400,
    polyisocyanurate: 700,
    'elastomeric-foam': 1500,
    'aerogel-blanket': 9000,
    perlite: 800,
  },
  defaultMaterialPerM3: 600,
  wasteFraction: 0.1,
  labourPerMPerLayer: 18,
  labourPerM2PerLayer: 22,
  jacketPerM2: 35,
  fittingsAllowanceFraction: 0.15,
  // Placeholder contractor rates (not from a published source): set the project's own.
  labourByNps: [
    { maxNps: 2, perMPerLayer: 18 },
    { maxNps: 4, perMPerLayer: 24 },
    { maxNps: 8, perMPerLayer: 32 },
    { maxNps: 12, perMPerLayer: 42 },
    { maxNps: 1000, perMPerLayer: 55 },
  ],
  jacketPerM2ById: {
    'aluminium-oxidised': 35,
    'aluminium-bright': 35,
    'stainless-steel': 70,
    'galvanised-steel': 40,
    'galvanised-steel-dusty': 40,
    'painted-metal': 45,
    pvc: 22,
    'mastic-cloth': 28,
  },
  accessoriesPerM: 3,
  accessoriesPerM2: 4,
  fittingItem: { elbow: 25, tee: 35, valve: 90, flangePair: 45 },
};

/** Pipe labour per metre per layer for a nominal size (inches), from the band table or the flat rate. */
export function labourPerMFor(prices: PriceModel, npsInches: number | undefined): number {
  if (!prices.labourByNps?.length || npsInches === undefined) return prices.labourPerMPerLayer;
  const band =
    prices.labourByNps.find((b) => npsInches <= b.maxNps + 1e-9) ??
    prices.labourByNps[prices.labourByNps.length - 1];
  return band.perMPerLayer;
}
