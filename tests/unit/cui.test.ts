/**
 * Corrosion-under-insulation screen. Windows as recalled from AMPP/NACE SP0198 (carbon steel
 * −4 to 175 °C, 25–350 °F; austenitic/duplex stainless ESCC 50 to 175 °C, 120–350 °F) and API RP 583
 * (carbon steel −12 to 175 °C, 10–350 °F; austenitic stainless 60 to 205 °C, 140–400 °F) [recalled].
 */
import { describe, expect, it } from 'vitest';
import { CUI_WINDOWS, screenCui, type CuiSpec } from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS, designBasisSchema, type DesignBasis } from '@/lib/lines/design-basis';
import { cuiScreenFor } from '@/lib/lines/cui';
import { flagsForLine } from '@/lib/review/flags';
import { dispositionsFor } from '@/lib/review/dispositions';
import { runRecommendCase } from '@/lib/lines/recommend-case';
import type { LineInput } from '@/lib/lines/validate';

const cs: CuiSpec = {
  metals: ['carbon-steel'],
  screenIdle: false,
  requireCoatingNote: false,
  requireChlorideFree: false,
};
const both: CuiSpec = { ...cs, metals: ['carbon-steel', 'austenitic-stainless'] };

describe('windows, with their sources', () => {
  it("carry the recalled limits in °C converted from the documents' °F (25/10/120/140 °F → −3.9/−12.2/48.9/60 °C, 350/400 °F → 176.7/204.4 °C, rounded as the documents' metric figures)", () => {
    expect(CUI_WINDOWS.map((w) => [w.metal, w.fromC, w.toC])).toEqual([
      ['carbon-steel', -4, 175],
      ['carbon-steel', -12, 175],
      ['austenitic-stainless', 50, 175],
      ['austenitic-stainless', 60, 205],
    ]);
    for (const w of CUI_WINDOWS) expect(w.source).toMatch(/^(AMPP\/NACE SP0198|API RP 583), .*\[recalled\]$/);
  });
});

describe('screening a line', () => {
  it('operating in the carbon-steel window: both documents named', () => {
    const s = screenCui({ normalC: 120 }, cs);
    expect(s.inWindow).toBe(true);
    expect(s.findings.map((f) => [f.exposure, f.window.fromC, f.window.toC])).toEqual([
      ['operating', -4, 175],
      ['operating', -12, 175],
    ]);
  });
  it("−8 °C is inside API RP 583's window only; 180 °C is outside both carbon-steel windows", () => {
    expect(screenCui({ normalC: -8 }, cs).findings.map((f) => f.source)).toEqual([
      expect.stringMatching(/^API RP 583/),
    ]);
    expect(screenCui({ normalC: 180 }, cs).inWindow).toBe(false);
  });
  it('a line cycling from 250 °C down to 150 °C passes through the window (cyclic)', () => {
    const s = screenCui({ normalC: 250, maxC: 150 }, cs);
    expect(s.findings[0]).toMatchObject({ exposure: 'cyclic', fromC: 150, toC: 250 });
  });
  it('idle at ambient counts only when the project says lines stand idle', () => {
    expect(screenCui({ normalC: 300, idleC: 10 }, cs).inWindow).toBe(false);
    expect(screenCui({ normalC: 300, idleC: 10 }, { ...cs, screenIdle: true }).findings[0]).toMatchObject({
      exposure: 'idle',
      fromC: 10,
    });
  });
  it("stainless at 190 °C: API RP 583's ESCC window (to 205 °C), not SP0198's (to 175 °C); chloride-free insulation when required", () => {
    const s = screenCui({ normalC: 190 }, { ...both, requireChlorideFree: true, requireCoatingNote: true });
    expect(s.findings.map((f) => [f.metal, f.source.slice(0, 10)])).toEqual([
      ['austenitic-stainless', 'API RP 583'],
    ]);
    expect(s.chlorideFreeInsulation).toBe(true);
    expect(s.coatingNote).toMatch(/AMPP\/NACE SP0198/);
  });
  it('chloride-free is asked only of stainless findings; nothing is asked outside the windows', () => {
    expect(screenCui({ normalC: 100 }, { ...cs, requireChlorideFree: true }).chlorideFreeInsulation).toBe(
      false,
    );
    expect(
      screenCui({ normalC: 400 }, { ...both, requireCoatingNote: true, requireChlorideFree: true }),
    ).toEqual({ findings: [], inWindow: false, coatingNote: null, chlorideFreeInsulation: false });
  });
});

