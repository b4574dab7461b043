import { describe, expect, it } from 'vitest';
import iconv from 'iconv-lite';
import { decodeText, detectEncoding, splitCsv, usesDecimalComma } from '@/lib/lines/decode';
import { detectHeaderRow, headerView, isUnitRow, scoreHeaderRow } from '@/lib/lines/header';
import { suggestMapping } from '@/lib/lines/mapping';
import { parseUpload, viewSheet, type ParsedSheet } from '@/lib/lines/parse';
import {
  parseLocation,
  parseNumber,
  parsePurposes,
  parseYesNo,
  parseGeometry,
  validateSheet,
  missingRequired,
} from '@/lib/lines/validate';
import { readImportRequest } from '@/lib/lines/import-request';
import { checkLineList, parseArgs } from '@/lib/lines/check-cli';
import { AppError } from '@/lib/errors';
import {
  coneRoofAreaM2,
  ellipsoidalHeadAreaM2,
  hemisphericalHeadAreaM2,
  parseHeadType,
  torisphericalHeadAreaM2,
  vesselAreaM2,
} from '@/lib/lines/vessel-area';
import {
  equipmentWorkbook,
  BOM_COMMA_TEXT,
  SEMICOLON_1252_TEXT,
  TAB_UTF16_TEXT,
  bomCommaCsv,
  problemsWorkbook,
  semicolon1252Csv,
  tabUtf16Csv,
  titleRowsWorkbook,
  unitsRowWorkbook,
} from '../fixtures/messy-lines';

const sheetOf = async (name: string, bytes: Buffer, sheet?: string) => {
  const f = await parseUpload(name, bytes);
  return { file: f, sheet: viewSheet(sheet ? f.sheets.find((s) => s.name === sheet)! : f.sheets[0]) };
};

describe('decoding text files as clients send them', () => {
  it('names the encoding: BOMs, UTF-16 without a BOM, UTF-8, Windows-1252', () => {
    expect(detectEncoding(bomCommaCsv())).toBe('UTF-8 with BOM');
    expect(detectEncoding(tabUtf16Csv())).toBe('UTF-16LE');
    expect(detectEncoding(iconv.encode('Tag\tTemp\r\nA\t1\r\n', 'utf16le'))).toBe('UTF-16LE');
    expect(
      detectEncoding(Buffer.concat([Buffer.from([0xfe, 0xff]), iconv.encode('Tag;Temp', 'utf16be')])),
    ).toBe('UTF-16BE');
    expect(detectEncoding(Buffer.from('Länge;Temp\n', 'utf8'))).toBe('UTF-8');
    expect(detectEncoding(semicolon1252Csv())).toBe('Windows-1252');
  });
  it('decodes each to the same text, without the BOM', () => {
    expect(decodeText(semicolon1252Csv()).text).toBe(SEMICOLON_1252_TEXT);
    expect(decodeText(tabUtf16Csv()).text).toBe(TAB_UTF16_TEXT);
    expect(decodeText(bomCommaCsv()).text).toBe(BOM_COMMA_TEXT);
  });
  it('finds the delimiter with papaparse, keeps quoted commas, and tells decimal commas from thousands commas', () => {
    const semi = splitCsv(SEMICOLON_1252_TEXT);
    expect(semi.delimiter).toBe(';');
    expect(semi.rows[4]).toEqual([
      'S-1001',
      'Dampf 6 bar',
      'DN 80',
      '12,5',
      '165,5',
      '180',
      'Wärmeschutz',
      'außen',
      'Flanschkappen',
    ]);
    expect(usesDecimalComma(semi.rows, semi.delimiter)).toBe(true);
    const tab = splitCsv(TAB_UTF16_TEXT);
    expect(tab.delimiter).toBe('\t');
    const comma = splitCsv(BOM_COMMA_TEXT);
    expect(comma.delimiter).toBe(',');
    expect(comma.rows[1].slice(0, 4)).toEqual(['L-500', 'Vapor, baja presión', '2', '1,250']);
    expect(usesDecimalComma(comma.rows, ',')).toBe(false);
  });
  it('reads numbers as the file writes them', () => {
    expect(parseNumber('12,5', true)).toBe(12.5);
    expect(parseNumber('1.250,0', true)).toBe(1250);
    expect(parseNumber('-3,25', true)).toBe(-3.25);
    expect(parseNumber('1,250', false)).toBe(1250);
    expect(parseNumber('1,250.5', false)).toBe(1250.5);
    expect(parseNumber('12,5', false)).toBe(12.5);
    expect(parseNumber('TBD', true)).toBe('invalid');
  });
});

