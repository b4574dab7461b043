/**
 * Checks an .xlsx workbook (a zip file) before exceljs inflates it into memory.
 *
 * 1. The central directory alone (no inflating): entry count, each entry's and the total declared
 *    uncompressed size, each entry's compression ratio, compression methods, entries inside the file.
 * 2. One streaming pass that inflates every entry through a counter (constant memory, aborted as soon
 *    as an entry yields more than its directory entry declared — a lying directory is a bomb too), and
 *    that counts, in each worksheet, the rows holding a value and the rightmost column with a value,
 *    stopping at the first limit crossed.
 * Only then does the caller hand the bytes to exceljs, whose work is bounded by these limits.
 */
import zlib from 'node:zlib';

export const ZIP_LIMITS = {
  maxEntries: 2_000,
  /** Total of the entries' uncompressed sizes. */
  maxTotalUncompressedBytes: 256 * 1024 * 1024,
  maxEntryUncompressedBytes: 200 * 1024 * 1024,
  /** Uncompressed : compressed, checked for entries over 1 MB uncompressed. Spreadsheet XML runs 5–40. */
  maxRatio: 150,
} as const;

/** Lines per sheet, and the rows above them a client's sheet may spend on titles, notes and the header. */
const MAX_LINES = 50_000;
const TITLE_ROWS = 30;

export const SHEET_LIMITS = {
  maxLines: MAX_LINES,
  titleRows: TITLE_ROWS,
  /** Rows holding at least one value, per sheet: the lines and their title and header rows. */
  maxRows: MAX_LINES + TITLE_ROWS,
  /** The rightmost column holding a value (256 = column IV). */
  maxColumns: 256,
  /** Cells holding a value, over the whole file. */
  maxCells: 2_500_000,
} as const;

/** The row limit as the user reads it, in every refusal that names it. */
export const ROW_LIMIT_SENTENCE = `the limit is ${MAX_LINES.toLocaleString('en')} lines per sheet, with up to ${TITLE_ROWS} rows above them for titles and the header. Split the line list into files of at most ${MAX_LINES.toLocaleString('en')} lines.`;

export class ZipLimitError extends Error {}

interface Entry {
  name: string;
  method: number;
  compressedSize: number;
  uncompressedSize: number;
  localHeaderOffset: number;
}

const MB = (n: number) => `${(n / 1048576).toFixed(0)} MB`;

