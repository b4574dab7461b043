/**
 * Text files as clients send them: UTF-8 with or without a byte-order mark, UTF-16 (what Excel's
 * "Unicode text" writes, tab-separated), or a Western single-byte code page (Windows-1252, a superset
 * of Latin-1 for printable text) from older tools. Decoding goes through iconv-lite.
 */
import iconv from 'iconv-lite';
import Papa from 'papaparse';

export type TextEncodingName = 'UTF-8' | 'UTF-8 with BOM' | 'UTF-16LE' | 'UTF-16BE' | 'Windows-1252';

/**
 * Picks the encoding: a byte-order mark decides; without one, NUL bytes at every other position mean
 * UTF-16; bytes that are valid UTF-8 are UTF-8 (plain ASCII included); anything else is read as
 * Windows-1252 — the code page of Western European Excel, which is what a "CSV (semicolon)" export
 * from a German, French, Spanish or Dutch desktop is in.
 */
export function detectEncoding(bytes: Uint8Array): TextEncodingName {
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return 'UTF-8 with BOM';
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return 'UTF-16LE';
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return 'UTF-16BE';
  const n = Math.min(bytes.length, 4096);
  let evenNul = 0,
    oddNul = 0;
  for (let i = 0; i < n; i++)
    if (bytes[i] === 0) {
      if (i % 2) oddNul++;
      else evenNul++;
    }
  if (n >= 4 && oddNul > n / 8 && evenNul === 0) return 'UTF-16LE';
  if (n >= 4 && evenNul > n / 8 && oddNul === 0) return 'UTF-16BE';
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return 'UTF-8';
  } catch {
    return 'Windows-1252';
  }
}

export function decodeText(bytes: Uint8Array): { text: string; encoding: TextEncodingName } {
  const encoding = detectEncoding(bytes);
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const label = {
    'UTF-8': 'utf8',
    'UTF-8 with BOM': 'utf8',
    'UTF-16LE': 'utf16le',
    'UTF-16BE': 'utf16be',
    'Windows-1252': 'windows-1252',
  }[encoding];
  let text = iconv.decode(buf, label, { stripBOM: true });
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return { text, encoding };
}

export class CsvQuoteError extends Error {
  constructor(readonly row: number) {
    super(`unclosed quote in row ${row}`);
  }
}

export type Delimiter = ',' | ';' | '\t' | '|';
export const DELIMITER_NAME: Record<Delimiter, string> = {
  ',': 'comma',
  ';': 'semicolon',
  '\t': 'tab',
  '|': 'vertical bar',
};

/** Refused before the whole file is split: a row count or a row width over the limit. */
export class CsvLimitError extends Error {
  constructor(
    readonly kind: 'rows' | 'columns',
    readonly row: number,
    readonly count: number,
  ) {
    super(`${kind} limit at row ${row}`);
  }
}

export interface CsvLimits {
  maxRows: number;
  maxColumns: number;
}

/**
 * Splits CSV text into rows of trimmed strings with papaparse (quotes, doubled quotes, line breaks
 * inside quotes). The delimiter is the one papaparse's guess settles on among comma, semicolon, tab
 * and bar; papaparse guesses from the whole sample, so a title line above the header does not mislead it.
 * With limits, rows are read one at a time and the split stops at the first row past a limit
 * (non-empty rows, fields in a row ignoring empty ones at its end), so an over-wide or endless
 * file costs no more than the rows before it.
 */
export function splitCsv(text: string, limits?: CsvLimits): { rows: string[][]; delimiter: Delimiter } {
  const rows: string[][] = [];
  let quoteRow = 0,
    index = 0,
    nonEmpty = 0;
  let limit: CsvLimitError | null = null;
  let found = '';
  Papa.parse<string[]>(text, {
    delimiter: '',
    delimitersToGuess: [',', ';', '\t', '|'],
    skipEmptyLines: false,
    step: (res, parser) => {
      index++;
      if (!found && res.meta.delimiter) found = res.meta.delimiter;
      if (!quoteRow && res.errors.some((e) => e.type === 'Quotes')) quoteRow = index;
      const row = res.data.map((c) => String(c ?? '').trim());
      if (limits) {
        let width = row.length;
        while (width > 0 && row[width - 1] === '') width--;
        if (width > limits.maxColumns) {
          limit = new CsvLimitError('columns', index, width);
          parser.abort();
          return;
        }
        if (width > 0 && ++nonEmpty > limits.maxRows) {
          limit = new CsvLimitError('rows', index, nonEmpty);
          parser.abort();
          return;
        }
      }
      rows.push(row);
    },
  });
  if (limit) throw limit;
  // An unclosed quote swallows the rest of the file into one cell: refuse it, naming the row.
  if (quoteRow) throw new CsvQuoteError(quoteRow);
  const delimiter = (found || ',') as Delimiter;
  return { rows, delimiter };
}

/**
 * True when the file writes decimals with a comma ("12,5"): more cells look like comma decimals than
 * point decimals. Only a file that does not separate its fields with commas can.
 */
export function usesDecimalComma(rows: string[][], delimiter: Delimiter): boolean {
  if (delimiter === ',') return false;
  let comma = 0,
    point = 0;
  for (const row of rows)
    for (const c of row) {
      if (/^[-+]?\d{1,3}(\.\d{3})*,\d+$/.test(c) || /^[-+]?\d+,\d+$/.test(c)) comma++;
      else if (/^[-+]?\d*\.\d+$/.test(c) && !/^\d{1,3}\.\d{3}$/.test(c)) point++;
    }
  return comma > point;
}
