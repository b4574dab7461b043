/**
 * npm run --silent lines:check -- FILE [--sheet NAME] [--header-row N] [--map FIELD=COLUMN]…
 *   [--unit FIELD=UNIT]… [--value FIELD:RAW=MEANING]…
 *
 * Checks a line list the way the mapping step does (same reading, header row, suggestions, units,
 * value answers and validation) and prints one JSON object on stdout, nothing else. Exit 0 when the
 * file could be read (problems or not), 2 when it could not (or the arguments are wrong).
 * For document-control pipelines that validate line lists in batches.
 */
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import {
  FIELD_BY_KEY,
  UNIT_CHOICES,
  VALUE_CHOICES,
  VALUE_FIELDS,
  valueKey,
  type LineFieldKey,
  type ValueField,
} from './fields';
import { suggestMapping, type ColumnMapping } from './mapping';
import { columnLetter, parseUpload, ParseError, viewSheet } from './parse';
import { validateSheet } from './validate';

class UsageError extends Error {}

function columnIndex(letters: string): number {
  if (!/^[A-Z]{1,3}$/i.test(letters))
    throw new UsageError(`"${letters}" is not a column letter (A, B, … AA).`);
  let n = 0;
  for (const ch of letters.toUpperCase()) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n - 1;
}

function fieldOf(key: string): LineFieldKey {
  if (!(key in FIELD_BY_KEY))
    throw new UsageError(`"${key}" is not a field; use one of ${Object.keys(FIELD_BY_KEY).join(', ')}.`);
  return key as LineFieldKey;
}

export interface CheckArgs {
  file: string;
  sheet?: string;
  headerRow?: number;
  map: [string, string][];
  units: [string, string][];
  values: [string, string, string][];
}

export function parseArgs(argv: string[]): CheckArgs {
  const a: CheckArgs = { file: '', map: [], units: [], values: [] };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const next = () => {
      const v = argv[++i];
      if (v === undefined) throw new UsageError(`${arg} needs a value.`);
      return v;
    };
    const pair = (v: string, sep: string) => {
      const at = v.indexOf(sep);
      if (at < 0)
        throw new UsageError(`${arg} ${v}: expected ${sep === '=' ? 'FIELD=VALUE' : 'FIELD:RAW=MEANING'}.`);
      return [v.slice(0, at), v.slice(at + 1)] as const;
    };
    if (arg === '--sheet') a.sheet = next();
    else if (arg === '--header-row') {
      const n = Number(next());
      if (!Number.isInteger(n) || n < 1) throw new UsageError('--header-row takes a row number (1 or more).');
      a.headerRow = n;
    } else if (arg === '--map') a.map.push([...pair(next(), '=')]);
    else if (arg === '--unit') a.units.push([...pair(next(), '=')]);
    else if (arg === '--value') {
      const [f, rest] = pair(next(), ':');
      const eq = rest.lastIndexOf('=');
      if (eq < 0) throw new UsageError(`--value ${f}:${rest}: expected FIELD:RAW=MEANING.`);
      a.values.push([f, rest.slice(0, eq), rest.slice(eq + 1)]);
    } else if (arg.startsWith('--')) throw new UsageError(`Unknown option ${arg}.`);
    else if (!a.file) a.file = arg;
    else throw new UsageError(`Only one file is checked at a time (got "${a.file}" and "${arg}").`);
  }
  if (!a.file) throw new UsageError('Give the line-list file to check.');
  return a;
}

