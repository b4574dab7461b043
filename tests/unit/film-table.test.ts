import { describe, expect, it } from 'vitest';
import { airPropertiesAt, filmAt } from '@/lib/thermal/air';
import {
  nusseltCrossflowCylinderChurchillBernstein,
  nusseltHorizontalCylinderChurchillChu,
  nusseltVerticalPlateChurchillChu,
  nusseltCrossflowCylinderChurchillBernsteinWithFactor,
  nusseltHorizontalCylinderChurchillChuWithFactor,
  nusseltVerticalPlateChurchillChuWithFactor,
} from '@/lib/thermal/correlations';

describe('tabulated film properties match the formulas they are built from', () => {
  it('k, ν, Pr within 2e-6 and the correlation Prandtl factors give the same Nusselt numbers, 200–1250 K', () => {
    let worst = 0;
    for (let T = 200; T <= 1250; T += 0.37) {
      const a = airPropertiesAt(T);
      const f = { ...filmAt(T) };
      worst = Math.max(worst, Math.abs(f.k / a.k - 1), Math.abs(f.nu / a.nu - 1), Math.abs(f.pr / a.pr - 1));
      for (const ra of [1e4, 1e7, 1e10]) {
        expect(
          nusseltHorizontalCylinderChurchillChuWithFactor(ra, f.fCyl) /
            nusseltHorizontalCylinderChurchillChu(ra, a.pr),
        ).toBeCloseTo(1, 7);
        expect(
          nusseltVerticalPlateChurchillChuWithFactor(ra, f.fPlate) /
            nusseltVerticalPlateChurchillChu(ra, a.pr),
        ).toBeCloseTo(1, 7);
      }
      expect(
        nusseltCrossflowCylinderChurchillBernsteinWithFactor(3e4, f.fCb) /
          nusseltCrossflowCylinderChurchillBernstein(3e4, a.pr),
      ).toBeCloseTo(1, 7);
    }
    expect(worst).toBeLessThan(2e-6); // largest next to the kinks of the piecewise-linear cp table
  });
  it('falls back to the formulas outside the grid', () => {
    expect(filmAt(1400).k).toBe(airPropertiesAt(1400).k);
  });
});
