import { describe, expect, it } from 'vitest';
import {
  FORCED_CONVECTION,
  NATURAL_CONVECTION,
  checkRange,
  nusseltCrossflowCylinderChurchillBernstein,
  nusseltFlatPlateAverage,
  nusseltHorizontalCylinderChurchillChu,
  nusseltHorizontalPlateAssistedLloydMoran,
  nusseltHorizontalPlateOpposedMcAdams,
  nusseltVerticalPlateChurchillChu,
} from '@/lib/thermal/correlations';
import { GRAVITY } from '@/lib/thermal/constants';

describe('natural convection, horizontal cylinder (Churchill & Chu 1975)', () => {
  it('ChEDL ht: Nu_horizontal_cylinder_Churchill_Chu(Pr=0.69, Gr=2.63e9) = 139.13493970073597', () => {
    expect(nusseltHorizontalCylinderChurchillChu(2.63e9 * 0.69, 0.69)).toBeCloseTo(139.13493970073597, 9);
  });
  it('Çengel & Ghajar, Heat and Mass Transfer 5th ed., Example 9-1 (hot-water pipe, book air properties)', () => {
    // D = 0.08 m, Ts = 70 °C, T∞ = 20 °C; film 45 °C: k 0.02699, ν 1.750e-5, Pr 0.7241, β = 1/318 K⁻¹.
    const D = 0.08,
      k = 0.02699,
      nu = 1.75e-5,
      pr = 0.7241;
    const ra = (GRAVITY * (1 / 318) * 50 * D ** 3 * pr) / (nu * nu);
    expect(ra / 1.867e6).toBeCloseTo(1, 2);
    const Nu = nusseltHorizontalCylinderChurchillChu(ra, pr);
    expect(Nu).toBeCloseTo(17.4, 1);
    const h = (Nu * k) / D;
    expect(Math.abs(h - 5.869) / 5.869).toBeLessThan(0.005);
    const Q = h * Math.PI * D * 6 * 50;
    expect(Math.abs(Q - 443) / 443).toBeLessThan(0.005);
  });
});

describe('forced convection, cylinder in cross-flow (Churchill & Bernstein 1977)', () => {
  it('ChEDL ht: Nu_cylinder_Churchill_Bernstein(Re=6071, Pr=0.7) = 40.63708594124974', () => {
    expect(nusseltCrossflowCylinderChurchillBernstein(6071, 0.7)).toBeCloseTo(40.63708594124974, 9);
  });
  it('Çengel & Ghajar 5th ed., steam pipe in windy air (Ch. 7): Re 4.219e4, Pr 0.7202 → Nu ≈ 124 [C2]', () => {
    expect(nusseltCrossflowCylinderChurchillBernstein(4.219e4, 0.7202)).toBeCloseTo(124, 0);
  });
  it('Çengel problem 7-53 solution: Re 1.632e4, Pr 0.7255 → Nu 71.19 [C]', () => {
    expect(nusseltCrossflowCylinderChurchillBernstein(1.632e4, 0.7255)).toBeCloseTo(71.19, 1);
  });
});

describe('plates (values computed from the stated equations)', () => {
  it('vertical plate (Churchill & Chu): Ra 1e9, Pr 0.71 → 122.86 (eq. 4 worked by hand [X])', () => {
    expect(nusseltVerticalPlateChurchillChu(1e9, 0.71)).toBeCloseTo(122.86, 1);
  });
  it('horizontal plate, buoyancy assisted: 0.54·Ra^¼ to 1e7, 0.15·Ra^⅓ above', () => {
    expect(nusseltHorizontalPlateAssistedLloydMoran(1e6)).toBeCloseTo(0.54 * 31.6227766, 6);
    expect(nusseltHorizontalPlateAssistedLloydMoran(1e9)).toBeCloseTo(150, 6);
  });
  it('horizontal plate, buoyancy opposed: 0.27·Ra^¼', () => {
    expect(nusseltHorizontalPlateOpposedMcAdams(1e8)).toBeCloseTo(27, 6);
  });
  it('flat plate average, laminar and mixed', () => {
    expect(nusseltFlatPlateAverage(1e5, 0.7)).toBeCloseTo(0.664 * Math.sqrt(1e5) * Math.cbrt(0.7), 9);
    expect(nusseltFlatPlateAverage(1e6, 0.7)).toBeCloseTo((0.037 * 1e6 ** 0.8 - 871) * Math.cbrt(0.7), 6);
  });
});

describe('registries name the functions they call', () => {
  it('natural-convection names give the same value as the functions', () => {
    expect(NATURAL_CONVECTION['horizontal-cylinder-churchill-chu'](3e6, 0.71)).toBe(
      nusseltHorizontalCylinderChurchillChu(3e6, 0.71),
    );
    expect(NATURAL_CONVECTION['vertical-plate-churchill-chu'](3e6, 0.71)).toBe(
      nusseltVerticalPlateChurchillChu(3e6, 0.71),
    );
    expect(NATURAL_CONVECTION['horizontal-plate-assisted-lloyd-moran'](3e6, 0.71)).toBe(
      nusseltHorizontalPlateAssistedLloydMoran(3e6),
    );
    expect(NATURAL_CONVECTION['horizontal-plate-opposed-mcadams'](3e6, 0.71)).toBe(
      nusseltHorizontalPlateOpposedMcAdams(3e6),
    );
  });
  it('forced-convection names give the same value as the functions', () => {
    expect(FORCED_CONVECTION['crossflow-cylinder-churchill-bernstein'](2e4, 0.71)).toBe(
      nusseltCrossflowCylinderChurchillBernstein(2e4, 0.71),
    );
    expect(FORCED_CONVECTION['flat-plate-average'](2e4, 0.71)).toBe(nusseltFlatPlateAverage(2e4, 0.71));
  });
  it('validity ranges are checked, not silent', () => {
    expect(checkRange('horizontal-plate-assisted-lloyd-moran', 5e3)).toMatch(/outside the range/);
    expect(checkRange('horizontal-cylinder-churchill-chu', 1e6)).toBeNull();
  });
});
