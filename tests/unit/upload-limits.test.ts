import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import zlib from 'node:zlib';
import ExcelJS from 'exceljs';
import { parseUpload, ParseError } from '@/lib/lines/parse';
import { checkWorkbookZip, SHEET_LIMITS, ZIP_LIMITS } from '@/lib/lines/zip-guard';
import { buildZip, workbookParts } from '../support/zip';

/** Runs the upload and returns the refusal's sentence and how long it took. */
async function refusal(name: string, bytes: Buffer): Promise<{ message: string; ms: number }> {
  const t0 = performance.now();
  try {
    await parseUpload(name, bytes);
  } catch (e) {
    expect(e).toBeInstanceOf(ParseError);
    return { message: (e as Error).message, ms: performance.now() - t0 };
  }
  throw new Error('the upload was accepted');
}

const sheetXml = (rows: string) =>
  `<?xml version="1.0"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>${rows}</sheetData></worksheet>`;

describe('upload limits: hostile workbooks are refused before exceljs inflates them', () => {
  it('a real workbook passes, and the streaming count agrees with what exceljs reads', async () => {
    const bytes = readFileSync('seed/brack-point-line-list.xlsx');
    const check = await checkWorkbookZip(bytes);
    const parsed = await parseUpload('brack.xlsx', bytes);
    expect(check.sheets.map((s) => s.rows)).toEqual(parsed.sheets.map((s) => s.grid.length));
    expect(check.sheets[0].columns).toBe(Math.max(...parsed.sheets[0].grid.map((r) => r.cells.length)));
  });

  it('a zip bomb: parts compressed a thousand to one are refused from the directory, in milliseconds', async () => {
    const zeros = Buffer.alloc(40 * 1024 * 1024, 0x20);
    const deflated = {
      data: zlib.deflateRawSync(zeros, { level: 9 }),
      size: zeros.length,
      crc: zlib.crc32(zeros),
    };
    const parts = workbookParts('Lines', { deflated });
    for (let i = 2; i <= 10; i++) parts.push({ name: `xl/media/image${i}.bin`, deflated });
    const bomb = buildZip(parts);
    expect(bomb.length).toBeLessThan(500 * 1024); // like the 414 KB workbook of the issue
    const { message, ms } = await refusal('bomb.xlsx', bomb);
    expect(message).toMatch(/compressed \d+ to 1; the limit is 150 to 1.*possible zip bomb/);
    expect(message).toContain('"xl/worksheets/sheet1.xml"');
    expect(ms).toBeLessThan(2_000);
  });

  it('a zip bomb whose directory lies about the sizes is stopped while streaming, past the declared size', async () => {
    const zeros = Buffer.alloc(40 * 1024 * 1024, 0x20);
    const deflated = { data: zlib.deflateRawSync(zeros, { level: 9 }), size: 2048, crc: 0 };
    const bomb = buildZip(workbookParts('Lines', { deflated }));
    const { message, ms } = await refusal('liar.xlsx', bomb);
    expect(message).toBe(
      'This workbook\'s part "xl/worksheets/sheet1.xml" unpacks to more than its zip directory declares. The file is refused as a possible zip bomb; save it again as .xlsx from a spreadsheet program.',
    );
    expect(ms).toBeLessThan(2_000);
  });

  it('too many parts, and too much in total, are refused from the directory', async () => {
    const many = buildZip(
      Array.from({ length: ZIP_LIMITS.maxEntries + 1 }, (_, i) => ({ name: `xl/x${i}.xml`, data: 'x' })),
    );
    expect((await refusal('many.xlsx', many)).message).toBe(
      `This workbook holds ${ZIP_LIMITS.maxEntries + 1} files inside its zip; the limit is ${ZIP_LIMITS.maxEntries}. Save the line list alone in a new workbook and upload that.`,
    );
    const big = buildZip(workbookParts('Lines', { data: sheetXml(''), declaredSize: 300 * 1024 * 1024 }));
    expect((await refusal('big.xlsx', big)).message).toMatch(
      /part "xl\/worksheets\/sheet1.xml" unpacks to 300 MB; the limit is 200 MB per part/,
    );
  });

  it('the huge sheet: 1,048,576 rows stop at the row limit quickly, naming it', {
    timeout: 90_000,
  }, async () => {
    const chunks: string[] = [];
    for (let r = 1; r <= 1_048_576; r++) chunks.push(`<row r="${r}"><c r="A${r}"><v>${r}</v></c></row>`);
    const xml = Buffer.from(sheetXml(chunks.join('')), 'utf8');
    const deflated = { data: zlib.deflateRawSync(xml, { level: 1 }), size: xml.length, crc: zlib.crc32(xml) };
    const { message, ms } = await refusal('huge.xlsx', buildZip(workbookParts('Lines', { deflated })));
    expect(message).toBe(
      'Sheet "Lines" has more than 50,030 rows with data; the limit is 50,000 lines per sheet, with up to 30 rows above them for titles and the header. Split the line list into files of at most 50,000 lines.',
    );
    expect(ms).toBeLessThan(5_000); // the issue measured 13.5 s and 1.37 GB for this file
  });

  it('a sheet with a value past column IV is refused, naming the column and the limit', async () => {
    const file = buildZip(
      workbookParts('Lines', {
        data: sheetXml(
          '<row r="1"><c r="A1" t="inlineStr"><is><t>Tag</t></is></c><c r="GJH1"><v>1</v></c></row>',
        ),
      }),
    );
    expect((await refusal('wide.xlsx', file)).message).toBe(
      'Sheet "Lines" has data in column GJH (column 5000); the limit is 256 columns (up to IV). Delete the unused columns on the right and upload again.',
    );
  });

  it('styled empty cells and empty rows do not count against the limits', async () => {
    const rows = Array.from(
      { length: 60_000 },
      (_, i) => `<row r="${i + 2}" s="1"><c r="XFD${i + 2}" s="3"/></row>`,
    ).join('');
    const file = buildZip(
      workbookParts('Lines', { data: sheetXml(`<row r="1"><c r="A1"><v>1</v></c></row>${rows}`) }),
    );
    const check = await checkWorkbookZip(file);
    expect(check.sheets).toEqual([{ name: 'Lines', rows: 1, columns: 1, cells: 1, merges: [] }]);
  });

  it('a workbook written by exceljs at the column limit passes', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Lines & more');
    ws.addRow(Array.from({ length: SHEET_LIMITS.maxColumns }, (_, i) => `H${i}`));
    ws.addRow(Array.from({ length: SHEET_LIMITS.maxColumns }, (_, i) => i));
    const bytes = Buffer.from(await wb.xlsx.writeBuffer());
    expect((await checkWorkbookZip(bytes)).sheets).toEqual([
      { name: 'Lines & more', rows: 2, columns: 256, cells: 512, merges: [] },
    ]);
    expect((await parseUpload('ok.xlsx', bytes)).sheets[0].grid).toHaveLength(2);
  });
});