/** Reads the central directory; throws ZipLimitError with a sentence for the user. */
export function readZipDirectory(buf: Buffer): Entry[] {
  const corrupt = () =>
    new ZipLimitError(
      'This .xlsx workbook could not be read: its zip directory is damaged. Save it again as .xlsx and upload it.',
    );
  // End of central directory: 22 bytes plus a comment of up to 65,535 bytes, at the very end.
  let eocd = -1;
  for (let i = buf.length - 22; i >= Math.max(0, buf.length - 22 - 65_535); i--) {
    if (buf.readUInt32LE(i) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw corrupt();
  let count = buf.readUInt16LE(eocd + 10);
  let cdSize = buf.readUInt32LE(eocd + 12);
  let cdOffset = buf.readUInt32LE(eocd + 16);
  if (count === 0xffff || cdOffset === 0xffffffff || cdSize === 0xffffffff) {
    // Zip64: the locator sits just before the end record and points at the zip64 end record.
    const loc = eocd - 20;
    if (loc < 0 || buf.readUInt32LE(loc) !== 0x07064b50) throw corrupt();
    const z64 = Number(buf.readBigUInt64LE(loc + 8));
    if (z64 < 0 || z64 + 56 > buf.length || buf.readUInt32LE(z64) !== 0x06064b50) throw corrupt();
    count = Number(buf.readBigUInt64LE(z64 + 32));
    cdSize = Number(buf.readBigUInt64LE(z64 + 40));
    cdOffset = Number(buf.readBigUInt64LE(z64 + 48));
  }
  if (count > ZIP_LIMITS.maxEntries) {
    throw new ZipLimitError(
      `This workbook holds ${count} files inside its zip; the limit is ${ZIP_LIMITS.maxEntries}. Save the line list alone in a new workbook and upload that.`,
    );
  }
  if (cdOffset + cdSize > buf.length) throw corrupt();
  const entries: Entry[] = [];
  let p = cdOffset;
  let total = 0;
  for (let i = 0; i < count; i++) {
    if (p + 46 > buf.length || buf.readUInt32LE(p) !== 0x02014b50) throw corrupt();
    const method = buf.readUInt16LE(p + 10);
    let compressedSize = buf.readUInt32LE(p + 20);
    let uncompressedSize = buf.readUInt32LE(p + 24);
    const nameLen = buf.readUInt16LE(p + 28),
      extraLen = buf.readUInt16LE(p + 30),
      commentLen = buf.readUInt16LE(p + 32);
    let localHeaderOffset = buf.readUInt32LE(p + 42);
    const name = buf.toString('utf8', p + 46, p + 46 + nameLen);
    // Zip64 extra field (id 1): the 64-bit values, in order, for each 32-bit field set to 0xffffffff.
    let x = p + 46 + nameLen;
    const xEnd = x + extraLen;
    while (x + 4 <= xEnd) {
      const id = buf.readUInt16LE(x),
        len = buf.readUInt16LE(x + 2);
      if (id === 1) {
        let q = x + 4;
        if (uncompressedSize === 0xffffffff && q + 8 <= x + 4 + len) {
          uncompressedSize = Number(buf.readBigUInt64LE(q));
          q += 8;
        }
        if (compressedSize === 0xffffffff && q + 8 <= x + 4 + len) {
          compressedSize = Number(buf.readBigUInt64LE(q));
          q += 8;
        }
        if (localHeaderOffset === 0xffffffff && q + 8 <= x + 4 + len) {
          localHeaderOffset = Number(buf.readBigUInt64LE(q));
          q += 8;
        }
      }
      x += 4 + len;
    }
    p = xEnd + commentLen;
    if (method !== 0 && method !== 8) {
      throw new ZipLimitError(
        `This workbook stores "${name}" with a compression method spreadsheet programs do not use. Save it again as .xlsx and upload it.`,
      );
    }
    if (localHeaderOffset + 30 + compressedSize > buf.length) throw corrupt();
    if (uncompressedSize > ZIP_LIMITS.maxEntryUncompressedBytes) {
      throw new ZipLimitError(
        `This workbook's part "${name}" unpacks to ${MB(uncompressedSize)}; the limit is ${MB(ZIP_LIMITS.maxEntryUncompressedBytes)} per part. Remove unused sheets, images or formatting, or split the line list.`,
      );
    }
    if (
      uncompressedSize > 1024 * 1024 &&
      uncompressedSize > ZIP_LIMITS.maxRatio * Math.max(1, compressedSize)
    ) {
      throw new ZipLimitError(
        `This workbook's part "${name}" is compressed ${Math.round(uncompressedSize / Math.max(1, compressedSize))} to 1; the limit is ${ZIP_LIMITS.maxRatio} to 1, which real spreadsheets stay far below. The file is refused as a possible zip bomb; save it again as .xlsx from a spreadsheet program.`,
      );
    }
    total += uncompressedSize;
    if (total > ZIP_LIMITS.maxTotalUncompressedBytes) {
      throw new ZipLimitError(
        `This workbook unpacks to more than ${MB(ZIP_LIMITS.maxTotalUncompressedBytes)}, the limit. Remove unused sheets, images or formatting, or split the line list.`,
      );
    }
    entries.push({ name, method, compressedSize, uncompressedSize, localHeaderOffset });
  }
  return entries;
}

/** "AB" → 28 (1-based). */
export function columnIndex(letters: string): number {
  let n = 0;
  for (let i = 0; i < letters.length; i++) n = n * 26 + (letters.charCodeAt(i) - 64);
  return n;
}

function columnName(n: number): string {
  let s = '';
  while (n > 0) {
    const m = (n - 1) % 26;
    s = String.fromCharCode(65 + m) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

/**
 * Counts a worksheet's rows and columns with values from its XML, chunk by chunk. Chunks are cut
 * after their last '>' so every tag is whole when scanned.
 */
class SheetScanner {
  rows = 0;
  maxColumn = 0;
  cells = 0;
  /** Merged ranges ("A1:I1"), the first MAX_MERGES; the row-by-row reader does not see them itself. */
  merges: string[] = [];
  private rowHasValue = false;
  private column = 0;
  private tail = '';
  private static TOKEN = /<row[\s>/]|<c(?=[\s>/])(?:[^>]*?\sr="([A-Z]{1,4})\d*")?[^>]*>|<v[\s>]|<is[\s>]/g;

  constructor(
    private readonly sheetName: string,
    private readonly cellsBefore: () => number,
  ) {}

  push(text: string) {
    const s = this.tail + text;
    const cut = s.lastIndexOf('>') + 1;
    this.tail = s.slice(cut);
    if (this.tail.length > 65_536)
      throw new ZipLimitError(
        `Sheet "${this.sheetName}" holds a cell or tag too long to read. Save the workbook again as .xlsx and upload it.`,
      );
    this.scan(s.slice(0, cut));
  }

  end() {
    this.closeRow();
  }

  private closeRow() {
    if (this.rowHasValue) {
      this.rows++;
      if (this.rows > SHEET_LIMITS.maxRows) {
        throw new ZipLimitError(
          `Sheet "${this.sheetName}" has more than ${SHEET_LIMITS.maxRows.toLocaleString('en')} rows with data; ${ROW_LIMIT_SENTENCE}`,
        );
      }
    }
    this.rowHasValue = false;
    this.column = 0;
  }

  private scan(s: string) {
    if (s.includes('<mergeCell'))
      for (const m of s.matchAll(/<mergeCell\b[^>]*?\sref="([A-Z]{1,3}\d+:[A-Z]{1,3}\d+)"/g))
        if (this.merges.length < MAX_MERGES) this.merges.push(m[1]);
    const re = SheetScanner.TOKEN;
    re.lastIndex = 0;
    let m: RegExpExecArray | null;
    while ((m = re.exec(s))) {
      const t = m[0];
      if (t.startsWith('<row')) this.closeRow();
      else if (t.charCodeAt(1) === 99 /* c */) this.column = m[1] ? columnIndex(m[1]) : this.column + 1;
      else {
        this.rowHasValue = true;
        this.cells++;
        if (this.column > this.maxColumn) {
          this.maxColumn = this.column;
          if (this.maxColumn > SHEET_LIMITS.maxColumns) {
            throw new ZipLimitError(
              `Sheet "${this.sheetName}" has data in column ${columnName(this.maxColumn)} (column ${this.maxColumn}); the limit is ${SHEET_LIMITS.maxColumns} columns (up to ${columnName(SHEET_LIMITS.maxColumns)}). Delete the unused columns on the right and upload again.`,
            );
          }
        }
        if (this.cellsBefore() + this.cells > SHEET_LIMITS.maxCells) {
          throw new ZipLimitError(
            `The workbook has more than ${SHEET_LIMITS.maxCells.toLocaleString('en')} cells with data; that is the limit. Remove unused sheets or columns, or split the line list.`,
          );
        }
      }
    }
  }
}

/** Sheet names by part ("xl/worksheets/sheet1.xml" → "Lines"), read from the small workbook parts. */
function sheetNames(buf: Buffer, entries: Entry[]): Map<string, string> {
  const out = new Map<string, string>();
  const wb = entries.find((e) => e.name === 'xl/workbook.xml');
  const rels = entries.find((e) => e.name === 'xl/_rels/workbook.xml.rels');
  if (!wb || !rels) return out;
  const small = (e: Entry) =>
    e.uncompressedSize <= 8 * 1024 * 1024 ? inflateWhole(buf, e).toString('utf8') : '';
  const targets = new Map<string, string>();
  for (const m of small(rels).matchAll(/<Relationship\b[^>]*>/g)) {
    const id = /\sId="([^"]+)"/.exec(m[0])?.[1],
      target = /\sTarget="([^"]+)"/.exec(m[0])?.[1];
    if (id && target) targets.set(id, target.startsWith('/') ? target.slice(1) : `xl/${target}`);
  }
  for (const m of small(wb).matchAll(/<sheet\b[^>]*>/g)) {
    const name = /\sname="([^"]*)"/.exec(m[0])?.[1],
      id = /\sr:id="([^"]+)"/.exec(m[0])?.[1];
    const part = id ? targets.get(id) : undefined;
    if (name !== undefined && part)
      out.set(
        part,
        name
          .replace(/&amp;/g, '&')
          .replace(/&lt;/g, '<')
          .replace(/&gt;/g, '>')
          .replace(/&quot;/g, '"')
          .replace(/&apos;/g, "'"),
      );
  }
  return out;
}

