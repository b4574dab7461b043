/**
 * The design-basis form in the project's units: which quantity each numeric field holds, its unit
 * label, and the conversion to and from SI (the basis is stored in SI). Pure; used by the form
 * (client) and its server action.
 */
import { convert, type UnitSystem } from './index';

export type FieldKind =
  | 'temp'
  | 'tempDelta'
  | 'wind'
  | 'linearLoss'
  | 'moneyPerM'
  | 'moneyPerM2'
  | 'moneyPerM3'
  | 'none';

const MPH_MS = 0.44704; // 1 mi/h = 0.44704 m/s exactly (NIST SP 811 B.9)

/** The kind of a form field by its name ("conditions.heatLoss.outdoor.airC" → temp). */
export function fieldKind(name: string): FieldKind {
  if (/\.windMs$/.test(name)) return 'wind';
  if (/(^|\.)(touchLimit\w*C|airC|initialWaterTempC|fromC|toC|maintainTempC|minAmbientC)$/.test(name))
    return 'temp';
  if (/(dewPointMarginK|maxProcessDropK)$/.test(name)) return 'tempDelta';
  if (/heatLossLimitWPerM$/.test(name)) return 'linearLoss';
  if (/(labourPerMPerLayer|accessoriesPerM|perMPerLayer)$/.test(name)) return 'moneyPerM';
  if (/(labourPerM2PerLayer|jacketPerM2|accessoriesPerM2)$/.test(name)) return 'moneyPerM2';
  if (/defaultMaterialPerM3$/.test(name)) return 'moneyPerM3';
  return 'none';
}

const TO_US: Record<FieldKind, (v: number) => number> = {
  temp: convert.cToF,
  tempDelta: convert.kToDeltaF,
  wind: (ms) => ms / MPH_MS,
  linearLoss: convert.wPerMToBtuPerHFt,
  moneyPerM: convert.perMToPerFt,
  moneyPerM2: convert.perM2ToPerFt2,
  moneyPerM3: convert.perM3ToPerFt3,
  none: (v) => v,
};
const FROM_US: Record<FieldKind, (v: number) => number> = {
  temp: convert.fToC,
  tempDelta: (f) => f / 1.8,
  wind: (mph) => mph * MPH_MS,
  linearLoss: convert.btuPerHFtToWPerM,
  moneyPerM: (x) => x / 0.3048,
  moneyPerM2: (x) => x / (0.3048 * 0.3048),
  moneyPerM3: (x) => x / (0.3048 * 0.3048 * 0.3048),
  none: (v) => v,
};

export function kindUnit(kind: FieldKind, system: UnitSystem): string {
  const us = system === 'US';
  switch (kind) {
    case 'temp':
      return us ? '°F' : '°C';
    case 'tempDelta':
      return us ? '°F' : 'K';
    case 'wind':
      return us ? 'mph' : 'm/s';
    case 'linearLoss':
      return us ? 'Btu/h·ft' : 'W/m';
    case 'moneyPerM':
      return us ? 'per ft' : 'per m';
    case 'moneyPerM2':
      return us ? 'per ft²' : 'per m²';
    case 'moneyPerM3':
      return us ? 'per ft³' : 'per m³';
    default:
      return '';
  }
}

// Shown to six significant figures (16.9901 per ft³, not 16.99010796); a field sent back as it was
// shown keeps its stored SI value exactly (formDataToSi), so saving an unchanged form changes nothing.
const shownPrecision = (v: number) => Number(v.toPrecision(6));

/** An SI value as the form shows it in `system`. */
export function toFormValue(kind: FieldKind, system: UnitSystem, si: number): number {
  return system === 'US' && kind !== 'none' ? shownPrecision(TO_US[kind](si)) : si;
}

/** A value typed in `system` back to SI (twelve significant figures: no float noise from the factors). */
export function fromFormValue(kind: FieldKind, system: UnitSystem, shown: number): number {
  return system === 'US' ? Number(FROM_US[kind](shown).toPrecision(12)) : shown;
}

function valueAt(o: unknown, name: string): unknown {
  return name
    .replace(/\[(\d+)\]/g, '.$1')
    .split('.')
    .reduce<unknown>(
      (a, k) => (a && typeof a === 'object' ? (a as Record<string, unknown>)[k] : undefined),
      o,
    );
}

/**
 * Converts the numeric fields of a submitted form from the units it was shown in to SI, on a copy:
 * only non-empty fields whose text is a finite number are converted; the rest pass through for the
 * schema to judge (its messages name the field). A field whose text is what the form showed for
 * the stored value (`current`) keeps the stored SI value.
 */
export function formDataToSi(fd: FormData, shownIn: UnitSystem, current?: unknown): FormData {
  if (shownIn === 'SI') return fd;
  const out = new FormData();
  for (const [k, v] of fd.entries()) {
    const kind = fieldKind(k);
    if (typeof v === 'string' && kind !== 'none' && v.trim() !== '' && Number.isFinite(Number(v))) {
      const stored = valueAt(current, k);
      const unchanged = typeof stored === 'number' && Number(v) === toFormValue(kind, shownIn, stored);
      out.append(k, String(unchanged ? stored : fromFormValue(kind, shownIn, Number(v))));
    } else out.append(k, v);
  }
  return out;
}
