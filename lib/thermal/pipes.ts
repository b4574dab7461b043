/**
 * Outside diameters of steel pipe by nominal size, ASME B36.10M (welded and seamless wrought steel
 * pipe), NPS 1/8 to 48 with the DN equivalents of ISO 6708. Values in mm as B36.10M lists them
 * (NPS 10 = 273.0, NPS 12 = 323.8; B36.19M stainless lists 273.1 and 323.9).
 */
export interface PipeSize {
  nps: string;
  npsInches: number;
  dn: number;
  outsideDiameterMm: number;
}

const T: [string, number, number, number][] = [
  ['1/8', 0.125, 6, 10.3],
  ['1/4', 0.25, 8, 13.7],
  ['3/8', 0.375, 10, 17.1],
  ['1/2', 0.5, 15, 21.3],
  ['3/4', 0.75, 20, 26.7],
  ['1', 1, 25, 33.4],
  ['1-1/4', 1.25, 32, 42.2],
  ['1-1/2', 1.5, 40, 48.3],
  ['2', 2, 50, 60.3],
  ['2-1/2', 2.5, 65, 73.0],
  ['3', 3, 80, 88.9],
  ['3-1/2', 3.5, 90, 101.6],
  ['4', 4, 100, 114.3],
  ['5', 5, 125, 141.3],
  ['6', 6, 150, 168.3],
  ['8', 8, 200, 219.1],
  ['10', 10, 250, 273.0],
  ['12', 12, 300, 323.8],
  ['14', 14, 350, 355.6],
  ['16', 16, 400, 406.4],
  ['18', 18, 450, 457],
  ['20', 20, 500, 508],
  ['22', 22, 550, 559],
  ['24', 24, 600, 610],
  ['26', 26, 650, 660],
  ['28', 28, 700, 711],
  ['30', 30, 750, 762],
  ['32', 32, 800, 813],
  ['34', 34, 850, 864],
  ['36', 36, 900, 914],
  ['42', 42, 1050, 1067],
  ['48', 48, 1200, 1219],
];
export const PIPE_SIZES: PipeSize[] = T.map(([nps, npsInches, dn, outsideDiameterMm]) => ({
  nps,
  npsInches,
  dn,
  outsideDiameterMm,
}));

/** Parses "2", "1-1/2", "1 1/2", "1.5", '2"' or "NPS 2" to inches; NaN when not a size. */
export function parseNps(text: string): number {
  const t = String(text)
    .trim()
    .replace(/^NPS\s*/i, '')
    .replace(/["″]|in(ch(es)?)?$/i, '')
    .trim();
  const mixed = t.match(/^(\d+)[\s-]+(\d+)\/(\d+)$/);
  if (mixed) return Number(mixed[1]) + Number(mixed[2]) / Number(mixed[3]);
  const frac = t.match(/^(\d+)\/(\d+)$/);
  if (frac) return Number(frac[1]) / Number(frac[2]);
  return /^\d+(\.\d+)?$/.test(t) ? Number(t) : NaN;
}

export function pipeByNps(nps: string | number): PipeSize | undefined {
  const inches = typeof nps === 'number' ? nps : parseNps(nps);
  return PIPE_SIZES.find((p) => Math.abs(p.npsInches - inches) < 1e-9);
}

export function pipeByDn(dn: number): PipeSize | undefined {
  return PIPE_SIZES.find((p) => p.dn === dn);
}

/** The nominal size whose outside diameter is within 0.5 mm of the given one, if any. */
export function pipeByOutsideDiameter(mm: number): PipeSize | undefined {
  return PIPE_SIZES.find((p) => Math.abs(p.outsideDiameterMm - mm) <= 0.5);
}