describe('upload limits: CSV', () => {
  it('the over-wide CSV (5,000 columns) is refused at its first row, quickly', async () => {
    const row = Array.from({ length: 5_000 }, (_, i) => `${i}.5`).join(',');
    const csv = Buffer.from(Array.from({ length: 600 }, () => row).join('\r\n'), 'utf8');
    const { message, ms } = await refusal('wide.csv', csv);
    expect(message).toBe(
      'This CSV file has 5,000 fields in row 1; the limit is 256 columns. Delete the unused columns on the right (or check the field separator) and upload again.',
    );
    expect(ms).toBeLessThan(3_000); // the issue measured 13 s and 1.55 GB
  });

  it('a CSV with more rows than the limit is refused at the first row past it', async () => {
    const csv = Buffer.from(
      ['Tag,Temp', ...Array.from({ length: 60_000 }, (_, i) => `L-${i},${i % 300}`)].join('\n'),
      'utf8',
    );
    const { message } = await refusal('long.csv', csv);
    expect(message).toBe(
      'This CSV file has more than 50,030 rows with data (row 50,031 is past the limit); the limit is 50,000 lines per sheet, with up to 30 rows above them for titles and the header. Split the line list into files of at most 50,000 lines.',
    );
  });

  it('trailing empty fields do not make a row wide', async () => {
    const csv = Buffer.from(`Tag;Temp${';'.repeat(400)}\nL-1;120${';'.repeat(400)}\n`, 'utf8');
    const f = await parseUpload('ok.csv', csv);
    expect(f.sheets[0].grid.map((r) => r.cells.slice(0, 2))).toEqual([
      ['Tag', 'Temp'],
      ['L-1', '120'],
    ]);
  });
});
