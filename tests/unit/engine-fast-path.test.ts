/**
 * The recommender's fast path (chains cached per material system and pipe size, one shared solve
 * result, hints carried from candidate to candidate, the bracket's far end evaluated on demand)
 * must give the same numbers as a fresh, independent solve of each case.
 */
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_CRITERIA,
  compileConductivity,
  jacketById,
  materialById,
  recommendLine,
  solveSteady,
  type LineCase,
  type MaterialSystem,
} from '@/lib/thermal';
import { prepareChain, solveChain } from '@/lib/thermal/solve';
import { surfaceFlux } from '@/lib/thermal/surface';

const mw = materialById('mineral-wool-pipe')!;
const system: MaterialSystem = { outer: mw, jacket: jacketById('aluminium-oxidised')! };
const k = compileConductivity(mw.conductivity);

/** Heat-loss flow of a candidate solved from scratch under the design basis' heat-loss conditions. */
function fresh(line: LineCase, layersMm: number[]) {
  const c = DEFAULT_CRITERIA.conditions.heatLoss;
  return solveSteady({
    geometry: line.geometry as Exclude<LineCase['geometry'], 'vessel'>,
    pipeOuterDiameterM: line.pipeOuterDiameterMm! / 1000,
    heightM: line.heightM ?? 1,
    characteristicLengthM: line.characteristicLengthM ?? 1,
    processC: line.normalTempC,
    ambient: {
      airC: c.airC,
      surroundingsC: c.airC,
      windMs: c.windMs,
      emittance: layersMm.length ? system.jacket.emittance : 0.8,
    },
    layers: layersMm.map((t) => ({ thicknessM: t / 1000, conductivity: k })),
  });
}

describe('recommender fast path against independent solves', () => {
  it("vertical pipes of one size but different heights do not share a surface (cached chains take each line's height)", () => {
    const base: LineCase = {
      geometry: 'vertical-pipe',
      pipeOuterDiameterMm: 168.3,
      lengthM: 10,
      normalTempC: 180,
      purposes: ['heatConservation'],
    };
    const tall = { ...base, heightM: 30 },
      short = { ...base, heightM: 1.5 };
    // Solve the tall one, then the short one (same size: the cached chains are reused), then the tall one again.
    const a = recommendLine(tall, system, DEFAULT_CRITERIA);
    const b = recommendLine(short, system, DEFAULT_CRITERIA);
    const c = recommendLine(tall, system, DEFAULT_CRITERIA);
    for (const [r, line] of [
      [a, tall],
      [b, short],
      [c, tall],
    ] as const) {
      for (const cand of [r.candidates[0], r.candidates[3], r.candidates[12]]) {
        const q = fresh(
          line,
          cand.layers.map((l) => l.thicknessMm),
        ).heatFlow;
        expect(Math.abs(cand.heatLoss.heatFlow - q) / Math.abs(q)).toBeLessThan(1e-7);
      }
    }
    // The height really enters (Churchill–Chu vertical plate, length = height): the bare pipes differ.
    expect(Math.abs(a.candidates[0].heatLoss.heatFlow - b.candidates[0].heatLoss.heatFlow)).toBeGreaterThan(
      1,
    );
    expect(c.candidates.map((x) => x.heatLoss.heatFlow)).toEqual(
      a.candidates.map((x) => x.heatLoss.heatFlow),
    );
  });

  it('every candidate of a hot and of a cold line matches a fresh solve to 1e-7 (hinted sweep, shared result object)', () => {
    const lines: LineCase[] = [
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 60.3,
        lengthM: 50,
        normalTempC: 320,
        purposes: ['heatConservation'],
      },
      {
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 273.1,
        lengthM: 50,
        normalTempC: 4,
        purposes: ['heatConservation'],
      },
    ];
    for (const line of lines) {
      const r = recommendLine(line, system, DEFAULT_CRITERIA);
      expect(r.candidates.length).toBeGreaterThan(20);
      for (const cand of r.candidates) {
        const f = fresh(
          line,
          cand.layers.map((l) => l.thicknessMm),
        );
        expect(Math.abs(cand.heatLoss.heatFlow - f.heatFlow) / Math.abs(f.heatFlow)).toBeLessThan(1e-7);
        expect(cand.heatLoss.surfaceC).toBeCloseTo(f.surfaceC, 4);
      }
      // Heat flow keeps its sign: loss on the hot line, gain (negative) on the cold one.
      expect(Math.sign(r.candidates[5].heatLoss.heatFlow)).toBe(line.normalTempC > 10 ? 1 : -1);
    }
  });
});

describe('sign of the heat flow and the bracket evaluated on demand', () => {
  const chain = prepareChain({
    geometry: 'horizontal-pipe',
    pipeOuterDiameterM: 0.1143,
    heightM: 1,
    characteristicLengthM: 1,
    layers: [{ thicknessM: 0.04, conductivity: k }],
  });
  const residual = (processC: number, amb: Parameters<typeof surfaceFlux>[2]) => {
    const r = solveChain(chain, processC, amb);
    const area = Math.PI * 2 * chain.rOuter;
    return {
      Q: r.Q,
      rel: Math.abs(area * surfaceFlux(chain.shape, r.Ts, amb) - r.Q) / Math.max(1e-12, Math.abs(r.Q)),
    };
  };

  it('process between the air and hotter surroundings: the radiation decides the sign, the balance still closes', () => {
    // Air 20 °C, surroundings (hot plant) at 150 °C, process 30 °C: the surface gains heat by radiation.
    const amb = { airC: 20, surroundingsC: 150, windMs: 0, emittance: 0.9 };
    const bare = surfaceFlux(chain.shape, 30, amb);
    expect(bare).toBeLessThan(0);
    const r = residual(30, amb);
    expect(r.Q).toBeLessThan(0);
    expect(r.rel).toBeLessThan(1e-7);
  });

  it('process at the air temperature with surroundings colder: a small loss, not zero', () => {
    const r = residual(20, { airC: 20, surroundingsC: -10, windMs: 0, emittance: 0.9 });
    expect(r.Q).toBeGreaterThan(0);
    expect(r.rel).toBeLessThan(1e-7);
  });

  it('process, air and surroundings equal: no heat flow and no error', () => {
    const r = solveChain(chain, 20, { airC: 20, surroundingsC: 20, windMs: 2, emittance: 0.9 });
    expect(r.Q).toBe(0);
    expect(r.Ts).toBe(20);
  });

  it('a poor hint (far too high a surface coefficient) still converges to the same answer', () => {
    const amb = { airC: 10, surroundingsC: 10, windMs: 3, emittance: 0.1 };
    const good = solveChain(chain, 250, amb).Q;
    const bad = solveChain(chain, 250, amb, 1e6, 50).Q;
    expect(Math.abs(bad - good) / good).toBeLessThan(1e-7);
  });
});
