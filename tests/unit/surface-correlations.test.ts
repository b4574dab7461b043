/**
 * The correlation registries are the solver's only way from a name to a function: every name the
 * surface table uses resolves in the registry, the hot-path form of each entry gives the value of
 * the function called directly, and the solved surface names the correlation it used.
 */
import { describe, expect, it } from 'vitest';
import { airPropertiesAt, filmAt } from '@/lib/thermal/air';
import {
  FORCED_CONVECTION,
  NATURAL_CONVECTION,
  nusseltCrossflowCylinderChurchillBernstein,
  nusseltFlatPlateAverage,
  nusseltHorizontalCylinderChurchillChu,
  nusseltHorizontalPlateAssistedLloydMoran,
  nusseltHorizontalPlateOpposedMcAdams,
  nusseltVerticalPlateChurchillChu,
  rangeWarning,
} from '@/lib/thermal/correlations';
import { GRAVITY } from '@/lib/thermal/constants';
import {
  GEOMETRIES,
  SURFACE_CORRELATIONS,
  convectionDetail,
  surfaceWarnings,
  type OuterShape,
} from '@/lib/thermal/surface';

const NATURAL_FUNCTIONS = {
  'horizontal-cylinder-churchill-chu': nusseltHorizontalCylinderChurchillChu,
  'vertical-plate-churchill-chu': nusseltVerticalPlateChurchillChu,
  'horizontal-plate-assisted-lloyd-moran': (ra: number, _pr: number) =>
    nusseltHorizontalPlateAssistedLloydMoran(ra),
  'horizontal-plate-opposed-mcadams': (ra: number, _pr: number) => nusseltHorizontalPlateOpposedMcAdams(ra),
};
const FORCED_FUNCTIONS = {
  'crossflow-cylinder-churchill-bernstein': nusseltCrossflowCylinderChurchillBernstein,
  'flat-plate-average': nusseltFlatPlateAverage,
};

describe('registry entries, name for name', () => {
  it('every natural-convection name has exactly its function, in both forms', () => {
    expect(Object.keys(NATURAL_CONVECTION).sort()).toEqual(Object.keys(NATURAL_FUNCTIONS).sort());
    for (const [name, fn] of Object.entries(NATURAL_FUNCTIONS)) {
      const entry = NATURAL_CONVECTION[name as keyof typeof NATURAL_CONVECTION];
      for (const T of [260, 300, 400, 600]) {
        const film = filmAt(T);
        for (const ra of [2e4, 3e6, 5e8, 2e10]) {
          expect(entry(ra, film.pr), `${name} Ra ${ra}`).toBe(fn(ra, film.pr));
          // The hot path reads the tabulated Prandtl factor (within 2e-6 of the formula).
          const exact = fn(ra, airPropertiesAt(T).pr);
          expect(Math.abs(entry.atFilm(ra, film) / exact - 1), `${name} Ra ${ra} at ${T} K`).toBeLessThan(
            1e-5,
          );
        }
      }
    }
  });
  it('every forced-convection name has exactly its function, in both forms', () => {
    expect(Object.keys(FORCED_CONVECTION).sort()).toEqual(Object.keys(FORCED_FUNCTIONS).sort());
    for (const [name, fn] of Object.entries(FORCED_FUNCTIONS)) {
      const entry = FORCED_CONVECTION[name as keyof typeof FORCED_CONVECTION];
      for (const T of [260, 300, 400, 600]) {
        const film = filmAt(T);
        for (const re of [50, 6071, 4e5, 2e6]) {
          expect(entry(re, film.pr), `${name} Re ${re}`).toBe(fn(re, film.pr));
          const exact = fn(re, airPropertiesAt(T).pr);
          expect(Math.abs(entry.atFilm(re, film) / exact - 1), `${name} Re ${re} at ${T} K`).toBeLessThan(
            1e-5,
          );
        }
      }
    }
  });
  it("each natural entry's slope is d ln Nu / d ln Ra of its function (central difference)", () => {
    const pr = 0.71;
    for (const [name, fn] of Object.entries(NATURAL_FUNCTIONS)) {
      const entry = NATURAL_CONVECTION[name as keyof typeof NATURAL_CONVECTION];
      for (const ra of [3e5, 3e6, 5e8]) {
        const d = 1e-4;
        const numeric = (Math.log(fn(ra * (1 + d), pr)) - Math.log(fn(ra * (1 - d), pr))) / (2 * d);
        expect(entry.slope(ra, fn(ra, pr)), `${name} Ra ${ra}`).toBeCloseTo(numeric, 6);
      }
    }
  });
});