function dataOf(buf: Buffer, e: Entry): Buffer {
  const lh = e.localHeaderOffset;
  if (buf.readUInt32LE(lh) !== 0x04034b50)
    throw new ZipLimitError(
      'This .xlsx workbook could not be read: its zip directory is damaged. Save it again as .xlsx and upload it.',
    );
  const start = lh + 30 + buf.readUInt16LE(lh + 26) + buf.readUInt16LE(lh + 28);
  return buf.subarray(start, start + e.compressedSize);
}

function inflateWhole(buf: Buffer, e: Entry): Buffer {
  const data = dataOf(buf, e);
  if (e.method === 0) return data;
  try {
    return zlib.inflateRawSync(data, { maxOutputLength: Math.max(1, e.uncompressedSize) });
  } catch {
    throw lying(e);
  }
}

const lying = (e: Entry) =>
  new ZipLimitError(
    `This workbook's part "${e.name}" unpacks to more than its zip directory declares. The file is refused as a possible zip bomb; save it again as .xlsx from a spreadsheet program.`,
  );

/**
 * Inflates one entry as a stream (zlib's own 16 KB steps), never holding more than a step, counting
 * what comes out against the declared size, and feeds worksheets to the scanner.
 */
async function streamEntry(buf: Buffer, e: Entry, onText: ((s: string) => void) | null) {
  const data = dataOf(buf, e);
  const decoder = new TextDecoder('utf-8');
  if (e.method === 0) {
    if (data.length !== e.uncompressedSize) throw lying(e);
    if (onText)
      for (let i = 0; i < data.length; i += 65_536)
        onText(decoder.decode(data.subarray(i, i + 65_536), { stream: true }));
    return;
  }
  const inflate = zlib.createInflateRaw();
  let produced = 0;
  try {
    inflate.end(data);
    for await (const out of inflate as AsyncIterable<Buffer>) {
      produced += out.length;
      if (produced > e.uncompressedSize) throw lying(e);
      if (onText) onText(decoder.decode(out, { stream: true }));
    }
  } catch (err) {
    if (err instanceof ZipLimitError) throw err;
    throw new ZipLimitError(
      `This .xlsx workbook could not be read: the part "${e.name}" is damaged. Save it again as .xlsx and upload it.`,
    );
  } finally {
    inflate.destroy();
  }
  if (produced !== e.uncompressedSize) throw lying(e);
}

