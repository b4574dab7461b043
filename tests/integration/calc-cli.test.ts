import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

function runCli(cases: unknown): unknown[] {
  const dir = mkdtempSync(join(tmpdir(), 'lagwise-calc-'));
  const file = join(dir, 'cases.json');
  writeFileSync(file, JSON.stringify(cases));
  // Exactly what a user types: npm run --silent calc -- file; stdout must be the JSON array alone.
  const out = execFileSync('npm', ['run', '--silent', 'calc', '--', file], { encoding: 'utf8' });
  return JSON.parse(out);
}

describe('npm run --silent calc -- <file.json>', () => {
  it('answers each case in order, with the documented fields, and reports bad cases by field', () => {
    const out = runCli([
      {
        id: 'steam-4in',
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 114.3,
        processTempC: 180,
        ambientTempC: 20,
        windSpeedMs: 0,
        surfaceEmittance: 0.13,
        relativeHumidityPct: 60,
        layers: [
          {
            thicknessMm: 50,
            conductivity: {
              type: 'table',
              points: [
                [10, 0.034],
                [100, 0.044],
                [200, 0.059],
              ],
            },
          },
          { thicknessMm: 30, conductivity: { type: 'linear', a: 0.033, b: 0.0002 } },
        ],
      },
      {
        id: 'broken',
        geometry: 'horizontal-pipe',
        pipeOuterDiameterMm: 60.3,
        processTempC: 120,
        ambientTempC: 20,
        surfaceEmittance: 2,
        layers: [],
      },
      {
        id: 'tank-roof',
        geometry: 'horizontal-wall-up',
        characteristicLengthM: 2.5,
        processTempC: 90,
        ambientTempC: 15,
        windSpeedMs: 4,
        surfaceEmittance: 0.9,
        layers: [{ thicknessMm: 80, conductivity: { type: 'linear', a: 0.036, b: 0.00018 } }],
      },
    ]) as Record<string, unknown>[];
    expect(out.map((r) => r.id)).toEqual(['steam-4in', 'broken', 'tank-roof']);
    const a = out[0];
    expect(Object.keys(a)).toEqual(
      expect.arrayContaining([
        'heatLossWPerM',
        'surfaceTempC',
        'interfaceTempsC',
        'convectiveCoefficientWPerM2K',
        'radiativeCoefficientWPerM2K',
        'dewPointC',
      ]),
    );
    expect(a.heatLossWPerM as number).toBeGreaterThan(20);
    expect(a.heatLossWPerM as number).toBeLessThan(80);
    expect((a.interfaceTempsC as number[]).length).toBe(1);
    expect((a.interfaceTempsC as number[])[0]).toBeGreaterThan(a.surfaceTempC as number);
    expect(a.dewPointC as number).toBeCloseTo(12.0, 1); // 20 °C, 60 % (Alduchov & Eskridge: 12.000)
    expect(out[1]).toEqual({
      id: 'broken',
      error: 'surfaceEmittance: surfaceEmittance must be between 0 and 1',
    });
    expect(out[2].heatFluxWPerM2 as number).toBeGreaterThan(0);
    expect(out[2].heatLossWPerM).toBeUndefined();
  });
});
