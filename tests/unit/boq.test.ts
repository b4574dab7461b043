import { describe, expect, it } from 'vitest';
import {
  computeQuantities,
  DEFAULT_ACCESSORY_FACTORS,
  DEFAULT_BOQ_FACTORS,
  jacketSheetThicknessMm,
  quantityDelta,
  sameBill,
  type BoqLine,
} from '@/lib/boq/quantities';
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
  it('one pipe: sections over the run and elbows/tees, covers for valves and flanges, jacket with laps', () => {
    const q = computeQuantities([pipe()]);
    const eq = DEFAULT_BOQ_FACTORS.equivalentLengthM;
    const fit = 2 * eq.elbow + 1 * eq.tee; // 1.2 + 0.9 = 2.1 m of sections; the valve and flanges get covers
    expect(fit).toBeCloseTo(2.1, 12);
    const run = 100 + fit,
      w = 1.05;
    const d0 = 0.1143,
      d1 = 0.2143;
    expect(q.materials).toHaveLength(1);
    expect(q.materials[0].lengthM).toBeCloseTo(run * w, 3); // 107.205 m
    expect(q.materials[0].volumeM3).toBeCloseTo((Math.PI / 4) * (d1 * d1 - d0 * d0) * run * w, 3); // 2.767 m³
    expect(q.fittings[0]).toMatchObject({
      size: 'NPS 4',
      thicknessMm: 50,
      elbows: 2,
      tees: 1,
      valves: 1,
      flanges: 2,
      equivalentLengthM: 2.1,
    });
    expect(q.covers).toEqual([
      { item: 'flange pair', size: 'NPS 4', thicknessMm: 50, count: 2 },
      { item: 'valve', size: 'NPS 4', thicknessMm: 50, count: 1 },
    ]);
    expect(q.jackets[0]).toMatchObject({
      jacket: 'Aluminium, oxidised',
      outsideDiameterMm: 214.3,
      sheetThicknessMm: 0.6,
    });
    // (π·0.2143 + 0.050 m lap) × 102.1 m × (1 + 50 mm / 1 m sheet) = 77.535 m²
    expect(q.jackets[0].areaM2).toBeCloseTo(77.535, 3);
  });
  it('no covers when the design basis leaves valves and flanges bare', () => {
    const q = computeQuantities([pipe()], { ...DEFAULT_BOQ_FACTORS, removableCovers: false });
    expect(q.covers).toEqual([]);
    expect(q.fittings[0].valves).toBe(1);
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
    // The second layer is sized by the diameter it fits over (the first layer's outside), not the pipe's NPS.
    expect(q.materials.map((m) => [m.layer, m.size])).toEqual([
      [1, 'NPS 4'],
      [2, 'over OD 194.3 mm'],
    ]);
  });
  it('vessels and flats by area, never as pipe sections; pending lines listed, not counted', () => {
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
    expect(q.surfaces[0]).toMatchObject({
      kind: 'vessel',
      productForm: 'board or blanket',
      thicknessMm: 50,
      areaM2: 42,
      volumeM3: 2.1,
    });
    expect(q.jackets[0]).toMatchObject({ outsideDiameterMm: null, areaM2: 44, sheetThicknessMm: 1 });
    expect(q.materials).toHaveLength(0);
    expect(q.counted).toBe(1);
    expect(q.pending).toBe(1);
    expect(q.schedule.find((s) => s.tag === 'P-2')!.status).toBe('pending: awaiting safety sign-off');
  });
  it('a vessel with its diameter and height: shell and heads listed apart', () => {
    // D 2.0 m, H 5.0 m, 2:1 semi-ellipsoidal heads: shell π·2·5 = 31.416 m²; heads 2 × 1.084·D² = 8.672 m²
    // (head area factor 1.084·D², common practice [recalled]) → 40.088 m² in all.
    const q = computeQuantities([
      pipe({
        tag: 'V-2',
        geometry: 'vessel',
        nps: null,
        outsideDiameterMm: 2000,
        heightM: 5,
        lengthM: null,
        surfaceAreaM2: 40.088,
        fittings: { elbows: 0, tees: 0, valves: 0, flanges: 0 },
      }),
    ]);
    const shell = q.surfaces.find((x) => x.kind === 'vessel shell')!;
    const heads = q.surfaces.find((x) => x.kind === 'vessel heads')!;
    expect(shell.areaM2).toBeCloseTo(31.416 * 1.05, 3);
    expect(heads.areaM2).toBeCloseTo((40.088 - 31.416) * 1.05, 2);
    expect(q.materials).toHaveLength(0);
  });
  it('a vessel picked part by part: the shell and each head at its own thickness, by their own areas', () => {
    // D 2.0 m, H 5.0 m, 2:1 semi-ellipsoidal heads. Shell π·2·5 = 31.4159 m² [X]. Each head: half an
    // oblate spheroid with semi-axes 1 m and 0.5 m, A = π a² + (π b²/2e)·ln((1+e)/(1−e)), e = √(1 − b²/a²)
    // = 0.8660 → 3.1416 + 0.4534·2.6339 = 4.3359 m² (≈ 1.084·D², the usual handbook factor [recalled]).
    // Line area 31.4159 + 2·4.3359 = 40.0877 m². Waste 5 % (the default factor, common practice).
    const blanket = (mm: number) => ({
      materialId: 'mineral-wool-blanket',
      materialName: 'Mineral wool wired blanket',
      productForm: 'blanket',
      thicknessMm: mm,
    });
    const q = computeQuantities([
      pipe({
        tag: 'V-3',
        geometry: 'vessel',
        nps: null,
        outsideDiameterMm: 2000,
        heightM: 5,
        lengthM: null,
        surfaceAreaM2: 40.0877,
        fittings: { elbows: 0, tees: 0, valves: 0, flanges: 0 },
        layers: [blanket(100)],
        parts: {
          shell: { layers: [blanket(100)] },
          top: { layers: [blanket(100)] },
          bottom: { layers: [blanket(80), blanket(80)], guarded: false },
        },
      }),
    ]);
    const kind = (k: string) => q.surfaces.filter((x) => x.kind === k);
    expect(kind('vessel shell')).toMatchObject([{ thicknessMm: 100 }]);
    expect(kind('vessel shell')[0].areaM2).toBeCloseTo(31.4159 * 1.05, 3);
    expect(kind('vessel shell')[0].volumeM3).toBeCloseTo(31.4159 * 1.05 * 0.1, 3);
    expect(kind('vessel top head')[0].areaM2).toBeCloseTo(4.3359 * 1.05, 3);
    expect(kind('vessel top head')[0].volumeM3).toBeCloseTo(4.3359 * 1.05 * 0.1, 3);
    // The bottom head in two layers of 80 mm: each layer over the head's area.
    expect(kind('vessel bottom head').map((x) => [x.layer, x.thicknessMm])).toEqual([
      [1, 80],
      [2, 80],
    ]);
    expect(kind('vessel bottom head').reduce((a, x) => a + x.volumeM3, 0)).toBeCloseTo(
      4.3359 * 1.05 * 0.16,
      3,
    );
    expect(kind('vessel heads')).toEqual([]);
    expect(q.materials).toEqual([]);
    expect(q.schedule[0].layers).toBe(
      'shell 100 mm: 100 mm Mineral wool wired blanket · top head 100 mm: 100 mm Mineral wool wired blanket · bottom head 160 mm: 80 mm Mineral wool wired blanket + 80 mm Mineral wool wired blanket',
    );
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

describe('accessories against hand-computed quantities (default factors, common practice)', () => {
  // Line A: hot NPS 4 (OD 114.3 mm), 100 m, 2 elbows, 1 tee, 1 valve, 2 flange pairs, 50 mm in one layer.
  // Line B: cold NPS 2 (OD 60.3 mm), 20 m, no fittings, 40 mm + 30 mm in two layers, vapour retarder.
  const lineA = pipe({ tag: 'A' });
  const lineB = pipe({
    tag: 'B',
    nps: '2',
    outsideDiameterMm: 60.3,
    lengthM: 20,
    fittings: { elbows: 0, tees: 0, valves: 0, flanges: 0 },
    coldService: true,
    layers: [
      {
        materialId: 'cellular-glass',
        materialName: 'Cellular glass',
        productForm: 'pipe-section',
        thicknessMm: 40,
      },
      {
        materialId: 'cellular-glass',
        materialName: 'Cellular glass',
        productForm: 'pipe-section',
        thicknessMm: 30,
      },
    ],
  });
  const q = computeQuantities([lineA, lineB]);
  const get = (item: string, size: string, unit: string) =>
    q.accessories!.find((a) => a.item === item && a.size === size && a.unit === unit)?.quantity;

  it('bands: one per 300 mm of jacketed run, each once round the jacket plus 50 mm', () => {
    // A: run 100 + 2 × 0.6 + 0.9 = 102.1 m → ⌈102.1 / 0.3⌉ = 341 bands on OD 214.3 mm; 341 × (π·0.2143 + 0.05) = 246.626 m
    expect(get('Jacket bands', 'OD 214.3 mm', 'count')).toBe(341);
    expect(get('Jacket bands', 'OD 214.3 mm', 'm')).toBeCloseTo(246.626, 3);
    // B: ⌈20 / 0.3⌉ = 67 bands on OD 60.3 + 80 + 60 = 200.3 mm; 67 × (π·0.2003 + 0.05) = 45.510 m
    expect(get('Jacket bands', 'OD 200.3 mm', 'count')).toBe(67);
    expect(get('Jacket bands', 'OD 200.3 mm', 'm')).toBeCloseTo(45.51, 3);
  });
  it('tie wire: every layer, a tie per 300 mm, once round the layer plus 150 mm', () => {
    // A: 341 × (π·0.2143 + 0.15) = 280.726 m; B: 67 × (π·0.1403 + 0.15) + 67 × (π·0.2003 + 0.15) = 91.792 m
    expect(get('Tie wire', 'all sizes', 'm')).toBeCloseTo(280.726 + 91.792, 2); // 372.518 m
  });
  it('cold service only (line B): vapour retarder, mastic and joint sealant', () => {
    // Outer face π·0.2003 × 20 = 12.585 m²: retarder × 1.10 = 13.844 m², mastic × 1.5 L/m² = 18.878 L
    expect(get('Vapour retarder (cold service)', 'pipes', 'm²')).toBeCloseTo(13.844, 3);
    expect(get('Vapour-retarder mastic (cold service)', 'pipes', 'L')).toBeCloseTo(18.878, 3);
    // Per layer: 20 joints (1 m sections) × π·D + 2 seams × 20 m: (20π·0.1403 + 40) + (20π·0.2003 + 40) = 101.401 m
    expect(get('Joint sealant (cold service)', 'all sizes', 'm')).toBeCloseTo(101.401, 3);
  });
  it('jackets: sheet thickness by diameter and laps; the second layer sized over the first', () => {
    // B: (π·0.2003 + 0.05) × 20 × 1.05 = 14.264 m² of 0.6 mm sheet
    expect(q.jackets.find((j) => j.outsideDiameterMm === 200.3)).toMatchObject({ sheetThicknessMm: 0.6 });
    expect(q.jackets.find((j) => j.outsideDiameterMm === 200.3)!.areaM2).toBeCloseTo(14.264, 3);
    expect(q.materials.filter((m) => m.material === 'Cellular glass').map((m) => m.size)).toEqual([
      'NPS 2',
      'over OD 140.3 mm',
    ]);
    expect(jacketSheetThicknessMm(DEFAULT_ACCESSORY_FACTORS, 451)).toBe(0.8);
    expect(jacketSheetThicknessMm(DEFAULT_ACCESSORY_FACTORS, 1200)).toBe(1);
  });
  it('a bill identical to the last issue is recognised, and any change is not', () => {
    expect(sameBill(q, computeQuantities([lineA, lineB]))).toBe(true);
    expect(sameBill(q, computeQuantities([lineA, { ...lineB, lengthM: 21 }]))).toBe(false);
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
