import ExcelJS from 'exceljs';
import {
  CsvLimitError,
  CsvQuoteError,
  decodeText,
  DELIMITER_NAME,
  splitCsv,
  usesDecimalComma,
  type Delimiter,
  type TextEncodingName,
} from './decode';
import { Readable } from 'node:stream';
import {
  checkWorkbookZip,
  columnIndex,
  ROW_LIMIT_SENTENCE,
  SHEET_LIMITS,
  type ZipCheck,
  ZipLimitError,
} from './zip-guard';
import { detectHeaderRow, headerView, type CellValue, type GridRow } from './header';

export type { CellValue, GridRow } from './header';

/** A sheet as read and stored in the draft: every non-empty row, and the header row found in it. */
export interface StoredSheet {
  name: string;
  hidden: boolean;
  /** Non-empty rows with their spreadsheet row numbers, title and notes rows included. */
  grid: GridRow[];
  /** The detected header row (1-based spreadsheet row). */
  headerRow: number;
  formulaCells: string[];
  mergedCells: string[];
  /** Numbers in text cells use a decimal comma ("12,5"); CSV only. */
  decimalComma?: boolean;
}

/** A sheet seen from one header row: what mapping and validation work on. */
export interface ParsedSheet {
  name: string;
  hidden: boolean;
  /** Spreadsheet row number of the header row (1-based). */
  headerRow: number;
  headers: string[];
  /** Data rows after the header, with their spreadsheet row numbers. */
  rows: { row: number; cells: CellValue[] }[];
  /** Cells whose value came from a formula's cached result, and merged cells: "B7". */
  formulaCells: string[];
  mergedCells: string[];
  /** Rows of the header (two when a units row sits under the names). */
  headerRows?: number[];
  decimalComma?: boolean;
}

export interface ParsedFile {
  kind: 'xlsx' | 'csv';
  sheets: StoredSheet[];
  /** CSV only: the encoding and field separator found. */
  encoding?: TextEncodingName;
  delimiter?: Delimiter;
}

/** The sheet seen from `headerRow` (the detected one by default): header names and the data rows below. */
export function viewSheet(s: StoredSheet, headerRow = s.headerRow): ParsedSheet {
  const v = headerView(s.grid, headerRow);
  return {
    name: s.name,
    hidden: s.hidden,
    headerRow,
    headerRows: v.headerRows,
    headers: v.headers,
    rows: s.grid.slice(v.dataStart),
    formulaCells: s.formulaCells,
    mergedCells: s.mergedCells,
    decimalComma: s.decimalComma,
  };
}

export function describeCsv(f: ParsedFile): string | null {
  return f.kind === 'csv' && f.encoding && f.delimiter
    ? `${f.encoding}, ${DELIMITER_NAME[f.delimiter]}-separated`
    : null;
}

export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024;
export const MAX_ROWS = SHEET_LIMITS.maxRows;
export const MAX_COLUMNS = SHEET_LIMITS.maxColumns;

export class ParseError extends Error {}

