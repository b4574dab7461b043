import { describe, expect, it } from 'vitest';
import { suggestMapping, normalizeHeader } from '@/lib/lines/mapping';
import { convertToSI, validateSheet, parsePurposes, parseGeometry } from '@/lib/lines/validate';
import { diffLineLists } from '@/lib/lines/diff';
import type { ParsedSheet } from '@/lib/lines/parse';

const sheet = (
  headers: string[],
  rows: (string | number | null)[][],
  extra: Partial<ParsedSheet> = {},
): ParsedSheet => ({
  name: 'Lines',
  hidden: false,
  headerRow: 1,
  headers,
  rows: rows.map((cells, i) => ({ row: i + 2, cells })),
  formulaCells: [],
  mergedCells: [],
  ...extra,
});

describe('header mapping', () => {
  it('recognises synonyms whatever the case and punctuation, and reads units from headers', () => {
    const m = suggestMapping([
      'LINE NO.',
      'Fluid',
      'Op. Temp (°F)',
      'Size',
      'Run length [ft]',
      'Insulation code',
      'In/Out',
      'Steam press. psig',
      'Flow rate lb/h',
    ]);
    expect(m.columns).toMatchObject({
      tag: 0,
      service: 1,
      normalTemp: 2,
      nps: 3,
      length: 4,
      purposes: 5,
      steamPressure: 7,
      flow: 8,
    });
    expect(m.units).toMatchObject({ normalTemp: '°F', length: 'ft', steamPressure: 'psig', flow: 'lb/h' });
  });
  it('defaults to SI units when the header names none, and leaves unknown columns unmapped', () => {
    const m = suggestMapping(['Tag', 'Temperature', 'OD', 'Colour of paint']);
    expect(m.units.normalTemp).toBe('°C');
    expect(m.units.outsideDiameter).toBe('mm');
    expect(Object.values(m.columns)).not.toContain(3);
  });
  it('a remembered mapping wins where the headers match', () => {
    const remembered = {
      headers: ['Tag', 'T1', 'T2'],
      mapping: { columns: { tag: 0, normalTemp: 2 }, units: { normalTemp: '°F' } },
    };
    const m = suggestMapping(['Tag', 'T1', 'T2'], remembered);
    expect(m.columns.normalTemp).toBe(2);
    expect(m.units.normalTemp).toBe('°F');
  });
  it('normalises headers to words', () => {
    expect(normalizeHeader('Op. Temp [°F]')).toBe('op temp f');
  });
});

describe('unit conversion per column', () => {
  it('converts to SI', () => {
    expect(convertToSI(212, '°F')).toBeCloseTo(100, 10);
    expect(convertToSI(2.375, 'in')).toBeCloseTo(60.325, 10);
    expect(convertToSI(100, 'ft')).toBeCloseTo(30.48, 10);
    expect(convertToSI(150, 'psig')).toBeCloseTo(10.342, 3);
    expect(convertToSI(3600, 'kg/h')).toBeCloseTo(1, 12);
    expect(convertToSI(7936.64, 'lb/h')).toBeCloseTo(1, 4);
    expect(convertToSI(1, 'Btu/(lb·°F)')).toBeCloseTo(4.1868, 10);
  });
});

