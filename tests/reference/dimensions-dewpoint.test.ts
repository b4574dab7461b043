import { describe, expect, it } from 'vitest';
// psychrolib 1.1.1 (npm; ASHRAE Handbook—Fundamentals 2017 ch. 1 psychrometrics) as an independent oracle.
import psychrolib from 'psychrolib';
import { pipeByDn, pipeByNps, parseNps } from '@/lib/thermal/pipes';
import { dewPointC, frostPointC, condensationThresholdC } from '@/lib/thermal/psychro';
import * as u from '@/lib/thermal/units';

describe('ASME B36.10M outside diameters (as listed in ChEDL fluids piping.py, which cites B36.10M)', () => {
  const table: [string, number][] = [
    ['1/2', 21.3],
    ['3/4', 26.7],
    ['1', 33.4],
    ['1-1/4', 42.2],
    ['1-1/2', 48.3],
    ['2', 60.3],
    ['2-1/2', 73.0],
    ['3', 88.9],
    ['3-1/2', 101.6],
    ['4', 114.3],
    ['5', 141.3],
    ['6', 168.3],
    ['8', 219.1],
    ['10', 273.0],
    ['12', 323.8],
    ['14', 355.6],
    ['16', 406.4],
    ['18', 457],
    ['20', 508],
    ['22', 559],
    ['24', 610],
  ];
  for (const [nps, od] of table)
    it(`NPS ${nps} → ${od} mm`, () => expect(pipeByNps(nps)?.outsideDiameterMm).toBe(od));
  it('DN and NPS spellings', () => {
    expect(pipeByDn(150)?.nps).toBe('6');
    expect(parseNps('1 1/2')).toBe(1.5);
    expect(parseNps('NPS 3/4')).toBe(0.75);
    expect(parseNps('2"')).toBe(2);
    expect(Number.isNaN(parseNps('large'))).toBe(true);
  });
});

describe('dew point against psychrolib (ASHRAE Hyland–Wexler)', () => {
  psychrolib.SetUnitSystem(psychrolib.SI);
  const cases: [number, number][] = [
    [20, 50],
    [20, 60],
    [23, 60],
    [25, 80],
    [30, 85],
    [32, 90],
    [35, 80],
    [10, 80],
  ];
  for (const [t, rh] of cases) {
    it(`${t} °C, ${rh} % RH within 0.05 K`, () => {
      const ours = dewPointC(t, rh);
      const theirs = psychrolib.GetTDewPointFromRelHum(t, rh / 100);
      expect(Math.abs(ours - theirs)).toBeLessThan(0.05);
    });
  }
  it('Alduchov & Eskridge (1996) values from the team reference table [X]: 25 °C 80 % → 21.309 °C', () => {
    expect(dewPointC(25, 80)).toBeCloseTo(21.309, 2);
    expect(dewPointC(20, 50)).toBeCloseTo(9.261, 2);
  });
  it('below 0 °C the frost point is used, and agrees with psychrolib (over ice) within 0.1 K', () => {
    for (const [t, rh] of [
      [0, 90],
      [-10, 80],
    ] as [number, number][]) {
      expect(Math.abs(frostPointC(t, rh) - psychrolib.GetTDewPointFromRelHum(t, rh / 100))).toBeLessThan(0.1);
    }
    expect(condensationThresholdC(-10, 80).basis).toBe('frost point');
    expect(condensationThresholdC(25, 80).basis).toBe('dew point');
  });
});

describe('units', () => {
  it('conductivity: 1 Btu·in/(h·ft²·°F) = 0.144228 W/(m·K) (exact IT-Btu conversion)', () => {
    expect(u.btuInPerHFt2FToWPerMK(1)).toBeCloseTo(0.144228, 6);
    expect(u.wPerMKToBtuInPerHFt2F(u.btuInPerHFt2FToWPerMK(0.31))).toBeCloseTo(0.31, 12);
  });
  it('linear heat loss: 1 Btu/(h·ft) = 0.9615 W/m', () => {
    expect(u.btuPerHFtToWPerM(1)).toBeCloseTo(0.96152, 4);
  });
  it('temperatures and lengths', () => {
    expect(u.cToF(60)).toBe(140);
    expect(u.fToC(212)).toBeCloseTo(100, 12);
    expect(u.inToMm(1)).toBe(25.4);
    expect(u.psigToMPaAbs(150)).toBeCloseTo(1.1355386, 6); // 1 psi = 6894.757 Pa
  });
});
