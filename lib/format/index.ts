/**
 * One formatting and units layer for every screen, workbook and e-mail. Pure: no Next, React or
 * database imports, so server components, client components and the bill workbook share it.
 * Values are stored and computed in SI; this module only converts and writes them.
 *
 * Conversion factors are the exact ones (NIST SP 811, Appendix B): 1 in = 0.0254 m, 1 ft = 0.3048 m,
 * 1 Btu(IT) = 1055.05585262 J, 1 lb = 0.45359237 kg, a Fahrenheit degree = 5/9 kelvin.
 */

export type UnitSystem = 'SI' | 'US';
export type ThicknessSeries = 'mm' | 'inch';

export const IN_M = 0.0254;
export const FT_M = 0.3048;
export const BTU_J = 1055.05585262;
export const LB_KG = 0.45359237;
export const HOUR_S = 3600;

export const convert = {
  cToF: (c: number) => c * 1.8 + 32,
  fToC: (f: number) => (f - 32) / 1.8,
  /** A temperature difference: K → °F (Rankine degrees). */
  kToDeltaF: (k: number) => k * 1.8,
  mmToIn: (mm: number) => mm / 1000 / IN_M,
  inToMm: (inch: number) => inch * IN_M * 1000,
  mToFt: (m: number) => m / FT_M,
  ftToM: (ft: number) => ft * FT_M,
  m2ToFt2: (m2: number) => m2 / (FT_M * FT_M),
  /** W/m → Btu/(h·ft). */
  wPerMToBtuPerHFt: (w: number) => (w * HOUR_S * FT_M) / BTU_J,
  btuPerHFtToWPerM: (b: number) => (b * BTU_J) / (HOUR_S * FT_M),
  /** W/m² → Btu/(h·ft²). */
  wPerM2ToBtuPerHFt2: (w: number) => (w * HOUR_S * FT_M * FT_M) / BTU_J,
  btuPerHFt2ToWPerM2: (b: number) => (b * BTU_J) / (HOUR_S * FT_M * FT_M),
  /** W → Btu/h. */
  wToBtuPerH: (w: number) => (w * HOUR_S) / BTU_J,
  /** MWh → MMBtu (10⁶ Btu). */
  mwhToMMBtu: (mwh: number) => (mwh * 3.6e9) / (BTU_J * 1e6),
  /** W/(m·K) → Btu·in/(h·ft²·°F). */
  wPerMKToBtuInPerHFt2F: (k: number) => (k * HOUR_S * FT_M * FT_M) / (BTU_J * IN_M * 1.8),
  /** W/(m²·K) → Btu/(h·ft²·°F). */
  wPerM2KToBtuPerHFt2F: (h: number) => (h * HOUR_S * FT_M * FT_M) / (BTU_J * 1.8),
  kgToLb: (kg: number) => kg / LB_KG,
  /** Money per metre → per foot, per m² → per ft², per m³ → per ft³. */
  perMToPerFt: (x: number) => x * FT_M,
  perM2ToPerFt2: (x: number) => x * FT_M * FT_M,
  perM3ToPerFt3: (x: number) => x * FT_M * FT_M * FT_M,
  /** bar(g) → psig (1 bar = 10⁵ Pa; 1 psi = 6894.757293168 Pa). */
  barToPsi: (bar: number) => (bar * 1e5) / 6894.757293168,
};

const missing = (v: number | null | undefined): v is null | undefined =>
  v === null || v === undefined || !Number.isFinite(v);
const DASH = '—';