describe('in the product', () => {
  const l: LineInput = {
    tag: 'T-1',
    service: '',
    area: 'A',
    geometry: 'horizontal-pipe',
    nps: '4',
    outsideDiameterMm: 114.3,
    lengthM: 20,
    surfaceAreaM2: null,
    heightM: null,
    normalTempC: 120,
    maxTempC: 120,
    steamPressureBarG: null,
    flowKgPerS: null,
    fluidCpKJPerKgK: null,
    elbows: 0,
    tees: 0,
    valves: 0,
    flanges: 0,
    purposes: ['heatConservation'],
    outdoor: true,
    accessible: false,
    accessHeightM: null,
    jacketId: null,
    notes: '',
  };
  it("a new project flags a screened line for review with the window and the source; the reviewer's choice stays open", () => {
    const f = flagsForLine(DEFAULT_DESIGN_BASIS, {
      line: l,
      design: null,
      jacketId: null,
      solved: true,
      stale: false,
      unmet: [],
    });
    const c = f.find((x) => x.type === 'cui')!;
    expect(c.message).toBe(
      'In a corrosion-under-insulation window: carbon and low-alloy steel, operating 120 °C in the -4 °C to 175 °C window (AMPP/NACE SP0198, carbon and low-alloy steels, 25–350 °F [recalled]); carbon and low-alloy steel, operating 120 °C in the -12 °C to 175 °C window (API RP 583, carbon steel, 10–350 °F [recalled]).',
    );
    expect(dispositionsFor(['cui'])).toHaveLength(7);
  });
  it('a stored basis from before the screen raises no new flag, but the line page still shows the screen', () => {
    const { cui: _c, ...old } = DEFAULT_DESIGN_BASIS;
    const parsed: DesignBasis = designBasisSchema.parse(old);
    expect(parsed.cui.reviewFlag).toBe(false);
    expect(
      flagsForLine(parsed, {
        line: l,
        design: null,
        jacketId: null,
        solved: true,
        stale: false,
        unmet: [],
      }).some((x) => x.type === 'cui'),
    ).toBe(false);
    expect(cuiScreenFor(parsed, l).inWindow).toBe(true);
  });
  it("the idle temperature is the annual heat-loss air of the line's location", () => {
    const basis: DesignBasis = {
      ...DEFAULT_DESIGN_BASIS,
      cui: { ...DEFAULT_DESIGN_BASIS.cui, screenIdle: true },
    };
    const hot = { ...l, normalTempC: 300, maxTempC: 300 };
    expect(cuiScreenFor(basis, hot).findings[0]).toMatchObject({
      exposure: 'idle',
      fromC: DEFAULT_DESIGN_BASIS.conditions.heatLoss.outdoor.airC,
    });
    expect(cuiScreenFor(basis, { ...hot, outdoor: false }).findings[0]).toMatchObject({
      exposure: 'idle',
      fromC: DEFAULT_DESIGN_BASIS.conditions.heatLoss.indoor.airC,
    });
  });
  it('a single metal from a form field is read as a list', () => {
    const r = designBasisSchema.parse({
      ...DEFAULT_DESIGN_BASIS,
      cui: { ...DEFAULT_DESIGN_BASIS.cui, metals: 'austenitic-stainless' },
    });
    expect(r.cui.metals).toEqual(['austenitic-stainless']);
  });
  it('the batch CLI answers the screen when a case asks (additive field)', () => {
    const r = runRecommendCase({
      id: 'x',
      geometry: 'horizontal-pipe',
      nps: 4,
      normalTempC: 190,
      purposes: ['heatConservation'],
      cui: { metals: ['austenitic-stainless'], requireChlorideFree: true },
    }) as { cui: { inWindow: boolean; chlorideFreeInsulation: boolean } };
    expect(r.cui).toMatchObject({ inWindow: true, chlorideFreeInsulation: true });
    const plain = runRecommendCase({
      id: 'x',
      geometry: 'horizontal-pipe',
      nps: 4,
      normalTempC: 190,
      purposes: ['heatConservation'],
    });
    expect('cui' in plain).toBe(false);
    expect(
      runRecommendCase({
        id: 'x',
        geometry: 'horizontal-pipe',
        nps: 4,
        normalTempC: 190,
        purposes: ['heatConservation'],
        cui: { metals: ['brass'] },
      }),
    ).toMatchObject({ error: expect.stringMatching(/cui\.metals: each must be/) });
  });
});
