import type { LineInput } from './validate';

export interface FieldChange {
  field: keyof LineInput;
  from: unknown;
  to: unknown;
}
export interface LineListDiff {
  added: string[];
  removed: string[];
  changed: { tag: string; changes: FieldChange[] }[];
  unchanged: number;
}

export const COMPARED_FIELDS: (keyof LineInput)[] = [
  'service',
  'area',
  'geometry',
  'nps',
  'outsideDiameterMm',
  'lengthM',
  'surfaceAreaM2',
  'heightM',
  'normalTempC',
  'maxTempC',
  'steamPressureBarG',
  'flowKgPerS',
  'fluidCpKJPerKgK',
  'elbows',
  'tees',
  'valves',
  'flanges',
  'purposes',
  'outdoor',
  'accessible',
  'accessHeightM',
  'jacketId',
  'heatTraced',
  'notes',
];

/** Fields whose change alters the thermal answer: a pick or review decision must be looked at again. */
export const THERMAL_FIELDS: (keyof LineInput)[] = [
  'geometry',
  'outsideDiameterMm',
  'heightM',
  'normalTempC',
  'maxTempC',
  'steamPressureBarG',
  'flowKgPerS',
  'fluidCpKJPerKgK',
  'lengthM',
  'purposes',
  'outdoor',
  'accessible',
  'jacketId',
  'surfaceAreaM2',
  'heatTraced',
];

function same(a: unknown, b: unknown): boolean {
  if (typeof a === 'number' && typeof b === 'number')
    return Math.abs(a - b) <= 1e-6 * Math.max(1, Math.abs(a));
  if (Array.isArray(a) && Array.isArray(b))
    return a.length === b.length && [...a].sort().join() === [...b].sort().join();
  return (a ?? null) === (b ?? null);
}

export function fieldChanges(before: LineInput, after: LineInput): FieldChange[] {
  return COMPARED_FIELDS.filter((f) => !same(before[f], after[f])).map((f) => ({
    field: f,
    from: before[f] ?? null,
    to: after[f] ?? null,
  }));
}

/** Revision difference by tag (case-insensitive). */
export function diffLineLists(before: LineInput[], after: LineInput[]): LineListDiff {
  const old = new Map(before.map((l) => [l.tag.toUpperCase(), l]));
  const next = new Map(after.map((l) => [l.tag.toUpperCase(), l]));
  const added: string[] = [],
    removed: string[] = [],
    changed: LineListDiff['changed'] = [];
  let unchanged = 0;
  for (const [k, l] of next) {
    const o = old.get(k);
    if (!o) {
      added.push(l.tag);
      continue;
    }
    const c = fieldChanges(o, l);
    if (c.length) changed.push({ tag: l.tag, changes: c });
    else unchanged++;
  }
  for (const [k, l] of old) if (!next.has(k)) removed.push(l.tag);
  return { added, removed, changed, unchanged };
}