const MAX_MERGES = 10_000;

export interface ZipCheck {
  entries: number;
  uncompressedBytes: number;
  sheets: { name: string; rows: number; columns: number; cells: number; merges: string[] }[];
}

/** Throws ZipLimitError naming the limit crossed; returns what it counted. */
export async function checkWorkbookZip(buf: Buffer): Promise<ZipCheck> {
  const entries = readZipDirectory(buf);
  const names = sheetNames(buf, entries);
  const sheets: ZipCheck['sheets'] = [];
  let cells = 0;
  for (const e of entries) {
    if (e.name.endsWith('/')) continue;
    const isSheet = /^xl\/worksheets\/[^/]+\.xml$/.test(e.name);
    if (!isSheet) {
      await streamEntry(buf, e, null);
      continue;
    }
    const name = names.get(e.name) ?? e.name.replace(/^.*\//, '').replace(/\.xml$/, '');
    const scanner = new SheetScanner(name, () => cells);
    await streamEntry(buf, e, (s) => scanner.push(s));
    scanner.end();
    cells += scanner.cells;
    sheets.push({
      name,
      rows: scanner.rows,
      columns: scanner.maxColumn,
      cells: scanner.cells,
      merges: scanner.merges,
    });
  }
  return {
    entries: entries.length,
    uncompressedBytes: entries.reduce((a, e) => a + e.uncompressedSize, 0),
    sheets,
  };
}
