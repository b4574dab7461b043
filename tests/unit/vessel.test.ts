import { describe, expect, it } from 'vitest';
import { compileConductivity, solveSteady, solveVessel } from '@/lib/thermal';

const k = compileConductivity({ type: 'constant', k: 0.04 });
const fixed = { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.9, fixedCoefficientWPerM2K: 8 };

describe('vessel as shell plus heads, area-weighted', () => {
  it('with constant k and a prescribed film, each part matches its closed form and the total adds up', () => {
    const D = 2, H = 5, t = 0.08, dT = 160;
    const v = solveVessel({ diameterM: D, shellHeightM: H, processC: 180, ambient: fixed, layers: [{ thicknessM: t, conductivity: k }] });
    const shellPerM = dT / (Math.log((D / 2 + t) / (D / 2)) / (2 * Math.PI * 0.04) + 1 / (2 * Math.PI * (D / 2 + t) * 8));
    const headFlux = dT / (t / 0.04 + 1 / 8);
    expect(v.shell.heatFlow).toBeCloseTo(shellPerM, 6);
    expect(v.top.heatFlow).toBeCloseTo(headFlux, 6);
    expect(v.totalW).toBeCloseTo(shellPerM * H + headFlux * 2 * (Math.PI * D * D) / 4, 4);
    expect(v.areasM2.shell).toBeCloseTo(Math.PI * (D + 2 * t) * H, 9);
  });
  it('with natural convection the hot top head loses more per m² than the bottom (buoyancy assisted vs opposed)', () => {
    const v = solveVessel({ diameterM: 1.5, shellHeightM: 3, processC: 150, ambient: { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.1 }, layers: [{ thicknessM: 0.05, conductivity: k }] });
    expect(v.top.heatFlow).toBeGreaterThan(v.bottom.heatFlow);
    expect(v.worstSurfaceC).toBe(Math.max(v.shell.surfaceC, v.top.surfaceC, v.bottom.surfaceC));
    const direct = solveSteady({ geometry: 'horizontal-wall-up', pipeOuterDiameterM: 0, heightM: 1, characteristicLengthM: 1.5 / 4, processC: 150, ambient: { airC: 20, surroundingsC: 20, windMs: 0, emittance: 0.1 }, layers: [{ thicknessM: 0.05, conductivity: k }] });
    expect(v.top.heatFlow).toBeCloseTo(direct.heatFlow, 9);
  });
});