/** Groups thousands with a thin no-break space-free comma (en-US), no float noise. */
function group(s: string): string {
  const neg = s.startsWith('-');
  const [i, d] = (neg ? s.slice(1) : s).split('.');
  const g = i.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${neg ? '-' : ''}${g}${d !== undefined ? `.${d}` : ''}`;
}

/** A number with `d` decimals, never "-0", thousands grouped. */
export function fixed(v: number | null | undefined, d = 1): string {
  if (missing(v)) return DASH;
  let s = v.toFixed(d);
  if (/^-0(\.0+)?$/.test(s)) s = s.slice(1);
  return group(s);
}

/**
 * A number to `n` significant figures, trailing zeros dropped, integer digits never rounded away
 * (12 345 stays 12,345), no float noise: 165.10000000000002 → "165.1" (n = 4).
 */
export function sig(v: number | null | undefined, n = 3): string {
  if (missing(v)) return DASH;
  if (v === 0) return '0';
  const mag = Math.floor(Math.log10(Math.abs(v)));
  const d = Math.min(10, Math.max(0, n - 1 - mag));
  let s = v.toFixed(d);
  if (s.includes('.')) s = s.replace(/\.?0+$/, '');
  if (s === '-0') s = '0';
  return group(s);
}

/**
 * Inches as a fraction the trade writes: 1.5 → 1-1/2", 0.375 → 3/8", 2 → 2". Values that are not
 * a sixteenth (within 0.002 in) are written as decimals with three significant figures.
 */
export function fractionalInches(inches: number): string {
  if (!Number.isFinite(inches)) return DASH;
  const neg = inches < 0;
  const a = Math.abs(inches);
  const sixteenths = Math.round(a * 16);
  if (Math.abs(sixteenths / 16 - a) > 0.002) return `${neg ? '-' : ''}${sig(a, 3)}"`;
  const whole = Math.floor(sixteenths / 16);
  let num = sixteenths % 16,
    den = 16;
  while (num > 0 && num % 2 === 0) {
    num /= 2;
    den /= 2;
  }
  const frac = num ? `${num}/${den}` : '';
  const body = whole && frac ? `${whole}-${frac}` : whole ? `${whole}` : frac || '0';
  return `${neg ? '-' : ''}${body}"`;
}

export interface FormatOptions {
  unitSystem: UnitSystem;
  thicknessSeries?: ThicknessSeries;
  /** ISO 4217 code, e.g. EUR, USD, GBP. */
  currency?: string;
}

export interface Units {
  temp: string;
  tempDelta: string;
  thickness: string;
  diameter: string;
  length: string;
  area: string;
  linearLoss: string;
  arealLoss: string;
  power: string;
  energy: string;
  conductivity: string;
  htc: string;
  pressure: string;
  mass: string;
}

const SI_UNITS: Units = {
  temp: '°C',
  tempDelta: 'K',
  thickness: 'mm',
  diameter: 'mm',
  length: 'm',
  area: 'm²',
  linearLoss: 'W/m',
  arealLoss: 'W/m²',
  power: 'kW',
  energy: 'MWh',
  conductivity: 'W/(m·K)',
  htc: 'W/(m²·K)',
  pressure: 'bar(g)',
  mass: 'kg',
};
const US_UNITS: Units = {
  temp: '°F',
  tempDelta: '°F',
  thickness: 'in',
  diameter: 'in',
  length: 'ft',
  area: 'ft²',
  linearLoss: 'Btu/h·ft',
  arealLoss: 'Btu/h·ft²',
  power: 'Btu/h',
  energy: 'MMBtu',
  conductivity: 'Btu·in/(h·ft²·°F)',
  htc: 'Btu/(h·ft²·°F)',
  pressure: 'psig',
  mass: 'lb',
};

/** Currency codes offered in the design basis (ISO 4217); any valid code is accepted. */
export const CURRENCIES = [
  'EUR',
  'USD',
  'GBP',
  'CAD',
  'AUD',
  'NOK',
  'SEK',
  'DKK',
  'CHF',
  'PLN',
  'JPY',
  'CNY',
  'INR',
  'SGD',
  'AED',
  'SAR',
  'BRL',
  'MXN',
  'ZAR',
] as const;

/** True when Intl knows the code as a currency (ISO 4217 form: three letters). */
export function isCurrencyCode(code: string): boolean {
  if (!/^[A-Z]{3}$/.test(code)) return false;
  try {
    new Intl.NumberFormat('en-US', { style: 'currency', currency: code });
    return true;
  } catch {
    return false;
  }
}

const moneyFormats = new Map<string, Intl.NumberFormat>();
function moneyFormat(currency: string, digits: number) {
  const key = `${currency}:${digits}`;
  let f = moneyFormats.get(key);
  if (!f) {
    f = new Intl.NumberFormat('en-US', {
      style: 'currency',
      currency,
      currencyDisplay: 'code',
      minimumFractionDigits: digits,
      maximumFractionDigits: digits,
    });
    moneyFormats.set(key, f);
  }
  return f;
}