describe('header row detection', () => {
  it('scores rows by the fields their cells name; a merged title counts once and numbers count against', () => {
    expect(
      scoreHeaderRow([
        'ACME — LINE DESIGNATION TABLE',
        'ACME — LINE DESIGNATION TABLE',
        'ACME — LINE DESIGNATION TABLE',
      ]),
    ).toBe(1);
    expect(scoreHeaderRow(['Line No.', 'Size (in)', 'Oper. Temp (°F)'])).toBe(3 + 3 + 2); // "size in" is a synonym itself
    expect(scoreHeaderRow(['40-ST-101', 'LP steam', '3"', 120, 300])).toBeLessThan(1);
    expect(
      detectHeaderRow([
        { row: 1, cells: ['Title'] },
        { row: 2, cells: ['Rev C', 'Issued'] },
        { row: 4, cells: ['Tag', 'NPS', 'Temp'] },
        { row: 5, cells: ['A', '2', 150] },
      ]),
    ).toBe(4);
  });
  it('skips the title, revision and blank rows of a client workbook; the unread column stays unmapped', async () => {
    const { file, sheet } = await sheetOf('client.xlsx', await titleRowsWorkbook());
    expect(file.sheets.map((s) => [s.name, s.hidden, s.headerRow])).toEqual([
      ['Line designation', false, 4],
      ['Rev B (old)', true, 1],
      ['Equipment', false, 3],
    ]);
    expect(sheet.headers[0]).toBe('Line No.');
    expect(sheet.rows.map((r) => r.row)).toEqual([5, 6, 8, 9]);
    const m = suggestMapping(sheet.headers);
    expect(m.columns).toEqual({
      tag: 0,
      service: 1,
      nps: 2,
      length: 3,
      normalTemp: 4,
      maxTemp: 5,
      purposes: 6,
      location: 7,
      notes: 9,
    });
    expect(m.units).toMatchObject({ nps: 'NPS', length: 'ft', normalTemp: '°F', maxTemp: '°F' });
  });
  it('folds a units row under the names into the headers', async () => {
    expect(isUnitRow([null, 'in', 'ft', '°F', '(°C)', '[mm]'])).toBe(true);
    expect(isUnitRow(['U-1', '2', 100])).toBe(false);
    const { sheet } = await sheetOf('units.xlsx', await unitsRowWorkbook());
    expect(sheet.headerRows).toEqual([1, 2]);
    expect(sheet.headers).toEqual(['Tag', 'Size in', 'Length ft', 'Temp °F', 'Max temp °F', 'Purpose']);
    const v = validateSheet(sheet, suggestMapping(sheet.headers));
    expect(v.errorCount).toBe(0);
    expect(v.lines.map((l) => [l.tag, l.nps, l.lengthM, l.normalTempC])).toEqual([
      ['U-1', '2', 30.48, 100],
      ['U-2', '6', expect.closeTo(10, 4), 200],
    ]);
  });
  it('a header row the user picks is used as given (rows above it are not read)', () => {
    const grid = [
      { row: 1, cells: ['Tag', 'Temp'] },
      { row: 2, cells: ['Line', 'NPS', 'Temp (°C)'] },
      { row: 3, cells: ['A-1', '2', 100] },
    ];
    expect(headerView(grid, 2)).toEqual({
      headers: ['Line', 'NPS', 'Temp (°C)'],
      headerRows: [2],
      dataStart: 2,
    });
  });
});