export function columnLetter(index: number): string {
  let s = '',
    n = index + 1;
  while (n > 0) {
    const m = (n - 1) % 26;
    s = String.fromCharCode(65 + m) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

function plain(v: unknown): { value: CellValue; formula: boolean } {
  if (v === null || v === undefined) return { value: null, formula: false };
  if (typeof v === 'string') return { value: v.trim() === '' ? null : v.trim(), formula: false };
  if (typeof v === 'number' || typeof v === 'boolean') return { value: v, formula: false };
  if (v instanceof Date) return { value: v.toISOString().slice(0, 10), formula: false };
  if (typeof v === 'object') {
    const o = v as Record<string, unknown>;
    if ('formula' in o || 'sharedFormula' in o) {
      const r = plain(o.result);
      return { value: r.value, formula: true };
    }
    if ('richText' in o && Array.isArray(o.richText))
      return plain((o.richText as { text: string }[]).map((t) => t.text).join(''));
    if ('text' in o) return plain(o.text);
    if ('error' in o) return { value: null, formula: false };
  }
  return { value: String(v), formula: false };
}

/**
 * Workbooks with a sheet of more rows than this (or many cells) are read row by row (exceljs'
 * streaming reader): the whole-workbook model of a 50,000-row sheet takes over 256 MB of heap
 * (measured; the job worker's peak went past 900 MB), and row by row is faster too (10,000 rows:
 * 0.55-0.94 s against 0.97-1.66 s). Smaller files — most client line lists — keep the whole model,
 * which every messy client file in the tests has been read with; both give the same cells
 * (tests/unit/parse-row-by-row.test.ts).
 */
export const ROW_BY_ROW_FROM = 5_000;
/** …or more cells with values than this in all (the model costs ~350 bytes of heap a cell). */
export const ROW_BY_ROW_FROM_CELLS = 100_000;

async function readWhole(bytes: Buffer): Promise<StoredSheet[]> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  return wb.worksheets.map(fromWorksheet);
}

/** "C12" → [12, 3] (row, 1-based column). */
function cellRef(ref: string): [number, number] {
  const m = /^([A-Z]+)(\d+)$/.exec(ref)!;
  return [Number(m[2]), columnIndex(m[1])];
}

/**
 * The streaming reader's sheets, made to read as the whole model does: merged ranges (which the
 * streaming reader skips; the zip check collected them) give every covered cell the first cell's
 * value and are listed as merged, and as formulas where the first cell is one.
 */
async function readRowByRow(bytes: Buffer, check: ZipCheck): Promise<StoredSheet[]> {
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(Readable.from([bytes]), {
    sharedStrings: 'cache',
    styles: 'cache',
    hyperlinks: 'ignore',
    worksheets: 'emit',
    entries: 'ignore',
  });
  const out: { order: number; sheet: StoredSheet }[] = [];
  const mergesByName = new Map(check.sheets.map((x) => [x.name, x.merges]));
  for await (const ws of reader) {
    const w = ws as unknown as { name: string; state?: string; id: number };
    const rows = new Map<number, CellValue[]>();
    const formulas = new Set<string>();
    for await (const row of ws) {
      const cells: CellValue[] = [];
      row.eachCell({ includeEmpty: true }, (cell, col) => {
        const p = plain(cell.value);
        cells[col - 1] = p.value;
        if (p.formula) formulas.add(`${columnLetter(col - 1)}${row.number}`);
      });
      for (let i = 0; i < cells.length; i++) if (cells[i] === undefined) cells[i] = null;
      rows.set(row.number, cells);
    }
    const merged: [number, number][] = [];
    for (const range of mergesByName.get(w.name) ?? []) {
      const [from, to] = range.split(':').map(cellRef);
      const master = rows.get(from[0])?.[from[1] - 1] ?? null;
      const masterFormula = formulas.has(`${columnLetter(from[1] - 1)}${from[0]}`);
      for (let r = from[0]; r <= Math.min(to[0], from[0] + 10_000); r++)
        for (let c = from[1]; c <= Math.min(to[1], SHEET_LIMITS.maxColumns); c++) {
          if (r === from[0] && c === from[1]) continue;
          let cells = rows.get(r);
          if (!cells) rows.set(r, (cells = []));
          for (let i = cells.length; i < c; i++) cells[i] = null;
          cells[c - 1] = master;
          merged.push([r, c]);
          if (masterFormula) formulas.add(`${columnLetter(c - 1)}${r}`);
        }
    }
    const grid: GridRow[] = [...rows.entries()]
      .sort((a, b) => a[0] - b[0])
      .filter(([, cells]) => cells.some((c) => c !== null))
      .map(([row, cells]) => ({ row, cells }));
    const order = (a: [number, number], b: [number, number]) => a[0] - b[0] || a[1] - b[1];
    const byPosition = [...formulas].map(cellRef).sort(order);
    out.push({
      // The workbook's own sheet order (the reader meets the parts in the zip's order).
      order:
        (reader as unknown as { model?: { sheets?: { name: string }[] } }).model?.sheets?.findIndex(
          (x) => x.name === w.name,
        ) ?? w.id,
      sheet: {
        name: w.name,
        hidden: w.state === 'hidden' || w.state === 'veryHidden',
        grid,
        headerRow: detectHeaderRow(grid),
        formulaCells: byPosition.map(([r, c]) => `${columnLetter(c - 1)}${r}`),
        mergedCells: merged.sort(order).map(([r, c]) => `${columnLetter(c - 1)}${r}`),
      },
    });
  }
  return out.sort((a, b) => a.order - b.order).map((x) => x.sheet);
}

function fromWorksheet(ws: ExcelJS.Worksheet): StoredSheet {
  const grid: GridRow[] = [];
  const formulaCells: string[] = [];
  const mergedCells: string[] = [];
  ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
    const cells: CellValue[] = [];
    row.eachCell({ includeEmpty: true }, (cell, col) => {
      const p = plain(cell.value);
      cells[col - 1] = p.value;
      if (p.formula) formulaCells.push(`${columnLetter(col - 1)}${rowNumber}`);
      if (cell.isMerged && cell.master !== cell) mergedCells.push(`${columnLetter(col - 1)}${rowNumber}`);
    });
    for (let i = 0; i < cells.length; i++) if (cells[i] === undefined) cells[i] = null;
    if (cells.some((c) => c !== null)) grid.push({ row: rowNumber, cells });
  });
  return {
    name: ws.name,
    hidden: ws.state === 'hidden' || ws.state === 'veryHidden',
    grid,
    headerRow: detectHeaderRow(grid),
    formulaCells,
    mergedCells,
  };
}