describe('the surface table', () => {
  it('names a registered correlation for every shape, hotter and colder than the air', () => {
    for (const g of GEOMETRIES) {
      const u = SURFACE_CORRELATIONS[g];
      expect(NATURAL_CONVECTION[u.naturalWhenHotter], g).toBeTypeOf('function');
      expect(NATURAL_CONVECTION[u.naturalWhenColder], g).toBeTypeOf('function');
      expect(FORCED_CONVECTION[u.forced], g).toBeTypeOf('function');
    }
  });

  const shape = (geometry: OuterShape['geometry']): OuterShape => ({
    geometry,
    diameterM: 0.2,
    heightM: 3,
    characteristicLengthM: 1.5,
  });
  it('the solved coefficient is the named correlations called directly (cube rule, film properties)', () => {
    for (const g of GEOMETRIES) {
      for (const TsC of [80, -10]) {
        const amb = { airC: 20, surroundingsC: 20, windMs: 3, emittance: 0.9 };
        const d = convectionDetail(shape(g), TsC, amb);
        const u = SURFACE_CORRELATIONS[g];
        expect(d.natural).toBe(TsC > 20 ? u.naturalWhenHotter : u.naturalWhenColder);
        expect(d.forced).toBe(u.forced);
        const T = 0.5 * (TsC + 20) + 273.15;
        const air = airPropertiesAt(T);
        const L = shape(g)[u.naturalLength];
        const ra = (GRAVITY * (1 / T) * Math.abs(TsC - 20) * L ** 3 * air.pr) / (air.nu * air.nu);
        const hN = (NATURAL_FUNCTIONS[d.natural](ra, air.pr) * air.k) / L;
        const Lf = shape(g)[u.forcedLength];
        const hF = (FORCED_FUNCTIONS[u.forced]((3 * Lf) / air.nu, air.pr) * air.k) / Lf;
        expect(Math.abs(d.h / Math.cbrt(hN ** 3 + hF ** 3) - 1), `${g} at ${TsC} °C`).toBeLessThan(1e-5);
        expect(Math.abs(d.pr / air.pr - 1)).toBeLessThan(1e-5);
      }
    }
  });
});

describe('range checks use the real groups', () => {
  it('Re·Pr of the cross-flow cylinder is checked with the film Prandtl number, not a fixed 0.7', () => {
    // Re·Pr = 0.2 is the bound: Re 0.28 is inside with Pr 0.72 (0.2016) and would be outside with 0.7 (0.196).
    expect(rangeWarning('crossflow-cylinder-churchill-bernstein', { ra: 0, re: 0.28, pr: 0.72 })).toBeNull();
    expect(rangeWarning('crossflow-cylinder-churchill-bernstein', { ra: 0, re: 0.28, pr: 0.69 })).toMatch(
      /RePr = 1\.93e-1 is outside the range/,
    );
  });
  it('a solved surface in almost still air reports Re·Pr from its own film', () => {
    const amb = { airC: 20, surroundingsC: 20, windMs: 1e-6, emittance: 0.9 };
    const d = convectionDetail(shape0(), 60, amb);
    const w = surfaceWarnings(d).find((m) => m.startsWith('RePr'));
    expect(w).toBe(
      `RePr = ${((d.re ?? 0) * d.pr).toExponential(2)} is outside the range of crossflow-cylinder-churchill-bernstein (2e-1 to ∞); result extrapolated`,
    );
  });
  const shape0 = (): OuterShape => ({
    geometry: 'horizontal-pipe',
    diameterM: 0.1,
    heightM: 1,
    characteristicLengthM: 1,
  });
});