/** Money in the project's currency: "EUR 1,234" (whole units) or with cents. Uses the ISO code, never an ambiguous symbol. */
export function money(v: number | null | undefined, currency = 'EUR', digits = 0): string {
  if (missing(v)) return DASH;
  return moneyFormat(currency, digits)
    .format(Object.is(v, -0) ? 0 : v)
    .replace(/\u00a0/g, ' ');
}

export interface Formatter {
  system: UnitSystem;
  series: ThicknessSeries;
  currency: string;
  units: Units;
  /** Temperature with its unit: "86.9 °C", "188.4 °F". */
  temp: (c: number | null | undefined) => string;
  /** Temperature number only, in the project's unit. */
  tempValue: (c: number | null | undefined) => string;
  /** Temperature difference with its unit ("+3.2 K", "-5.8 °F"); signed. */
  tempDelta: (k: number | null | undefined) => string;
  /** Thickness in the project's series: "bare", "25 mm", `1-1/2"`, or "0.984 in" for millimetre products in US units. */
  thickness: (mm: number | null | undefined) => string;
  /** Thickness number only in the project's thickness unit (for inputs and workbook cells). */
  thicknessValue: (mm: number | null | undefined) => number | null;
  diameter: (mm: number | null | undefined) => string;
  length: (m: number | null | undefined) => string;
  area: (m2: number | null | undefined) => string;
  /** Heat flow per unit: W/m for pipes, W/m² for surfaces (never one unit for both). */
  linearLoss: (wPerM: number | null | undefined) => string;
  arealLoss: (wPerM2: number | null | undefined) => string;
  heatFlowPerUnit: (v: number | null | undefined, surface: boolean) => string;
  /** The number only, for a column whose header carries the unit (one unit per column). */
  linearLossValue: (wPerM: number | null | undefined) => string;
  arealLossValue: (wPerM2: number | null | undefined) => string;
  power: (w: number | null | undefined) => string;
  /** Electrical power (heat tracing): kW in both unit systems, as tracer circuits are rated. */
  electricPower: (w: number | null | undefined) => string;
  /** A tracer's output per length: W/m, or W/ft in US customary (as tracers are rated). */
  tracerRating: (wPerM: number | null | undefined) => string;
  energy: (mwh: number | null | undefined) => string;
  conductivity: (wPerMK: number | null | undefined) => string;
  htc: (wPerM2K: number | null | undefined) => string;
  pressure: (barG: number | null | undefined) => string;
  mass: (kg: number | null | undefined) => string;
  money: (v: number | null | undefined, digits?: number) => string;
  /** Money per unit of the project's length/area ("EUR 12.40/m", "USD 3.78/ft"). */
  moneyPerLength: (perM: number | null | undefined) => string;
  moneyPerArea: (perM2: number | null | undefined) => string;
}

