import { describe, expect, it } from 'vitest';
import { computeQuantities, quantityDelta, DEFAULT_BOQ_FACTORS, type BoqLine } from '@/lib/boq/quantities';
import ExcelJS from 'exceljs';
import { billWorkbook, mmToInches, safeText } from '@/lib/boq/workbook';

const pipe = (o: Partial<BoqLine> = {}): BoqLine => ({
  tag: 'P-1',
  area: 'A',
  geometry: 'horizontal-pipe',
  nps: '4',
  outsideDiameterMm: 114.3,
  lengthM: 100,
  surfaceAreaM2: null,
  fittings: { elbows: 2, tees: 1, valves: 1, flanges: 2 },
  layers: [
    {
      materialId: 'mineral-wool-pipe',
      materialName: 'Mineral wool pipe section',
      productForm: 'pipe-section',
      thicknessMm: 50,
    },
  ],
  jacketId: 'aluminium-oxidised',
  jacketName: 'Aluminium, oxidised',
  status: { counted: true },
  reviewStatus: 'not flagged',
  ...o,
});

describe('quantities from a hand-checkable fixture', () => {
  it('one pipe: π·D·L jacket area with overlap, annular volume and fitting equivalents with waste', () => {
    const q = computeQuantities([pipe()]);
    const eq = DEFAULT_BOQ_FACTORS.equivalentLengthM;
    const fit = 2 * eq.elbow + 1 * eq.tee + 1 * eq.valve + 2 * eq.flangePair; // 1.2 + 0.9 + 1.5 + 1.2 = 4.8 m
    expect(fit).toBeCloseTo(4.8, 12);
    const run = 100 + fit,
      w = 1.05,
      ov = 1.1;
    const d0 = 0.1143,
      d1 = 0.2143;
    expect(q.materials).toHaveLength(1);
    expect(q.materials[0].lengthM).toBeCloseTo(run * w, 3); // 110.04 m
    expect(q.materials[0].volumeM3).toBeCloseTo((Math.PI / 4) * (d1 * d1 - d0 * d0) * run * w, 3); // 2.840 m³
    expect(q.materials[0].volumeM3).toBeCloseTo(2.84, 2);
    expect(q.fittings[0]).toMatchObject({
      size: 'NPS 4',
      thicknessMm: 50,
      elbows: 2,
      tees: 1,
      valves: 1,
      flanges: 2,
      equivalentLengthM: 4.8,
    });
    expect(q.jackets[0]).toMatchObject({ jacket: 'Aluminium, oxidised', outsideDiameterMm: 214.3 });
    expect(q.jackets[0].areaM2).toBeCloseTo(Math.PI * d1 * run * ov, 3); // 77.07 m²
  });
  it("two layers: the outer layer is measured on the inner layer's outside diameter", () => {
    const q = computeQuantities([
      pipe({
        fittings: { elbows: 0, tees: 0, valves: 0, flanges: 0 },
        lengthM: 10,
        layers: [
          {
            materialId: 'calcium-silicate',
            materialName: 'Calcium silicate',
            productForm: 'pipe-section',
            thicknessMm: 40,
          },
          {
            materialId: 'mineral-wool-pipe',
            materialName: 'Mineral wool',
            productForm: 'pipe-section',
            thicknessMm: 60,
          },
        ],
      }),
    ]);
    const outer = q.materials.find((m) => m.layer === 2)!;
    expect(outer.volumeM3).toBeCloseTo((Math.PI / 4) * (0.3143 ** 2 - 0.1943 ** 2) * 10 * 1.05, 3); // stored to 0.001 m³
    expect(q.jackets[0].outsideDiameterMm).toBe(314.3);
  });
  it('vessels and flats by area; pending lines listed, not counted', () => {
    const q = computeQuantities([
      pipe({
        tag: 'V-1',
        geometry: 'vessel',
        nps: null,
        outsideDiameterMm: null,
        lengthM: null,
        surfaceAreaM2: 40,
      }),
      pipe({ tag: 'P-2', status: { counted: false, reason: 'awaiting safety sign-off' } }),
    ]);
    expect(q.surfaces[0]).toMatchObject({ kind: 'vessel', thicknessMm: 50, areaM2: 42, volumeM3: 2.1 });
    expect(q.jackets[0]).toMatchObject({ outsideDiameterMm: null, areaM2: 44 });
    expect(q.materials).toHaveLength(0);
    expect(q.counted).toBe(1);
    expect(q.pending).toBe(1);
    expect(q.schedule.find((s) => s.tag === 'P-2')!.status).toBe('pending: awaiting safety sign-off');
  });
  it('the delta lists what changed between issues', () => {
    const a = computeQuantities([pipe()]),
      b = computeQuantities([pipe({ lengthM: 150 })]);
    const d = quantityDelta(a, b);
    const len = d.find((x) => x.sheet === 'materials' && x.quantity === 'length m')!;
    expect(len.change).toBeCloseTo(50 * 1.05, 3);
    expect(quantityDelta(b, b)).toEqual([]);
  });
});

describe('formula-injection escaping (OWASP CSV injection guidance)', () => {
  it('prefixes text that starts with = + - @ and leaves other text alone', () => {
    expect(safeText('=HYPERLINK("http://x","y")')).toBe('\'=HYPERLINK("http://x","y")');
    expect(safeText('+1')).toBe("'+1");
    expect(safeText('-cmd')).toBe("'-cmd");
    expect(safeText('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(safeText('4"-LS-101')).toBe('4"-LS-101');
  });
});

describe('inch columns in the bill', () => {
  const meta = {
    projectCode: 'T-1',
    projectName: 'Test',
    site: '',
    organization: 'Org',
    issueNumber: 1,
    issuedAt: new Date('2026-12-01T00:00:00Z'),
    issuedBy: 'Tester',
    basisRevision: 1,
    lineListRevision: 1,
  };
  const read = async (buf: Buffer) => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(buf as unknown as ArrayBuffer);
    return wb;
  };
  it('a project on the inch series gets each thickness in inches beside the millimetres (1 in = 25.4 mm exactly)', async () => {
    expect(mmToInches(76.2)).toBe(3);
    expect(mmToInches(9.525)).toBe(0.375);
    const q = computeQuantities([
      pipe({
        layers: [
          {
            materialId: 'mineral-wool-pipe',
            materialName: 'Mineral wool pipe section',
            productForm: 'pipe-section',
            thicknessMm: 76.2,
          },
        ],
      }),
    ]);
    const us = await read(await billWorkbook(q, { ...meta, inches: true }, []));
    const sum = us.getWorksheet('Summary')!;
    expect(sum.getRow(1).values).toEqual([
      undefined,
      'Material',
      'Product form',
      'Layer',
      'Size',
      'Thickness (mm)',
      'Thickness (in)',
      'Length incl. waste (m)',
      'Outer-face area (m²)',
      'Volume (m³)',
    ]);
    expect(sum.getRow(2).getCell(5).value).toBe(76.2);
    expect(sum.getRow(2).getCell(6).value).toBe(3);
    expect(us.getWorksheet('Line schedule')!.getRow(1).values).toContain('Total thickness (in)');
    const si = await read(await billWorkbook(q, meta, []));
    expect(si.getWorksheet('Summary')!.getRow(1).values).not.toContain('Thickness (in)');
  });
});