describe('per-cell validation, pinned to row and column', () => {
  const headers = [
    'Tag',
    'Geometry',
    'NPS',
    'Length (m)',
    'Surface area',
    'Height',
    'Temp (°C)',
    'Max temp',
    'Purpose',
    'Accessible',
  ];
  const map = suggestMapping(headers);
  it('accepts a good line and converts it', () => {
    const v = validateSheet(sheet(headers, [['L-1', 'H', '2', 30, null, null, 180, 190, 'H,P', 'yes']]), map);
    expect(v.errorCount).toBe(0);
    expect(v.lines[0]).toMatchObject({
      tag: 'L-1',
      geometry: 'horizontal-pipe',
      nps: '2',
      outsideDiameterMm: 60.3,
      lengthM: 30,
      normalTempC: 180,
      maxTempC: 190,
      purposes: ['heatConservation', 'personnelProtection'],
      accessible: true,
    });
  });
  it('names row and column for each problem', () => {
    const v = validateSheet(
      sheet(headers, [
        ['L-1', 'H', '2', 30, null, null, 180, 190, 'H', null],
        ['L-1', 'H', '2', 30, null, null, 180, 190, 'H', null],
        ['L-3', 'H', '2', 'about 30', null, null, 'hot', null, 'H', null],
        ['L-4', 'H', '2', 30, null, null, 180, 150, 'H', null],
        ['V-5', 'Vessel', '6', null, 40, 4, 120, null, 'H', null],
        ['L-6', 'H', '2 1/3', 30, null, null, 80, null, 'Q', 'maybe'],
        [null, 'H', '2', 30, null, null, 80, null, 'H', null],
      ]),
      map,
    );
    const at = (row: number) =>
      v.issues.filter((i) => i.row === row && i.severity === 'error').map((i) => `${i.column}: ${i.message}`);
    expect(at(3)).toEqual(['A: Duplicate tag "L-1": also in row 2.']);
    expect(at(4)).toEqual(
      expect.arrayContaining([
        'G: Normal operating temperature must be a number; the cell holds "hot".',
        'D: Length must be a number; the cell holds "about 30".',
      ]),
    );
    expect(at(5)).toEqual([
      'H: The maximum temperature (150.0 °C) is below the normal temperature (180.0 °C).',
    ]);
    expect(at(6)).toEqual(['C: A vessel has no nominal pipe size; clear "6" or change the geometry.']);
    expect(at(7)).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^C: "2 1\/3" is not a nominal pipe size/),
        'I: Insulation purposes "Q" in row 7 is not a word Lagwise knows (H heat conservation, P personnel protection, C condensation control, T process control, F freeze protection); say what it means under "Values to answer".',
        'J: Accessible to people "maybe" in row 7 is not a word Lagwise knows (yes, no or a height); say what it means under "Values to answer".',
      ]),
    );
    expect(at(8)).toEqual(['A: The tag is empty; every line needs a unique tag.']);
    expect(v.lines.map((l) => l.tag)).toEqual(['L-1']);
  });
  it('refuses a missing required column and a header-only sheet', () => {
    expect(
      validateSheet(sheet(['Tag', 'Size'], [['A', '2']]), suggestMapping(['Tag', 'Size'])).issues[0].message,
    ).toMatch(/No column is mapped to "Normal operating temperature"/);
    expect(validateSheet(sheet(headers, []), map).issues[0].message).toMatch(/has a header row but no lines/);
  });
  it('warns about formula and merged cells, and reads an access height', () => {
    const v = validateSheet(
      sheet(headers, [['L-1', 'H', '2', 30, null, null, 180, 190, 'H,P', 3.5]], {
        formulaCells: ['G2'],
        mergedCells: ['B2'],
      }),
      map,
    );
    expect(v.errorCount).toBe(0);
    expect(v.issues.map((i) => i.message)).toEqual(
      expect.arrayContaining([
        'Cell G2 holds a formula; its last calculated value was used.',
        'Cell B2 is part of a merged range; the merged value was used.',
      ]),
    );
    expect(v.lines[0].accessible).toBe(false); // 3.5 m is out of reach (common practice: 2.1 m)
    expect(v.lines[0].accessHeightM).toBe(3.5);
  });
  it('parses geometry and purpose words', () => {
    expect(parseGeometry('Vertical')).toBe('vertical-pipe');
    expect(parseGeometry('tank')).toBe('vessel');
    expect(parsePurposes('personnel protection, condensation')).toEqual([
      'personnelProtection',
      'condensationControl',
    ]);
  });
});

describe('revision diff', () => {
  it('lists added, removed and changed fields with old → new', () => {
    const base = {
      service: '',
      area: 'A',
      geometry: 'horizontal-pipe' as const,
      nps: '2',
      outsideDiameterMm: 60.3,
      lengthM: 10,
      surfaceAreaM2: null,
      heightM: null,
      normalTempC: 150,
      maxTempC: null,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: ['heatConservation' as const],
      outdoor: true,
      accessible: true,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    };
    const d = diffLineLists(
      [
        { ...base, tag: 'A' },
        { ...base, tag: 'B' },
      ],
      [
        { ...base, tag: 'a', normalTempC: 160 },
        { ...base, tag: 'C' },
      ],
    );
    expect(d.added).toEqual(['C']);
    expect(d.removed).toEqual(['B']);
    expect(d.changed).toEqual([{ tag: 'a', changes: [{ field: 'normalTempC', from: 150, to: 160 }] }]);
  });
});

describe('display in the project unit system', () => {
  it('shows US customary from SI values (exact factors, lib/format)', async () => {
    const { formatter } = await import('@/lib/format');
    const us = formatter({ unitSystem: 'US' }),
      usInch = formatter({ unitSystem: 'US', thicknessSeries: 'inch' }),
      si = formatter({ unitSystem: 'SI' });
    expect(us.temp(100)).toBe('212.0 °F');
    expect(usInch.thickness(50.8)).toBe('2"');
    expect(usInch.thickness(9.525)).toBe('3/8"'); // ⅜ in elastomeric tube keeps its size
    expect(us.thickness(50)).toBe('1.97 in'); // a millimetre size is not rounded to an inch size
    expect(us.linearLoss(100)).toBe('104 Btu/h·ft'); // 1 W/m = 1.04007 Btu/(h·ft) [X]
    expect(us.units).toMatchObject({ temp: '°F', thickness: 'in' });
    expect(si.temp(100)).toBe('100.0 °C');
    expect(si.thickness(0)).toBe('bare');
  });
});