export function formatter(o: FormatOptions): Formatter {
  const us = o.unitSystem === 'US';
  const series: ThicknessSeries = o.thicknessSeries ?? 'mm';
  const currency = o.currency ?? 'EUR';
  const u = us ? US_UNITS : SI_UNITS;
  const withUnit = (s: string, unit: string) => (s === DASH ? DASH : `${s} ${unit}`);
  const tempValue = (c: number | null | undefined) =>
    missing(c) ? DASH : fixed(us ? convert.cToF(c) : c, 1);
  const thickness = (mm: number | null | undefined) => {
    if (missing(mm)) return DASH;
    if (mm === 0) return 'bare';
    if (series === 'inch') return fractionalInches(convert.mmToIn(mm));
    return us ? `${sig(convert.mmToIn(mm), 3)} in` : `${sig(mm, 4)} mm`;
  };
  const linearLossValue = (w: number | null | undefined) =>
    missing(w) ? DASH : sig(us ? convert.wPerMToBtuPerHFt(w) : w, 3);
  const arealLossValue = (w: number | null | undefined) =>
    missing(w) ? DASH : sig(us ? convert.wPerM2ToBtuPerHFt2(w) : w, 3);
  const linearLoss = (w: number | null | undefined) => withUnit(linearLossValue(w), u.linearLoss);
  const arealLoss = (w: number | null | undefined) => withUnit(arealLossValue(w), u.arealLoss);
  return {
    system: o.unitSystem,
    series,
    currency,
    units: u,
    temp: (c) => withUnit(tempValue(c), u.temp),
    tempValue,
    tempDelta: (k) => {
      if (missing(k)) return DASH;
      const v = us ? convert.kToDeltaF(k) : k;
      const s = fixed(v, 1);
      return `${v > 0 && s !== '0.0' ? '+' : ''}${s} ${u.tempDelta}`;
    },
    thickness,
    thicknessValue: (mm) =>
      missing(mm)
        ? null
        : us || series === 'inch'
          ? Number(convert.mmToIn(mm).toFixed(4))
          : Number(mm.toFixed(2)),
    diameter: (mm) => (missing(mm) ? DASH : us ? `${sig(convert.mmToIn(mm), 4)} in` : `${sig(mm, 4)} mm`),
    length: (m) => (missing(m) ? DASH : withUnit(fixed(us ? convert.mToFt(m) : m, us ? 0 : 1), u.length)),
    area: (m2) => (missing(m2) ? DASH : withUnit(fixed(us ? convert.m2ToFt2(m2) : m2, us ? 0 : 1), u.area)),
    linearLoss,
    arealLoss,
    heatFlowPerUnit: (v, surface) => (surface ? arealLoss(v) : linearLoss(v)),
    linearLossValue,
    arealLossValue,
    power: (w) =>
      missing(w)
        ? DASH
        : us
          ? withUnit(sig(convert.wToBtuPerH(w), 3), 'Btu/h')
          : withUnit(sig(w / 1000, 3), 'kW'),
    electricPower: (w) => (missing(w) ? DASH : withUnit(sig(w / 1000, 3), 'kW')),
    tracerRating: (w) =>
      missing(w) ? DASH : us ? withUnit(sig(w * 0.3048, 3), 'W/ft') : withUnit(sig(w, 3), 'W/m'),
    energy: (mwh) => (missing(mwh) ? DASH : withUnit(sig(us ? convert.mwhToMMBtu(mwh) : mwh, 3), u.energy)),
    conductivity: (k) =>
      missing(k) ? DASH : withUnit(sig(us ? convert.wPerMKToBtuInPerHFt2F(k) : k, 3), u.conductivity),
    htc: (h) => (missing(h) ? DASH : withUnit(sig(us ? convert.wPerM2KToBtuPerHFt2F(h) : h, 3), u.htc)),
    pressure: (b) => (missing(b) ? DASH : withUnit(sig(us ? convert.barToPsi(b) : b, 3), u.pressure)),
    mass: (kg) => (missing(kg) ? DASH : withUnit(sig(us ? convert.kgToLb(kg) : kg, 3), u.mass)),
    money: (v, digits = 0) => money(v, currency, digits),
    moneyPerLength: (perM) =>
      missing(perM) ? DASH : `${money(us ? convert.perMToPerFt(perM) : perM, currency, 2)}/${u.length}`,
    moneyPerArea: (perM2) =>
      missing(perM2) ? DASH : `${money(us ? convert.perM2ToPerFt2(perM2) : perM2, currency, 2)}/${u.area}`,
  };
}

/** The formatter of a project's design basis. */
export function formatterFor(basis: {
  unitSystem: UnitSystem;
  thicknessSeries?: ThicknessSeries;
  currency?: string;
}): Formatter {
  return formatter({
    unitSystem: basis.unitSystem,
    thicknessSeries: basis.thicknessSeries,
    currency: basis.currency,
  });
}

/** A recorded value written for people: numbers without noise, lists joined, objects as "key: value". */
export function readableValue(v: unknown): string {
  if (v === null || v === undefined) return DASH;
  if (typeof v === 'number') return sig(v, 6);
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'string') return v === '' ? '(empty)' : v;
  if (Array.isArray(v)) return v.length ? v.map(readableValue).join(', ') : '(none)';
  if (typeof v === 'object')
    return Object.entries(v as Record<string, unknown>)
      .map(([k, x]) => `${humanKey(k)}: ${readableValue(x)}`)
      .join('; ');
  return String(v);
}

