import { afterAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import type { Line } from '@/db/schema';
import { DEFAULT_DESIGN_BASIS } from '@/lib/lines/design-basis';
import { resultContext, resultRow } from '@/lib/lines/result-row';
import { createSolvePool } from '@/lib/lines/solve-pool';

// Lines of an invented scenario: hot, cold and vessel service, so every criterion path runs.
const line = (i: number, o: Partial<Line>): Line =>
  ({
    id: randomUUID(),
    projectId: 'p',
    revisionId: 'r',
    tag: `T-${i}`,
    service: 'test',
    area: 'A',
    geometry: 'horizontal-pipe',
    nps: '4',
    outsideDiameterMm: 114.3,
    lengthM: 50,
    surfaceAreaM2: null,
    heightM: null,
    normalTempC: 180,
    maxTempC: 200,
    steamPressureBarG: null,
    flowKgPerS: null,
    fluidCpKJPerKgK: null,
    elbows: 2,
    tees: 1,
    valves: 1,
    flanges: 2,
    purposes: ['heatConservation', 'personnelProtection'],
    outdoor: true,
    accessible: true,
    accessHeightM: null,
    jacketId: null,
    notes: null,
    inputVersion: 1,
    ...o,
  }) as unknown as Line;

const lines = Array.from({ length: 60 }, (_, i) =>
  i % 3 === 0
    ? line(i, { normalTempC: 5 + (i % 7), maxTempC: null, purposes: ['condensationControl'] })
    : i % 3 === 1
      ? line(i, {
          geometry: 'vessel',
          nps: null,
          outsideDiameterMm: null,
          lengthM: null,
          surfaceAreaM2: 40 + i,
          normalTempC: 150,
        })
      : line(i, { normalTempC: 100 + 4 * i, nps: ['2', '4', '8'][i % 3] }),
);

const pool = createSolvePool(2);
afterAll(async () => pool?.close());

describe('solve pool (worker threads)', () => {
  it('builds exactly the rows the calling thread builds, in order', { timeout: 60_000 }, async () => {
    expect(pool).not.toBeNull();
    const task = { basis: DEFAULT_DESIGN_BASIS, revision: 3, projectId: 'p' };
    const here = lines.map((l) => resultRow(resultContext(task), l));
    const [a, b] = await Promise.all([
      pool!.solve({ ...task, lines: lines.slice(0, 30) }),
      pool!.solve({ ...task, lines: lines.slice(30) }),
    ]);
    const strip = ({ solvedAt: _, ...r }: (typeof here)[number]) => r;
    expect([...a, ...b].map(strip)).toEqual(here.map(strip));
    // Real answers, not NaN carried through: every line has a recommendation and finite heat flows.
    expect(here.every((r) => r.recommendedMm !== null && Number.isFinite(r.bareHeatW))).toBe(true);
    expect(here.filter((r) => r.governing === 'condensation')).toHaveLength(20); // the cold third
  });

  it('one thread asked for means no pool', () => {
    expect(createSolvePool(1)).toBeNull();
  });
});
