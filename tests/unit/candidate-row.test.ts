/**
 * The stored candidate codec: the positions and rounding of the stored JSON are fixed (results
 * already in databases are read with it), and decoding gives the same numbers back.
 */
import { describe, expect, it } from 'vitest';
import { candidateAt, decodeCandidate, encodeCandidate, type CandidateRow } from '@/lib/lines/candidate-row';
import type { CandidateResult } from '@/lib/thermal';

const engine: CandidateResult = {
  totalMm: 80,
  layers: [
    { materialId: 'mineral-wool-pipe', thicknessMm: 50 },
    { materialId: 'calcium-silicate', thicknessMm: 30 },
  ],
  heatLoss: { heatFlow: 61.23456789, surfaceC: 31.23456, interfacesC: [120] },
  personnel: { surfaceC: 44.5678, interfacesC: [130] },
  annualCost: 12.34567,
  serviceLimitOk: true,
};

describe('stored candidate codec', () => {
  it('writes the stored positions, rounded as stored', () => {
    expect(encodeCandidate(engine)).toEqual([
      80,
      [
        ['mineral-wool-pipe', 50],
        ['calcium-silicate', 30],
      ],
      61.234568,
      31.23,
      44.57,
      12.346,
      true,
      null,
    ]);
  });
  it('reads rows back, including seven-field rows stored before the condensation field', () => {
    expect(decodeCandidate(encodeCandidate(engine))).toEqual({
      mm: 80,
      layers: engine.layers,
      heatFlow: 61.234568,
      heatLossC: 31.23,
      personnelC: 44.57,
      annualCost: 12.346,
      withinLimits: true,
      condensationC: null,
      partFluxesWPerM2: null,
    });
    // A vessel's row carries each part's flux as a ninth field, rounded as the heat flow is.
    const vessel = encodeCandidate(engine, [12.3456789, 40.1234567, 55.5]);
    expect(vessel).toHaveLength(9);
    expect(decodeCandidate(vessel).partFluxesWPerM2).toEqual([12.345679, 40.123457, 55.5]);
    const old: CandidateRow = [0, [], 250.5, 180.2, null, null, true];
    expect(decodeCandidate(old)).toMatchObject({ mm: 0, layers: [], personnelC: null, condensationC: null });
  });
  it('finds a row by thickness', () => {
    const rows = [encodeCandidate({ ...engine, totalMm: 0, layers: [] }), encodeCandidate(engine)];
    expect(candidateAt(rows, 80)?.[0]).toBe(80);
    expect(candidateAt(rows, 25)).toBeUndefined();
    expect(candidateAt(rows, null)).toBeUndefined();
  });
});