/** A camelCase key as words: "requiredMm" → "required (mm)", "belowCriterion" → "below criterion". */
export function humanKey(k: string): string {
  const unit = /(Mm|C|K|M|M2|WPerM|WPerM2)$/.exec(k);
  const UNITS: Record<string, string> = {
    Mm: 'mm',
    C: '°C',
    K: 'K',
    M: 'm',
    M2: 'm²',
    WPerM: 'W/m',
    WPerM2: 'W/m²',
  };
  const base = unit && k.length > unit[0].length ? k.slice(0, -unit[0].length) : k;
  const words = base.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase();
  return unit && base !== k ? `${words} (${UNITS[unit[0]]})` : words;
}

/**
 * The changes between two recorded states, one line each: "thickness (mm): 25 → 40". Keys only in
 * one side show as set or cleared; nested objects are compared by their dotted path.
 */
export function describeChanges(before: unknown, after: unknown): string[] {
  const flat = (v: unknown, prefix = '', out: Map<string, unknown> = new Map()) => {
    if (v && typeof v === 'object' && !Array.isArray(v)) {
      for (const [k, x] of Object.entries(v as Record<string, unknown>))
        flat(x, prefix ? `${prefix} › ${humanKey(k)}` : humanKey(k), out);
    } else if (prefix) out.set(prefix, v);
    return out;
  };
  const b = flat(before),
    a = flat(after);
  const keys = [...new Set([...b.keys(), ...a.keys()])];
  const out: string[] = [];
  for (const k of keys) {
    const x = b.get(k),
      y = a.get(k);
    if ((x ?? null) === null && (y ?? null) === null) continue;
    if (JSON.stringify(x) === JSON.stringify(y)) continue;
    if (!b.has(k) || x === null || x === undefined) out.push(`${k}: ${readableValue(y)}`);
    else if (!a.has(k) || y === null || y === undefined) out.push(`${k}: ${readableValue(x)} → cleared`);
    else out.push(`${k}: ${readableValue(x)} → ${readableValue(y)}`);
  }
  if (!out.length && after !== null && after !== undefined && typeof after !== 'object')
    out.push(readableValue(after));
  return out;
}

/**
 * An engine or rule message (written in SI) in the project's units: "Surface ≤ 60 °C at 35 °C" →
 * "Surface ≤ 140.0 °F at 95.0 °F"; W/m, W/m², K differences and mm thicknesses likewise. SI
 * projects get the text with float noise removed.
 */
export function localizeMessage(text: string, u: Formatter): string {
  // SI text is already in the project's units: only float noise is removed.
  if (u.system === 'SI' && u.series === 'mm') return text.replace(/-?\d+\.\d{7,}/g, (v) => sig(Number(v), 6));
  const n = '(-?\\d+(?:\\.\\d+)?)';
  return (
    text
      .replace(new RegExp(`${n} ?°C`, 'g'), (_, v) => u.temp(Number(v)))
      .replace(new RegExp(`${n} ?kW\\b`, 'g'), (_, v) => u.power(Number(v) * 1000))
      .replace(new RegExp(`${n} ?W/m²`, 'g'), (_, v) => u.arealLoss(Number(v)))
      .replace(new RegExp(`${n} ?W/m\\b`, 'g'), (_, v) => u.linearLoss(Number(v)))
      .replace(new RegExp(`\\+ ?${n} ?K\\b`, 'g'), (_, v) => `+ ${u.tempDelta(Number(v)).replace(/^\+/, '')}`)
      .replace(new RegExp(`${n} ?K\\b`, 'g'), (_, v) => u.tempDelta(Number(v)).replace(/^\+/, ''))
      // A range of thicknesses names its unit once ("from 100 to 125 mm", "100–125 mm").
      .replace(
        new RegExp(`${n}( to |–|-)${n} ?mm\\b`, 'g'),
        (_, a, sep, b) =>
          `${u.thickness(Number(a))}${sep === ' to ' ? ' to ' : ' – '}${u.thickness(Number(b))}`,
      )
      .replace(new RegExp(`${n} ?mm\\b`, 'g'), (_, v) => u.thickness(Number(v)))
  );
}