describe('international words', () => {
  it('maps German, French and Spanish headers with their units', async () => {
    const de = (await sheetOf('de.csv', semicolon1252Csv())).sheet;
    expect(de.headerRow).toBe(4);
    expect(suggestMapping(de.headers)).toMatchObject({
      columns: {
        tag: 0,
        service: 1,
        nps: 2,
        length: 3,
        normalTemp: 4,
        maxTemp: 5,
        purposes: 6,
        location: 7,
        notes: 8,
      },
      units: { nps: 'DN', normalTemp: '°C' },
    });
    const fr = (await sheetOf('fr.csv', tabUtf16Csv())).sheet;
    expect(suggestMapping(fr.headers).columns).toEqual({
      tag: 0,
      service: 1,
      nps: 2,
      length: 3,
      normalTemp: 4,
      purposes: 5,
      location: 6,
    });
    const es = (await sheetOf('es.csv', bomCommaCsv())).sheet;
    expect(suggestMapping(es.headers)).toMatchObject({
      columns: {
        tag: 0,
        service: 1,
        nps: 2,
        length: 3,
        normalTemp: 4,
        purposes: 5,
        location: 6,
        accessible: 7,
      },
      units: { length: 'ft', normalTemp: '°F' },
    });
  });
  it('reads purpose, location, yes/no and geometry words', () => {
    expect(parsePurposes('Wärmeschutz, Personenschutz')).toEqual(['heatConservation', 'personnelProtection']);
    expect(parsePurposes('protection du personnel')).toEqual(['personnelProtection']);
    expect(parsePurposes('conservación de calor')).toEqual(['heatConservation']);
    expect(parsePurposes('anticondensation')).toEqual(['condensationControl']);
    expect(parsePurposes('hors gel')).toEqual(['freezeProtection']);
    expect(parsePurposes('Frostschutz')).toEqual(['freezeProtection']);
    expect(parsePurposes('Kälteschutz')).toEqual(['condensationControl']);
    expect(parsePurposes('warmtebehoud + persoonsbescherming')).toEqual([
      'heatConservation',
      'personnelProtection',
    ]);
    expect(parsePurposes('H+P')).toEqual(['heatConservation', 'personnelProtection']);
    expect(parsePurposes('ET')).toBeNull();
    expect(['außen', 'extérieur', 'buiten', 'exterior'].map(parseLocation)).toEqual([
      'outdoor',
      'outdoor',
      'outdoor',
      'outdoor',
    ]);
    expect(['innen', 'intérieur', 'binnen', 'Halle'].map(parseLocation)).toEqual([
      'indoor',
      'indoor',
      'indoor',
      'indoor',
    ]);
    expect(parseLocation('Pipe rack')).toBeNull();
    expect(['ja', 'oui', 'sí', 'Nein', 'non', 'nee'].map(parseYesNo)).toEqual([
      true,
      true,
      true,
      false,
      false,
      false,
    ]);
    expect([parseGeometry('Behälter'), parseGeometry('verticale'), parseGeometry('Rohrleitung')]).toEqual([
      'vessel',
      'vertical-pipe',
      'horizontal-pipe',
    ]);
  });
});

