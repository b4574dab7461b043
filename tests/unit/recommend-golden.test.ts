/**
 * The recommender's exact answers for the demo project, pinned: the 220 demo lines under the default
 * design basis (as the product solves them, every candidate swept), again with the sweep stopping at
 * the first candidate that meets each criterion, again with the energy code, heat-loss limits, a tight
 * process drop and the thinnest-within-range economic choice, and each line asked for every purpose
 * (hot as given, and cold at 6 °C) — 1,100 recommendations reaching every criterion.
 *
 * The digest is of the canonical JSON (keys sorted; JSON writes each number exactly), so a
 * refactoring that changes any number, message, order of candidates or outcome fails here. When the
 * engine's answers change on purpose, bump CALCULATION_VERSION and the digest together.
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import {
  CALCULATION_VERSION,
  DEFAULT_CRITERIA,
  DEFAULT_ECONOMICS,
  defaultSystemFor,
  recommendLine,
  type Criteria,
  type LineCase,
  type Recommendation,
} from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';
import { suggestMapping } from '@/lib/lines/mapping';
import type { ParsedSheet } from '@/lib/lines/parse';
import { criteriaFor, lineCaseFor, systemForLine } from '@/lib/lines/solve-line';
import { validateSheet } from '@/lib/lines/validate';
import { TEMPLATE_HEADERS, demoLineRows } from '../../seed/line-list';

const canonical = (v: unknown): unknown =>
  Array.isArray(v)
    ? v.map(canonical)
    : v && typeof v === 'object'
      ? Object.fromEntries(
          Object.keys(v)
            .sort()
            .filter((k) => (v as Record<string, unknown>)[k] !== undefined)
            .map((k) => [k, canonical((v as Record<string, unknown>)[k])]),
        )
      : v;

function demoRecommendations(): Recommendation[] {
  const sheet: ParsedSheet = {
    name: 'Lines',
    hidden: false,
    headerRow: 1,
    headers: [...TEMPLATE_HEADERS],
    rows: demoLineRows(220, 4471).map((cells, i) => ({ row: i + 2, cells })),
    formulaCells: [],
    mergedCells: [],
  };
  const { lines } = validateSheet(sheet, suggestMapping(sheet.headers));
  expect(lines).toHaveLength(220);
  const basis = DEFAULT_DESIGN_BASIS;
  const strict = (c: Criteria): Criteria => ({
    ...c,
    energyCode: 'ashrae-90.1',
    heatLossLimitWPerM: 60,
    heatLossLimitWPerM2: 150,
    maxProcessDropK: 1,
    touchContactSeconds: undefined,
    economics: { ...(c.economics ?? DEFAULT_ECONOMICS), economicChoice: 'thinnest-within-range' },
  });
  const out: Recommendation[] = [];
  for (const l of lines) {
    const system = systemForLine(basis, l);
    const line = lineCaseFor(l);
    const crit = criteriaFor(basis, l.outdoor);
    out.push(recommendLine(line, system, crit));
    out.push(recommendLine(line, system, { ...crit, sweepAllCandidates: false }));
    out.push(recommendLine(line, system, strict(crit)));
    const every: LineCase = {
      ...line,
      purposes: [
        'heatConservation',
        'personnelProtection',
        'condensationControl',
        'processControl',
        'freezeProtection',
      ],
      accessible: true,
      massFlowKgPerS: line.massFlowKgPerS ?? 2,
      lengthM: line.lengthM ?? 80,
    };
    out.push(recommendLine(every, system, strict(criteriaFor(basis, true))));
    out.push(
      recommendLine({ ...every, normalTempC: 6, maxTempC: 6 }, defaultSystemFor(6), {
        ...DEFAULT_CRITERIA,
        sweepAllCandidates: true,
      }),
    );
  }
  return out;
}

describe('recommendLine on the demo project', () => {
  it('gives exactly the pinned answers', () => {
    const recs = demoRecommendations();
    const outcomes: Record<string, number> = {};
    for (const r of recs)
      for (const o of r.outcomes) {
        const k = o.requiredMm === null ? `${o.id} unmet` : o.id;
        outcomes[k] = (outcomes[k] ?? 0) + 1;
      }
    // Readable first: how often each criterion applies and how often no thickness meets it.
    expect(outcomes).toEqual({
      personnel: 483,
      condensation: 386,
      heatLossLimit: 384,
      'heatLossLimit unmet': 18,
      processDrop: 528,
      'processDrop unmet': 13,
      freeze: 457,
      'freeze unmet': 6,
      energyCode: 412,
      economic: 983,
    });
    expect(recs.filter((r) => r.vesselParts).length).toBe(55);
    const digest = createHash('sha256')
      .update(JSON.stringify(canonical(recs)))
      .digest('hex');
    expect({ version: CALCULATION_VERSION, digest }).toEqual({
      version: '2026.12-5',
      digest: '7e6efb0de31cf54dbf655bbf3b2dcc2a0ddf60e61980af1522aa70992dc9bccd',
    });
  });
});
