import { describe, expect, it } from 'vitest';
import {
  condensationControlApplies,
  personnelProtectionApplies,
  ALWAYS_CHECK_CONDENSATION_BELOW_C,
  type Purpose,
} from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS, type DesignBasis } from '@/lib/lines/design-basis';
import { suggestMapping } from '@/lib/lines/mapping';
import { validateSheet, type LineInput } from '@/lib/lines/validate';
import { solveLine } from '@/lib/lines/solve-line';
import { flagsForLine } from '@/lib/review/flags';
import type { ParsedSheet } from '@/lib/lines/parse';
import { TEMPLATE_HEADERS, demoLineRows } from '../../seed/line-list';

/**
 * The recommendation and the safety review must not disagree: a line given its recommended
 * thickness is never flagged for a hot or a sweating surface, unless the recommendation itself
 * says no candidate meets that criterion.
 */
function disagreements(basis: DesignBasis, lines: LineInput[]) {
  const out: string[] = [];
  let personnel = 0,
    condensation = 0;
  for (const l of lines) {
    const s = solveLine(basis, l);
    const r = s.recommendation;
    if (r.outcomes.some((o) => o.id === 'personnel')) personnel++;
    if (r.outcomes.some((o) => o.id === 'condensation')) condensation++;
    if (r.recommendedMm === null) continue; // no candidate at all: the review blocks it as unmet
    const flags = flagsForLine(basis, {
      line: l,
      design: r.recommendedMm > 0 ? { layers: r.layers, belowCriterion: null } : null,
      jacketId: r.recommendedMm > 0 ? s.system.jacket.id : null,
      solved: true,
      stale: false,
      unmet: r.unmet,
    });
    for (const f of flags) {
      if (f.type === 'hot-surface' && !r.unmet.includes('personnel'))
        out.push(`${l.tag}: recommended ${r.recommendedMm} mm but flagged ${f.message}`);
      if (f.type === 'sweating' && !r.unmet.includes('condensation'))
        out.push(`${l.tag}: recommended ${r.recommendedMm} mm but flagged ${f.message}`);
    }
  }
  return { out, personnel, condensation };
}

const sheet = (rows: (string | number | null)[][]): ParsedSheet => ({
  name: 'Lines',
  hidden: false,
  headerRow: 1,
  headers: [...TEMPLATE_HEADERS],
  rows: rows.map((cells, i) => ({ row: i + 2, cells })),
  formulaCells: [],
  mergedCells: [],
});

function rng(seed: number) {
  return () => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648;
  };
}

/** A generated project across the whole range: −60…450 °C, pipes, vessels and flat surfaces, any purposes, in and out of reach. */
function generatedLines(count: number): LineInput[] {
  const r = rng(20261202);
  const pick = <T>(a: readonly T[]) => a[Math.floor(r() * a.length)];
  const sizes = [21.3, 33.4, 60.3, 88.9, 114.3, 168.3, 219.1, 323.9, 508];
  const purposeSets: Purpose[][] = [
    ['heatConservation'],
    ['personnelProtection'],
    ['condensationControl'],
    ['heatConservation', 'personnelProtection'],
    ['processControl'],
    ['freezeProtection'],
    [],
  ];
  return Array.from({ length: count }, (_, i) => {
    const geometry = pick(['horizontal-pipe', 'horizontal-pipe', 'vertical-pipe', 'vessel', 'flat'] as const);
    const normalTempC = Math.round(-60 + r() * 510);
    return {
      tag: `G-${i}`,
      service: 'generated',
      area: 'G',
      geometry,
      nps: null,
      outsideDiameterMm: geometry.includes('pipe') ? pick(sizes) : null,
      lengthM: 20,
      surfaceAreaM2: geometry.includes('pipe') ? null : 5 + r() * 60,
      heightM: geometry.includes('pipe') ? null : 2 + r() * 8,
      normalTempC,
      maxTempC: r() < 0.5 ? normalTempC + Math.round(r() * 30) : null,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: pick(purposeSets),
      outdoor: r() < 0.6,
      accessible: r() < 0.7,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    };
  });
}

describe('one rule per criterion: recommendation and review agree', () => {
  it('applies condensation control against the condensation conditions, not the annual air', () => {
    const cond = { airC: 30, windMs: 0, relativeHumidityPct: 80 }; // dew point ≈ 26.2 °C (Magnus form, [X])
    // A 12 °C chilled-water line in a 10 °C annual mean: colder than the dew point of a humid summer day.
    expect(condensationControlApplies({ purposes: ['condensationControl'], coldestC: 12 }, cond, 2)).toBe(
      true,
    );
    expect(condensationControlApplies({ purposes: ['condensationControl'], coldestC: 28.5 }, cond, 2)).toBe(
      false,
    );
    // Below 10 °C it is checked even when the line list asks only for heat conservation (common practice).
    expect(
      condensationControlApplies(
        { purposes: ['heatConservation'], coldestC: ALWAYS_CHECK_CONDENSATION_BELOW_C - 0.1 },
        cond,
        2,
      ),
    ).toBe(true);
    expect(
      condensationControlApplies(
        { purposes: ['heatConservation'], coldestC: ALWAYS_CHECK_CONDENSATION_BELOW_C },
        cond,
        2,
      ),
    ).toBe(false);
  });

  it('applies personnel protection to every accessible surface hotter than the personnel air, whatever the purpose', () => {
    const pc = { airC: 35, windMs: 0 };
    expect(personnelProtectionApplies({ accessible: true, hottestC: 35.1 }, pc)).toBe(true);
    expect(personnelProtectionApplies({ accessible: true, hottestC: 35 }, pc)).toBe(false);
    expect(personnelProtectionApplies({ accessible: false, hottestC: 300 }, pc)).toBe(false);
    expect(personnelProtectionApplies({ accessible: undefined, hottestC: 300 }, pc)).toBe(true);
  });

  it('the demo project: no recommended thickness is flagged by the review', () => {
    const v = validateSheet(sheet(demoLineRows()), suggestMapping([...TEMPLATE_HEADERS]));
    expect(v.lines.length).toBe(220);
    const { out, condensation } = disagreements(DEFAULT_DESIGN_BASIS, v.lines);
    expect(out).toEqual([]);
    // The chilled-water and refrigerant lines are sized for condensation.
    expect(condensation).toBeGreaterThan(10);
  });

  it('a generated project across the range, indoor and outdoor: none either', () => {
    const lines = generatedLines(400);
    const { out, personnel, condensation } = disagreements(DEFAULT_DESIGN_BASIS, lines);
    expect(out).toEqual([]);
    expect(personnel).toBeGreaterThan(100);
    expect(condensation).toBeGreaterThan(20);
  });
});