describe('value questions instead of row errors', () => {
  it('asks once per distinct unknown value and imports the rows once answered', async () => {
    const { sheet } = await sheetOf('client.xlsx', await titleRowsWorkbook());
    const mapping = suggestMapping(sheet.headers);
    const before = validateSheet(sheet, mapping);
    expect(before.unknownValues.map((u) => [u.field, u.value, u.count, u.rows, u.column])).toEqual([
      ['location', 'Pipe rack', 2, [5, 9], 'H'],
      ['location', 'Platform', 1, [6], 'H'],
    ]);
    expect(
      before.issues.filter((i) => i.severity === 'error').map((i) => `${i.row} ${i.column}: ${i.message}`),
    ).toEqual([
      '5 H: Indoor / outdoor "Pipe rack" in 2 rows (5, 9) is not a word Lagwise knows (indoor or outdoor); say what it means under "Values to answer".',
      '6 H: Indoor / outdoor "Platform" in row 6 is not a word Lagwise knows (indoor or outdoor); say what it means under "Values to answer".',
    ]);
    const after = validateSheet(sheet, {
      ...mapping,
      values: { location: { 'pipe rack': 'outdoor', platform: 'indoor' } },
    });
    expect(after.errorCount).toBe(0);
    expect(after.unknownValues).toEqual([]);
    expect(
      after.lines.map((l) => [
        l.tag,
        l.nps,
        l.outsideDiameterMm,
        +l.lengthM!.toFixed(3),
        +l.normalTempC.toFixed(2),
        l.purposes.join('+'),
        l.outdoor,
      ]),
    ).toEqual([
      ['40-ST-101', '3', 88.9, 36.576, 148.89, 'heatConservation', true],
      ['40-ST-102', '1-1/2', 48.3, 24.384, 148.89, 'personnelProtection', false],
      ['40-CW-201', '4', 114.3, 60.96, 6.67, 'condensationControl', false],
      ['40-CD-301', '3/4', 26.7, 18.288, 121.11, 'heatConservation+personnelProtection', true],
    ]);
    expect(after.issues).toEqual([
      {
        row: 6,
        column: 'D',
        field: 'length',
        severity: 'warning',
        message: 'Cell D6 holds a formula; its last calculated value was used.',
      },
    ]);
  });
  it('an answer "no insulation purpose" leaves the line out with a warning', () => {
    const s: ParsedSheet = {
      name: 'L',
      hidden: false,
      headerRow: 1,
      headers: ['Tag', 'NPS', 'Length', 'Temp', 'Purpose'],
      rows: [
        { row: 2, cells: ['A', '2', 10, 50, 'ET'] },
        { row: 3, cells: ['B', '2', 10, 150, 'H'] },
      ],
      formulaCells: [],
      mergedCells: [],
    };
    const v = validateSheet(s, { ...suggestMapping(s.headers), values: { purposes: { et: 'none' } } });
    expect(v.lines.map((l) => l.tag)).toEqual(['B']);
    expect(v.issues).toEqual([
      {
        row: 2,
        column: 'E',
        field: 'purposes',
        severity: 'warning',
        message: '"ET" was answered as no insulation purpose; the line is left out.',
      },
    ]);
  });
  it('European CSV: decimal commas, DN sizes and German words import; the unknown "Rohrbrücke" is asked', async () => {
    const { file, sheet } = await sheetOf('de.csv', semicolon1252Csv());
    expect([file.encoding, file.delimiter, sheet.decimalComma]).toEqual(['Windows-1252', ';', true]);
    const v = validateSheet(sheet, {
      ...suggestMapping(sheet.headers),
      values: { location: { rohrbrücke: 'outdoor' } },
    });
    expect(v.errorCount).toBe(0);
    expect(
      v.lines.map((l) => [l.tag, l.nps, l.lengthM, l.normalTempC, l.purposes.join('+'), l.outdoor, l.notes]),
    ).toEqual([
      ['S-1001', '3', 12.5, 165.5, 'heatConservation', true, 'Flanschkappen'],
      ['S-1002', '2', 1250, 165.5, 'heatConservation+personnelProtection', false, ''],
      ['K-2001', '4', 40, 6, 'condensationControl', false, 'über Bühne'],
      ['F-3001', '6', 80, 10, 'freezeProtection', true, ''],
    ]);
  });
  it('refuses what would give a wrong answer, each pinned to row and column; a TBD length only warns', async () => {
    const { sheet } = await sheetOf('p.xlsx', await problemsWorkbook());
    const v = validateSheet(sheet, suggestMapping(sheet.headers));
    expect(v.issues.map((i) => `${i.row} ${i.column}: ${i.message}`)).toEqual([
      '4 B: "2x1" is a reducer (two sizes); give the line one size, or split it into a line per size.',
      '5 D: The normal operating temperature is empty.',
      '7 A: Duplicate tag "P-3": also in row 6.',
      '8 C: Length "TBD": the line imports as incomplete — solved per metre, left out of the heat-loss totals and the bill until a revision gives its length.',
    ]);
    expect(v.errorCount).toBe(3);
    expect(v.lines.map((l) => [l.tag, l.lengthM])).toEqual([
      ['P-3', 20],
      ['P-4', null],
    ]);
  });
});

