import { describe, expect, it } from 'vitest';
import {
  region1,
  region2,
  saturatedSteamAtPressure,
  saturationPressureMPa,
  saturationTemperatureK,
} from '@/lib/thermal/steam';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

// IAPWS R7-97(2012), verification tables (values as transcribed in several independent
// implementations' test files — confidence [C2] in the team's reference notes).
describe('IAPWS-IF97 verification values', () => {
  it('region 4 saturation pressure — Table 35', () => {
    expect(rel(saturationPressureMPa(300), 0.353658941e-2)).toBeLessThan(1e-8);
    expect(rel(saturationPressureMPa(500), 0.263889776e1)).toBeLessThan(1e-8);
    expect(rel(saturationPressureMPa(600), 0.123443146e2)).toBeLessThan(1e-8);
  });
  it('region 4 saturation temperature — Table 36', () => {
    expect(Math.abs(saturationTemperatureK(0.1) - 0.372755919e3)).toBeLessThan(1e-6);
    expect(Math.abs(saturationTemperatureK(1) - 0.453035632e3)).toBeLessThan(1e-6);
    expect(Math.abs(saturationTemperatureK(10) - 0.584149488e3)).toBeLessThan(1e-6);
  });
  it('region 1 — Table 5', () => {
    const a = region1(300, 3),
      b = region1(300, 80),
      c = region1(500, 3);
    expect(rel(a.v, 0.100215168e-2)).toBeLessThan(1e-7);
    expect(rel(a.h, 0.115331273e3)).toBeLessThan(1e-7);
    expect(rel(a.u, 0.112324818e3)).toBeLessThan(1e-7);
    expect(rel(a.s, 0.392294792)).toBeLessThan(1e-7);
    expect(rel(a.cp, 0.417301218e1)).toBeLessThan(1e-7);
    expect(rel(a.w, 0.150773921e4)).toBeLessThan(1e-7);
    expect(rel(b.h, 0.184142828e3)).toBeLessThan(1e-7);
    expect(rel(b.v, 0.971180894e-3)).toBeLessThan(1e-7);
    expect(rel(c.h, 0.975542239e3)).toBeLessThan(1e-7);
    expect(rel(c.cp, 0.465580682e1)).toBeLessThan(1e-7);
  });
  it('region 2 — Table 15', () => {
    const a = region2(300, 0.0035),
      b = region2(700, 0.0035),
      c = region2(700, 30);
    expect(rel(a.v, 0.394913866e2)).toBeLessThan(1e-7);
    expect(rel(a.h, 0.254991145e4)).toBeLessThan(1e-7);
    expect(rel(a.s, 0.852238967e1)).toBeLessThan(1e-7);
    expect(rel(a.w, 0.427920172e3)).toBeLessThan(1e-7);
    expect(rel(b.h, 0.333568375e4)).toBeLessThan(1e-7);
    expect(rel(b.cp, 0.208141274e1)).toBeLessThan(1e-7);
    expect(rel(c.v, 0.542946619e-2)).toBeLessThan(1e-7);
    expect(rel(c.h, 0.263149474e4)).toBeLessThan(1e-7);
    expect(rel(c.cp, 0.103505092e2)).toBeLessThan(1e-7);
  });
});

describe('saturated steam on the line (regression against IF97 via the iapws library [X])', () => {
  // Team reference notes §5.1, computed with Debian's python3-iapws 1.5.3.
  const table: [number, number, number][] = [
    [1.01325, 99.974, 2256.54],
    [2, 120.212, 2201.56],
    [5, 151.836, 2107.92],
    [10, 179.886, 2014.44],
    [20, 212.385, 1889.76],
    [40, 250.358, 1713.47],
  ];
  for (const [bar, t, hfg] of table) {
    it(`${bar} bar(a): ${t} °C, h_fg ${hfg} kJ/kg`, () => {
      const s = saturatedSteamAtPressure(bar / 10);
      expect(s.temperatureC).toBeCloseTo(t, 2);
      expect(s.latentHeatKJPerKg).toBeCloseTo(hfg, 1);
    });
  }
});

describe('trade facts (common practice)', () => {
  it('saturated steam at 4 bar(a) condenses near 144 °C with a latent heat of about 2.1 MJ/kg', () => {
    const s = saturatedSteamAtPressure(0.4);
    expect(s.temperatureC).toBeGreaterThan(143);
    expect(s.temperatureC).toBeLessThan(145);
    expect(s.latentHeatKJPerKg / 1000).toBeCloseTo(2.13, 1);
  });
  it("water's specific heat is about 4.18 kJ/(kg·K)", () => {
    expect(region1(293.15, 0.101325).cp).toBeCloseTo(4.18, 2);
  });
  it('refuses pressures off the saturation line range', () => {
    expect(() => saturatedSteamAtPressure(30)).toThrow(/between/);
  });
});