function fromCsv(text: string): { sheet: StoredSheet; delimiter: Delimiter } {
  const { rows, delimiter } = splitCsv(text, { maxRows: MAX_ROWS, maxColumns: MAX_COLUMNS });
  const grid: GridRow[] = [];
  rows.forEach((cells, i) => {
    if (cells.some((c) => c !== ''))
      grid.push({ row: i + 1, cells: cells.map((c) => (c === '' ? null : c)) });
  });
  const sheet: StoredSheet = {
    name: 'CSV',
    hidden: false,
    grid,
    headerRow: detectHeaderRow(grid),
    formulaCells: [],
    mergedCells: [],
    decimalComma: usesDecimalComma(rows, delimiter),
  };
  return { sheet, delimiter };
}

/** Reads an uploaded .xlsx or .csv into sheets of plain cell values; throws ParseError with a user message. */
export async function parseUpload(
  fileName: string,
  bytes: Buffer,
  /** rowByRow: read a workbook with the streaming reader whatever its size (tests compare both). */
  o: { rowByRow?: boolean } = {},
): Promise<ParsedFile> {
  if (bytes.length === 0) throw new ParseError('The file is empty.');
  if (bytes.length > MAX_UPLOAD_BYTES)
    throw new ParseError(
      `The file is ${(bytes.length / 1048576).toFixed(1)} MB; the limit is 20 MB. Split the line list or remove unused sheets.`,
    );
  const lower = fileName.toLowerCase();
  const isZip = bytes[0] === 0x50 && bytes[1] === 0x4b;
  const isOle = bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0;
  let sheets: StoredSheet[];
  let csv: Pick<ParsedFile, 'encoding' | 'delimiter'> = {};
  if (lower.endsWith('.xlsx') || lower.endsWith('.xlsm')) {
    if (isOle)
      throw new ParseError(
        'This workbook is password-protected (encrypted) or in the old .xls format. Remove the password, or save it as .xlsx, and upload again.',
      );
    if (!isZip)
      throw new ParseError(
        'This file is not a valid .xlsx workbook (it may be corrupt or renamed). Open it in a spreadsheet program and save it as .xlsx.',
      );
    // The zip directory and a streaming count of rows and columns first: nothing is held in
    // memory beyond a 16 KB step until the limits are known to hold.
    let check: ZipCheck;
    try {
      check = await checkWorkbookZip(bytes);
    } catch (e) {
      if (e instanceof ZipLimitError) throw new ParseError(e.message);
      throw e;
    }
    const rowByRow =
      o.rowByRow ??
      (check.sheets.some((x) => x.rows > ROW_BY_ROW_FROM) ||
        check.sheets.reduce((a, x) => a + x.cells, 0) > ROW_BY_ROW_FROM_CELLS);
    try {
      sheets = rowByRow ? await readRowByRow(bytes, check) : await readWhole(bytes);
    } catch {
      throw new ParseError(
        'This .xlsx workbook could not be read: it is corrupt or not a real spreadsheet. Save it again as .xlsx and upload it.',
      );
    }
  } else if (lower.endsWith('.csv') || lower.endsWith('.tsv')) {
    if (isZip || isOle)
      throw new ParseError(
        'This file is a spreadsheet workbook renamed to .csv. Upload it with its own extension (.xlsx), or save it as CSV.',
      );
    const { text, encoding } = decodeText(bytes);
    if (text.includes('\u0000'))
      throw new ParseError(
        'This .csv file holds binary data, not text. Save the line list as CSV (or .xlsx) and upload again.',
      );
    let read: ReturnType<typeof fromCsv>;
    try {
      read = fromCsv(text);
    } catch (e) {
      if (e instanceof CsvLimitError) {
        throw new ParseError(
          e.kind === 'columns'
            ? `This CSV file has ${e.count.toLocaleString('en')} fields in row ${e.row}; the limit is ${MAX_COLUMNS} columns. Delete the unused columns on the right (or check the field separator) and upload again.`
            : `This CSV file has more than ${MAX_ROWS.toLocaleString('en')} rows with data (row ${e.row.toLocaleString('en')} is past the limit); ${ROW_LIMIT_SENTENCE}`,
        );
      }
      if (e instanceof CsvQuoteError)
        throw new ParseError(
          `This CSV file could not be read: a quoted field in row ${e.row} is not closed, so the rest of the file would run into one cell. Check the quotes in that row and upload again.`,
        );
      throw e;
    }
    sheets = [read.sheet];
    csv = { encoding, delimiter: read.delimiter };
  } else if (lower.endsWith('.xls')) {
    throw new ParseError(
      'Old .xls workbooks are not read. Save the file as .xlsx (or CSV UTF-8) and upload again.',
    );
  } else {
    throw new ParseError('Upload the line list as an .xlsx workbook or a .csv file.');
  }
  if (sheets.length === 0 || sheets.every((s) => s.grid.length === 0))
    throw new ParseError('The file has no sheet with data.');
  for (const s of sheets)
    if (s.grid.length > MAX_ROWS)
      throw new ParseError(
        `Sheet "${s.name}" has ${s.grid.length.toLocaleString('en')} rows with data; ${ROW_LIMIT_SENTENCE}`,
      );
  return { kind: csv.encoding ? 'csv' : 'xlsx', sheets, ...csv };
}