describe('partial mapping and the request sentences', () => {
  const base = { draftId: '2b0c1e9e-59a3-4f7e-9a51-0c1f0b7d6a11', sheetName: 'Lines' };
  it('accepts any subset of fields (zod 4 partialRecord)', () => {
    const r = readImportRequest({
      ...base,
      headerRow: 4,
      mapping: {
        columns: { tag: 0, normalTemp: 3, nps: 1 },
        units: { normalTemp: '°F' },
        values: { location: { platform: 'indoor' } },
      },
    });
    expect(r).toEqual({
      ...base,
      headerRow: 4,
      mapping: {
        columns: { tag: 0, normalTemp: 3, nps: 1 },
        units: { normalTemp: '°F' },
        values: { location: { platform: 'indoor' } },
      },
    });
  });
  const sentence = (input: unknown) => {
    try {
      readImportRequest(input);
      return 'accepted';
    } catch (e) {
      expect(e).toBeInstanceOf(AppError);
      return (e as AppError).message;
    }
  };
  it('turns every schema failure into a sentence naming the field, never schema text', () => {
    const cases: [unknown, string][] = [
      [
        { ...base, mapping: { columns: { geometry: 'B' }, units: {} } },
        'The column chosen for "Geometry" is not a column of the sheet; choose one of the sheet\'s columns or "not in the file".',
      ],
      [
        { ...base, mapping: { columns: { colour: 2 }, units: {} } },
        '"colour" is not a field Lagwise reads; it was left out of the mapping — reload the page and map the columns again.',
      ],
      [
        { ...base, mapping: { columns: { tag: 0 }, units: { normalTemp: 7 } } },
        'The unit chosen for "Normal operating temperature" is not one Lagwise knows; choose one from its list.',
      ],
      [
        {
          ...base,
          mapping: { columns: { tag: 0 }, units: {}, values: { location: { platform: 'upstairs' } } },
        },
        'The answer for indoor / outdoor "platform" is not one of outdoor, indoor; choose it again.',
      ],
      [
        { ...base, draftId: 'x', mapping: { columns: {}, units: {} } },
        'This upload is no longer available; upload the file again.',
      ],
      [
        { ...base, headerRow: 0, mapping: { columns: {}, units: {} } },
        'The header row must be a row number of the sheet; choose the row with the column names.',
      ],
      [{ ...base }, 'The column mapping did not arrive whole; reload the page and map the columns again.'],
      ['nonsense', 'The request did not arrive whole; reload the page and try again.'],
    ];
    for (const [input, want] of cases) {
      const got = sentence(input);
      expect(got).toBe(want);
      expect(got).not.toMatch(/Invalid input|expected|received|mapping\.columns/);
    }
  });
  it('names the required fields that are not mapped, in one sentence', () => {
    expect(missingRequired({ columns: { service: 1 }, units: {} })).toBe(
      'No column is mapped to "Line / equipment tag", "Normal operating temperature" and a size ("Nominal size (NPS or DN)" or "Outside diameter" for pipes, "Surface area" or "Vessel shell outside diameter" for vessels, "Surface area" for flat surfaces), which are required. Choose the columns in the mapping.',
    );
    expect(missingRequired({ columns: { tag: 0, normalTemp: 1, surfaceArea: 2 }, units: {} })).toBeNull();
  });
});

