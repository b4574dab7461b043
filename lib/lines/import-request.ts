/**
 * What the mapping step sends to check or import a draft, read with zod and every failure turned
 * into a sentence about the field the user chose — a schema's own text ("mapping.columns.geometry:
 * Invalid input …") never reaches anyone.
 */
import { z } from 'zod';
import { AppError } from '@/lib/errors';
import {
  FIELD_BY_KEY,
  FIELDS,
  VALUE_CHOICES,
  VALUE_FIELDS,
  type LineFieldKey,
  type ValueField,
} from './fields';
import type { ColumnMapping } from './mapping';

const fieldKey = z.enum(FIELDS.map((f) => f.key) as [LineFieldKey, ...LineFieldKey[]]);
const valueField = z.enum(VALUE_FIELDS as [ValueField, ...ValueField[]]);

/** Any subset of fields may be mapped (zod 4's `record` over an enum demands every key; `partialRecord` does not). */
export const mappingSchema = z.object({
  columns: z.partialRecord(fieldKey, z.number().int().min(0).max(16383).nullable()),
  units: z.partialRecord(fieldKey, z.string().max(40)).default({}),
  values: z.partialRecord(valueField, z.record(z.string().max(500), z.string().max(40))).optional(),
});

export const importRequestSchema = z.object({
  draftId: z.string().regex(/^[0-9a-f-]{36}$/i),
  sheetName: z.string().min(1).max(200),
  headerRow: z.number().int().min(1).max(1_048_576).optional(),
  mapping: mappingSchema,
});

export type ImportRequest = {
  draftId: string;
  sheetName: string;
  headerRow?: number;
  mapping: ColumnMapping;
};

const label = (k: unknown) =>
  typeof k === 'string' && k in FIELD_BY_KEY ? `"${FIELD_BY_KEY[k as LineFieldKey].label}"` : null;

/** One sentence per problem, naming the field or choice it concerns. */
export function describeIssue(issue: z.core.$ZodIssue): string {
  const [top, part, key] = issue.path;
  if (top === 'draftId') return 'This upload is no longer available; upload the file again.';
  if (top === 'sheetName') return 'Choose the sheet that holds the line list.';
  if (top === 'headerRow')
    return 'The header row must be a row number of the sheet; choose the row with the column names.';
  // zod reports keys outside the enum as one issue on the record, with the keys listed.
  const stray = issue.code === 'unrecognized_keys' ? issue.keys.map((k) => `"${k}"`).join(', ') : null;
  if (top === 'mapping' && part === 'columns') {
    if (stray || !label(key))
      return `${stray ?? `"${String(key ?? '')}"`} ${stray && issue.code === 'unrecognized_keys' && issue.keys.length > 1 ? 'are not fields' : 'is not a field'} Lagwise reads; it was left out of the mapping — reload the page and map the columns again.`;
    return `The column chosen for ${label(key)} is not a column of the sheet; choose one of the sheet's columns or "not in the file".`;
  }
  if (top === 'mapping' && part === 'units') {
    if (stray || !label(key))
      return `Units were given for ${stray ?? `"${String(key ?? '')}"`}, which Lagwise does not read; reload the page and map the columns again.`;
    return `The unit chosen for ${label(key)} is not one Lagwise knows; choose one from its list.`;
  }
  if (top === 'mapping' && part === 'values') {
    const f =
      typeof key === 'string' && (VALUE_FIELDS as string[]).includes(key) ? (key as ValueField) : null;
    if (!f)
      return 'An answer was given for a field that takes no value questions; reload the page and answer the questions again.';
    return `An answer for ${label(f)} is not one of ${VALUE_CHOICES[f].map((c) => c.label.toLowerCase()).join(', ')}; choose it again.`;
  }
  if (top === 'mapping')
    return 'The column mapping did not arrive whole; reload the page and map the columns again.';
  return 'The request did not arrive whole; reload the page and try again.';
}

/** Reads the request or throws an AppError('invalid') whose message is sentences naming the fields. */
export function readImportRequest(input: unknown): ImportRequest {
  const r = importRequestSchema.safeParse(input);
  if (!r.success) {
    const sentences = [...new Set(r.error.issues.map(describeIssue))];
    throw new AppError('invalid', sentences.join(' '), { mapping: sentences });
  }
  const { mapping, ...rest } = r.data;
  const columns: ColumnMapping['columns'] = {};
  for (const [k, v] of Object.entries(mapping.columns) as [LineFieldKey, number | null | undefined][])
    if (typeof v === 'number') columns[k] = v;
  // Answers must be one of the choices for their field.
  for (const [f, answers] of Object.entries(mapping.values ?? {}) as [ValueField, Record<string, string>][]) {
    const bad = Object.entries(answers).find(([, a]) => !VALUE_CHOICES[f].some((c) => c.value === a));
    if (bad)
      throw new AppError(
        'invalid',
        `The answer for ${FIELD_BY_KEY[f].label.toLowerCase()} "${bad[0]}" is not one of ${VALUE_CHOICES[f].map((c) => c.label.toLowerCase()).join(', ')}; choose it again.`,
      );
  }
  return {
    ...rest,
    mapping: { columns, units: mapping.units, ...(mapping.values ? { values: mapping.values } : {}) },
  };
}