/** The check itself, free of process I/O so tests call it. Throws ParseError/UsageError when the file cannot be read. */
export async function checkLineList(args: CheckArgs, bytes: Buffer) {
  const parsed = await parseUpload(args.file, bytes);
  const stored =
    args.sheet !== undefined
      ? parsed.sheets.find((s) => s.name === args.sheet)
      : (parsed.sheets.find((s) => !s.hidden && s.grid.length > 1) ?? parsed.sheets[0]);
  if (!stored)
    throw new UsageError(
      `The file has no sheet "${args.sheet}"; its sheets are ${parsed.sheets.map((s) => `"${s.name}"`).join(', ')}.`,
    );
  if (args.headerRow !== undefined && !stored.grid.some((r) => r.row === args.headerRow))
    throw new UsageError(`Row ${args.headerRow} of sheet "${stored.name}" is empty or beyond its end.`);
  const sheet = viewSheet(stored, args.headerRow);
  const mapping: ColumnMapping = suggestMapping(sheet.headers);
  for (const [f, col] of args.map) {
    const key = fieldOf(f);
    if (col === '') {
      delete mapping.columns[key];
      delete mapping.units[key];
      continue;
    }
    mapping.columns[key] = columnIndex(col);
    mapping.units[key] ??= UNIT_CHOICES[FIELD_BY_KEY[key].unit][0];
  }
  for (const [f, u] of args.units) {
    const key = fieldOf(f);
    const choices = UNIT_CHOICES[FIELD_BY_KEY[key].unit];
    if (!choices.includes(u))
      throw new UsageError(`"${u}" is not a unit for ${key}; use ${choices.join(', ')}.`);
    mapping.units[key] = u;
  }
  for (const [f, raw, meaning] of args.values) {
    if (!(VALUE_FIELDS as string[]).includes(f))
      throw new UsageError(`--value takes one of ${VALUE_FIELDS.join(', ')}, not "${f}".`);
    const field = f as ValueField;
    if (!VALUE_CHOICES[field].some((c) => c.value === meaning))
      throw new UsageError(
        `"${meaning}" is not a meaning for ${field}; use ${VALUE_CHOICES[field].map((c) => c.value).join(', ')}.`,
      );
    mapping.values = { ...mapping.values, [field]: { ...mapping.values?.[field], [valueKey(raw)]: meaning } };
  }
  const v = validateSheet(sheet, mapping);
  const unknownValues: Record<string, string[]> = {};
  for (const u of v.unknownValues) (unknownValues[u.field] ??= []).push(u.value);
  return {
    file: basename(args.file),
    sheets: parsed.sheets.map((s) => ({ name: s.name, rows: s.grid.length })),
    sheet: sheet.name,
    headerRow: sheet.headerRow,
    ...(parsed.kind === 'csv' ? { encoding: parsed.encoding, delimiter: parsed.delimiter } : {}),
    mapping: Object.fromEntries(
      Object.entries(mapping.columns).map(([k, c]) => [k, columnLetter(c as number)]),
    ),
    units: Object.fromEntries(
      Object.entries(mapping.units).filter(([k, u]) => u && mapping.columns[k as LineFieldKey] !== undefined),
    ),
    unknownValues,
    ready: v.lines.length,
    problems: v.issues.map((i) => ({
      row: i.row,
      column: i.column,
      field: i.field,
      severity: i.severity,
      message: i.message,
    })),
    lines: v.lines.map((l) => ({
      tag: l.tag,
      geometry: l.geometry === 'vessel' ? 'vertical-vessel' : l.geometry,
      nps: l.nps,
      outsideDiameterMm: l.outsideDiameterMm,
      lengthM: l.lengthM,
      surfaceAreaM2: l.surfaceAreaM2,
      heightM: l.heightM,
      normalTempC: l.normalTempC,
      maxTempC: l.maxTempC,
      purposes: l.purposes,
      outdoor: l.outdoor,
      accessible: l.accessible,
    })),
  };
}

async function main() {
  let args: CheckArgs;
  let bytes: Buffer;
  try {
    args = parseArgs(process.argv.slice(2));
    bytes = readFileSync(args.file);
  } catch (e) {
    const message =
      e instanceof UsageError
        ? e.message
        : `The file could not be opened: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'it does not exist' : (e as Error).message}.`;
    process.stdout.write(`${JSON.stringify({ error: message })}\n`);
    process.exit(2);
  }
  try {
    process.stdout.write(`${JSON.stringify(await checkLineList(args, bytes))}\n`);
  } catch (e) {
    if (e instanceof ParseError || e instanceof UsageError) {
      process.stdout.write(`${JSON.stringify({ file: basename(args.file), error: e.message })}\n`);
      process.exit(2);
    }
    throw e;
  }
}

if (process.argv[1] && /check-cli\.[tj]s$/.test(process.argv[1])) void main();