describe('equipment by shell dimensions', () => {
  it('head and roof areas by their formulas (worked checks in vessel-area.ts)', () => {
    expect(ellipsoidalHeadAreaM2(1)).toBeCloseTo(1.08399, 5); // [X] half oblate spheroid a = 0.5, b = 0.25
    expect(hemisphericalHeadAreaM2(1)).toBeCloseTo(Math.PI / 2, 12);
    expect(torisphericalHeadAreaM2(1)).toBeCloseTo(0.93058, 5); // [X] R = D, r = 0.06 D
    expect(coneRoofAreaM2(10)).toBeCloseTo(78.693, 3); // [X] slope 1:16
    // Limit: a crown of radius D/2 meets the knuckle at the equator, and the head is a hemisphere.
    expect(torisphericalHeadAreaM2(1, 0.5, 0.06)).toBeCloseTo(Math.PI / 2, 9);
    expect(vesselAreaM2(2, 6, 'ellipsoidal')).toBeCloseTo(Math.PI * 12 + 8 * 1.08399, 3);
    expect(vesselAreaM2(1, 1, 'flat')).toBeCloseTo(Math.PI * 1.5, 12);
    expect(
      ['2:1 SE', '2:1 semi-ellipsoidal', 'Hemi', 'F&D', 'Klöpper', 'flat', 'Kegeldach', 'Dished'].map(
        parseHeadType,
      ),
    ).toEqual([
      'ellipsoidal',
      'ellipsoidal',
      'hemispherical',
      'torispherical',
      'torispherical',
      'flat',
      'cone-roof',
      null,
    ]);
  });
  it('an equipment list by shell OD, T/T length in mm, orientation and head type: areas computed, "Dished" asked', async () => {
    const { sheet } = await sheetOf('eq.xlsx', await equipmentWorkbook());
    const mapping = suggestMapping(sheet.headers);
    expect(sheet.headerRow).toBe(3);
    expect(mapping).toMatchObject({
      columns: {
        tag: 0,
        service: 1,
        geometry: 2,
        shellDiameter: 3,
        shellLength: 4,
        headType: 5,
        normalTemp: 6,
        purposes: 7,
      },
      units: { shellDiameter: 'mm', shellLength: 'mm' },
    });
    expect(validateSheet(sheet, mapping).unknownValues.map((u) => [u.field, u.value, u.rows])).toEqual([
      ['headType', 'Dished', [7]],
    ]);
    const v = validateSheet(sheet, { ...mapping, values: { headType: { dished: 'torispherical' } } });
    expect(v.errorCount).toBe(0);
    expect(v.lines.map((l) => [l.tag, l.geometry, +l.surfaceAreaM2!.toFixed(3), l.heightM])).toEqual([
      ['40-V-101', 'vessel', 46.371, 2], // π·2·6 + 2 · 1.08399 · 2² ; horizontal: as tall as its diameter
      ['40-C-201', 'vessel', 40.841, 12], // π·1·12 + π·1²
      ['40-T-301', 'vessel', 330.02, 8], // π·10·8 + cone roof 78.693
      ['40-D-401', 'vessel', 18.325, 3], // π·1.5·3 + 2 · 0.93058 · 1.5²
    ]);
    expect(v.issues).toEqual([
      {
        row: 4,
        column: 'C',
        field: 'geometry',
        severity: 'warning',
        message:
          'A horizontal vessel is solved as a vertical shell of the same outside area, as tall as its diameter (horizontal vessels are not a geometry of their own yet).',
      },
    ]);
  });
  it('a shell without a length is refused with one sentence; a missing head type is assumed once', () => {
    const s: ParsedSheet = {
      name: 'E',
      hidden: false,
      headerRow: 1,
      headers: ['Tag', 'Shell OD (mm)', 'Shell height (m)', 'Temp'],
      rows: [
        { row: 2, cells: ['V-1', 1000, null, 100] },
        { row: 3, cells: ['V-2', 1000, 4, 100] },
      ],
      formulaCells: [],
      mergedCells: [],
    };
    const v = validateSheet(s, suggestMapping(s.headers));
    expect(v.issues.map((i) => `${i.row} ${i.column} ${i.severity}: ${i.message}`)).toEqual([
      "1 null warning: No column gives the vessels' head type; 2:1 semi-ellipsoidal heads are assumed for their areas.",
      '2 C error: A vessel given by its shell diameter needs its shell length (tangent to tangent) or height.',
      '3 null warning: No purpose given; assumed heat conservation and personnel protection (hot line).',
    ]);
    expect(v.lines.map((l) => [l.tag, +l.surfaceAreaM2!.toFixed(4), l.heightM])).toEqual([
      ['V-2', +(Math.PI * 4 + 2 * 1.0839853).toFixed(4), 4],
    ]);
  });
});

