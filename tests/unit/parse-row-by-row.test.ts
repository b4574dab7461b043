/**
 * The two ways an .xlsx is read give the same cells: the whole workbook model (files up to
 * ROW_BY_ROW_FROM rows a sheet) and exceljs' streaming reader (bigger ones, so a 50,000-row sheet
 * does not cost the worker the whole model's memory). Checked on every workbook of the messy
 * client-style corpus (title rows, merged cells, formulas, units rows, hidden sheets), the demo
 * line list, and a workbook made here with what the corpus lacks.
 */
import { readFileSync } from 'node:fs';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { parseUpload, ROW_BY_ROW_FROM } from '@/lib/lines/parse';
import { messyCorpus } from '../fixtures/messy-lines';

async function bothWays(name: string, bytes: Buffer) {
  const whole = await parseUpload(name, bytes, { rowByRow: false });
  const rowByRow = await parseUpload(name, bytes, { rowByRow: true });
  return { whole, rowByRow };
}

describe('reading a workbook row by row gives what the whole model gives', () => {
  it('every .xlsx of the messy corpus and the demo line list', { timeout: 60_000 }, async () => {
    const files = (await messyCorpus()).filter((f) => f.name.endsWith('.xlsx'));
    files.push({ name: 'demo.xlsx', bytes: readFileSync('seed/brack-point-line-list.xlsx') });
    expect(files.length).toBeGreaterThan(3);
    for (const f of files) {
      const { whole, rowByRow } = await bothWays(f.name, f.bytes);
      expect(rowByRow, f.name).toEqual(whole);
    }
  });

  it('merged ranges across and down, a formula, a date, rich text and a hidden first sheet', async () => {
    const wb = new ExcelJS.Workbook();
    const notes = wb.addWorksheet('Notes', { state: 'hidden' });
    notes.getCell('A1').value = 'internal';
    const ws = wb.addWorksheet('Line list');
    ws.getCell('A1').value = 'UNIT 12 — HOT OIL SYSTEM';
    ws.mergeCells('A1:F1');
    ws.getRow(3).values = ['Line', 'Size', 'Temp', 'Length', 'Issued', 'Service'];
    ws.getRow(4).values = ['12-HO-001', 4, 240, null, new Date(Date.UTC(2026, 10, 3)), 'Hot oil'];
    ws.getCell('D4').value = { formula: 'B4*10', result: 40 };
    ws.getCell('F5').value = { richText: [{ text: 'Hot ' }, { text: 'oil', font: { bold: true } }] };
    ws.getRow(5).getCell(1).value = '12-HO-002';
    ws.getCell('B5').value = 6;
    ws.mergeCells('C5:C6');
    ws.getCell('C5').value = 250;
    ws.getRow(6).getCell(1).value = '12-HO-003';
    const bytes = Buffer.from(await wb.xlsx.writeBuffer());
    const { whole, rowByRow } = await bothWays('made.xlsx', bytes);
    expect(rowByRow).toEqual(whole);
    const sheet = rowByRow.sheets[1];
    expect(rowByRow.sheets.map((s) => [s.name, s.hidden])).toEqual([
      ['Notes', true],
      ['Line list', false],
    ]);
    expect(sheet.grid[0].cells).toEqual(Array(6).fill('UNIT 12 — HOT OIL SYSTEM'));
    expect(sheet.grid.find((r) => r.row === 6)?.cells.slice(0, 3)).toEqual(['12-HO-003', null, 250]);
    expect(sheet.mergedCells).toEqual(['B1', 'C1', 'D1', 'E1', 'F1', 'C6']);
    expect(sheet.formulaCells).toEqual(['D4']);
    expect(sheet.grid.find((r) => r.row === 4)?.cells[4]).toBe('2026-11-03');
    expect(sheet.grid.find((r) => r.row === 5)?.cells[5]).toBe('Hot oil');
  });

  it(`a sheet of more than ${ROW_BY_ROW_FROM.toLocaleString('en')} rows is read row by row, with the same cells`, {
    timeout: 60_000,
  }, async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Big');
    ws.addRow(['Tag', 'Temp']);
    for (let i = 0; i < ROW_BY_ROW_FROM + 1; i++) ws.addRow([`L-${i}`, i % 300]);
    const bytes = Buffer.from(await wb.xlsx.writeBuffer());
    const byDefault = await parseUpload('big.xlsx', bytes);
    expect(byDefault.sheets[0].grid).toHaveLength(ROW_BY_ROW_FROM + 2);
    expect(byDefault.sheets[0].grid.at(-1)).toEqual({
      row: ROW_BY_ROW_FROM + 2,
      cells: [`L-${ROW_BY_ROW_FROM}`, ROW_BY_ROW_FROM % 300],
    });
    expect(byDefault).toEqual(await parseUpload('big.xlsx', bytes, { rowByRow: false }));
  });
});
