/**
 * The demo line list — an invented Brack Point polymer works: steam and condensate at three
 * pressures, hot oil, hot water, process lines, chilled water, refrigerant suction, vessels and
 * flat surfaces, indoor and outdoor. Deterministic, so the seed and the example workbook agree.
 */
import { TEMPLATE_EXAMPLE_ROWS, TEMPLATE_HEADERS, lineListWorkbook } from '../lib/lines/template';

// The workbook layout is the product's template (lib/lines/template.ts); the seed, the example
// file, tests and benchmarks write the demo rows with it.
export { TEMPLATE_HEADERS, lineListWorkbook };

type Row = (string | number | null)[];

function rng(seed: number) {
  return () => {
    seed |= 0;
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function demoLineRows(count = 220, seed = 4471): Row[] {
  const r = rng(seed);
  const pick = <T>(a: readonly T[]) => a[Math.floor(r() * a.length)];
  const areas = [
    'U20 Boiler house',
    'U25 Steam mains',
    'U30 Polymerisation',
    'U35 Extrusion',
    'U40 Utilities',
    'U45 Tank farm',
  ];
  const services = [
    {
      code: 'LS',
      name: 'Low-pressure steam',
      temp: 152,
      p: 4,
      sizes: ['1', '1-1/2', '2', '3', '4', '6', '8'],
      purpose: 'H,P',
    },
    {
      code: 'MS',
      name: 'Medium-pressure steam',
      temp: 186,
      p: 10.5,
      sizes: ['1', '2', '3', '4', '6', '8', '10'],
      purpose: 'H,P',
    },
    {
      code: 'HS',
      name: 'High-pressure steam',
      temp: 250,
      p: 39,
      sizes: ['2', '3', '4', '6', '8', '12'],
      purpose: 'H,P',
    },
    {
      code: 'SC',
      name: 'Steam condensate',
      temp: 120,
      p: null,
      sizes: ['3/4', '1', '1-1/2', '2', '3'],
      purpose: 'H,P',
    },
    { code: 'HO', name: 'Hot oil supply', temp: 290, p: null, sizes: ['2', '3', '4', '6'], purpose: 'H,P,T' },
    {
      code: 'HW',
      name: 'Hot water',
      temp: 85,
      p: null,
      sizes: ['1', '1-1/2', '2', '3', '4'],
      purpose: 'H,P',
    },
    {
      code: 'PR',
      name: 'Polymer melt transfer',
      temp: 235,
      p: null,
      sizes: ['2', '3', '4'],
      purpose: 'T,P,H',
    },
    { code: 'CW', name: 'Chilled water', temp: 6, p: null, sizes: ['2', '3', '4', '6', '8'], purpose: 'C,H' },
    {
      code: 'RS',
      name: 'Refrigerant suction',
      temp: -28,
      p: null,
      sizes: ['1', '1-1/2', '2', '3'],
      purpose: 'C',
    },
    {
      code: 'FW',
      name: 'Fire water ring (stagnant)',
      temp: 12,
      p: null,
      sizes: ['4', '6', '8'],
      purpose: 'F',
    },
  ] as const;
  const rows: Row[] = [];
  const used = new Set<string>();
  while (rows.length < count - 14) {
    const s = pick(services);
    const nps = pick(s.sizes);
    const n = 100 + Math.floor(r() * 900);
    const tag = `${nps.replace('-', '').replace('/', '')}"-${s.code}-${n}-${pick(['A1', 'B2', 'C1', 'K3'])}`;
    if (used.has(tag)) continue;
    used.add(tag);
    const outdoor = s.code === 'FW' || r() < 0.55;
    const vertical = r() < 0.15;
    const flowKgH =
      s.code === 'HO' || s.code === 'PR' || s.code === 'HW' ? Math.round(2000 + r() * 40000) : null;
    const cp = s.code === 'HO' ? 2.5 : s.code === 'PR' ? 2.1 : s.code === 'HW' ? 4.19 : null;
    const access = r() < 0.6 ? 'yes' : r() < 0.5 ? 'no' : Number((1 + r() * 6).toFixed(1));
    rows.push([
      tag,
      s.name,
      pick(areas),
      vertical ? 'Vertical pipe' : 'Horizontal pipe',
      nps,
      null,
      Math.round(5 + r() * 180),
      null,
      vertical ? Math.round(4 + r() * 20) : null,
      s.temp + Math.round((r() - 0.5) * 6),
      s.temp + Math.round(5 + r() * 15),
      s.p,
      flowKgH,
      cp,
      Math.floor(r() * 12),
      Math.floor(r() * 4),
      Math.floor(r() * 5),
      Math.floor(r() * 6),
      s.purpose,
      outdoor ? 'Outdoor' : 'Indoor',
      access,
      null,
      r() < 0.1 ? 'Tie-in at rack crossing' : null,
      // The stagnant fire-water ring is electrically traced (no draw on the generator: the rows stay as they were).
      s.code === 'FW' ? 'yes' : null,
    ]);
  }
  // The 14 vessels and flat surfaces of the demo plant: the downloadable template's example rows.
  const vessels: Row[] = TEMPLATE_EXAMPLE_ROWS.map((r) => [...r]);
  return [...rows, ...vessels];
}