describe('lines:check', () => {
  it('parses its arguments', () => {
    expect(
      parseArgs([
        'f.csv',
        '--sheet',
        'CSV',
        '--header-row',
        '4',
        '--map',
        'notes=',
        '--value',
        'location:Pipe rack=outdoor',
      ]),
    ).toEqual({
      file: 'f.csv',
      sheet: 'CSV',
      headerRow: 4,
      map: [['notes', '']],
      units: [],
      values: [['location', 'Pipe rack', 'outdoor']],
    });
    expect(() => parseArgs([])).toThrow('Give the line-list file to check.');
  });
  it('answers with the mapping, units, unknown values, problems and SI lines', async () => {
    const r = await checkLineList(parseArgs(['client.xlsx', '--map', 'notes=']), await titleRowsWorkbook());
    expect(r).toMatchObject({
      file: 'client.xlsx',
      sheets: [
        { name: 'Line designation', rows: 7 },
        { name: 'Rev B (old)', rows: 2 },
        { name: 'Equipment', rows: 4 },
      ],
      sheet: 'Line designation',
      headerRow: 4,
      mapping: {
        tag: 'A',
        service: 'B',
        nps: 'C',
        length: 'D',
        normalTemp: 'E',
        maxTemp: 'F',
        purposes: 'G',
        location: 'H',
      },
      units: { nps: 'NPS', length: 'ft', normalTemp: '°F', maxTemp: '°F' },
      unknownValues: { location: ['Pipe rack', 'Platform'] },
      ready: 1,
    });
    expect(r.mapping).not.toHaveProperty('notes');
    const answered = await checkLineList(
      parseArgs([
        'client.xlsx',
        '--value',
        'location:Pipe rack=outdoor',
        '--value',
        'location:Platform=indoor',
      ]),
      await titleRowsWorkbook(),
    );
    expect(answered.ready).toBe(4);
    expect(answered.problems).toEqual([
      {
        row: 6,
        column: 'D',
        field: 'length',
        severity: 'warning',
        message: 'Cell D6 holds a formula; its last calculated value was used.',
      },
    ]);
    const csv = await checkLineList(parseArgs(['de.csv']), semicolon1252Csv());
    expect(csv).toMatchObject({
      encoding: 'Windows-1252',
      delimiter: ';',
      headerRow: 4,
      ready: 3,
      unknownValues: { location: ['Rohrbrücke'] },
    });
    const eq = await checkLineList(
      parseArgs(['client.xlsx', '--sheet', 'Equipment', '--value', 'location:Platform=outdoor']),
      await titleRowsWorkbook(),
    );
    expect(eq.lines).toEqual([
      {
        tag: '40-V-01',
        geometry: 'vertical-vessel',
        nps: null,
        outsideDiameterMm: null,
        lengthM: null,
        surfaceAreaM2: expect.closeTo(100, 3),
        heightM: expect.closeTo(6.096, 6),
        normalTempC: expect.closeTo(110, 6),
        maxTempC: null,
        purposes: ['heatConservation', 'personnelProtection'],
        outdoor: true,
        accessible: true,
      },
      {
        tag: '40-D-02',
        geometry: 'vertical-vessel',
        nps: null,
        outsideDiameterMm: null,
        lengthM: null,
        surfaceAreaM2: expect.closeTo(20, 3),
        heightM: expect.closeTo(3.048, 6),
        normalTempC: expect.closeTo(148.889, 3),
        maxTempC: null,
        purposes: ['heatConservation', 'personnelProtection'],
        outdoor: true,
        accessible: true,
      },
    ]);
  });
});
