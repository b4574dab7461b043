/**
 * Touch limit by contact time and surface: ISO 13732-1:2006 burn thresholds (values copied here
 * with their source; confidence tags as in the project's reference collection: [C2] seen in an
 * independent reprint, [R] recalled).
 */
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_CRITERIA,
  burnThresholdC,
  jacketById,
  materialById,
  recommendLine,
  touchLimitFor,
  type LineCase,
  type MaterialSystem,
} from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS, type DesignBasis } from '@/lib/lines/design-basis';
import { criteriaFor, solveLine } from '@/lib/lines/solve-line';
import { flagsForLine } from '@/lib/review/flags';
import { decidingLimits } from '@/lib/lines/deciding';
import type { LineInput } from '@/lib/lines/validate';

describe('ISO 13732-1 burn thresholds (Table 1, contact ≥ 1 min; reprinted in Czech regulation 361/2007 Sb. [C2])', () => {
  it.each([
    ['bare-metal', 60, 51],
    ['bare-metal', 600, 48],
    ['bare-metal', 28800, 43],
    ['ceramic-glass-stone', 60, 56],
    ['ceramic-glass-stone', 600, 48],
    ['ceramic-glass-stone', 28800, 43],
    ['plastic', 60, 60],
    ['plastic', 600, 48],
    ['plastic', 28800, 43],
    ['wood', 60, 60],
    ['wood', 600, 48],
    ['wood', 28800, 43],
  ] as const)('%s at %i s: %i °C', (surface, s, c) => {
    expect(burnThresholdC(surface, s).limitC).toBe(c);
  });
  it('10 s: ceramics/glass/stone 66, plastics 71, wood 89 °C (same reprint [C2]); uncoated metal ≈55 °C [R, read from the ISO figure]', () => {
    expect(burnThresholdC('ceramic-glass-stone', 10).limitC).toBe(66);
    expect(burnThresholdC('plastic', 10).limitC).toBe(71);
    expect(burnThresholdC('wood', 10).limitC).toBe(89);
    expect(burnThresholdC('bare-metal', 10).limitC).toBe(55);
  });
  it('short contacts take the lower end of the ISO figure bands (German reprint [C2]): metal 62–65 (1 s), 60–64 (2 s), 56–61 (5 s); wood 92–112 (5 s)', () => {
    expect(burnThresholdC('bare-metal', 1)).toMatchObject({ limitC: 62, bandC: [62, 65] });
    expect(burnThresholdC('bare-metal', 2)).toMatchObject({ limitC: 60, bandC: [60, 64] });
    expect(burnThresholdC('bare-metal', 5)).toMatchObject({ limitC: 56, bandC: [56, 61] });
    expect(burnThresholdC('wood', 5)).toMatchObject({ limitC: 92, bandC: [92, 112] });
  });
  it('the 5 s band on metal (56–61 °C) brackets the 60 °C industry convention (ASTM C1055 practice)', () => {
    const t = burnThresholdC('bare-metal', 5);
    expect(t.bandC![0]).toBeLessThanOrEqual(60);
    expect(t.bandC![1]).toBeGreaterThanOrEqual(60);
  });
  it('between points, linear in log(contact time) [X]: plastics at 30 s = 71 − 11·ln 3/ln 6 = 64.255 °C', () => {
    expect(burnThresholdC('plastic', 30).limitC).toBeCloseTo(71 - (11 * Math.log(3)) / Math.log(6), 10);
    expect(burnThresholdC('plastic', 30).limitC).toBeCloseTo(64.2554, 3);
  });
  it('thresholds never rise with contact time, and stay 43 °C beyond 8 h', () => {
    for (const sf of ['bare-metal', 'coated-metal', 'ceramic-glass-stone', 'plastic', 'wood'] as const) {
      let prev = Infinity;
      for (const s of [1, 1.5, 2, 3, 5, 7, 10, 20, 60, 120, 600, 3600, 28800, 100000]) {
        const c = burnThresholdC(sf, s).limitC;
        expect(c).toBeLessThanOrEqual(prev);
        prev = c;
      }
      expect(burnThresholdC(sf, 100000).limitC).toBe(43);
    }
  });
  it('a plastic under 10 s holds the 10 s value (bands not read; on the safe side), coated metal takes the uncoated values', () => {
    expect(burnThresholdC('plastic', 3).limitC).toBe(71);
    expect(burnThresholdC('coated-metal', 5).limitC).toBe(56);
  });
  it('refuses a contact under 1 s with a sentence', () => {
    expect(() => burnThresholdC('bare-metal', 0.5)).toThrow(/Contact time must be at least 1 s/);
  });
});

describe('the limit follows the jacket', () => {
  const crit = { touchLimitMetalC: 60, touchLimitNonMetalC: 65, touchContactSeconds: 5 };
  it('aluminium → bare metal 56 °C, painted metal → coated metal 56 °C, PVC → plastics 71 °C at 5 s', () => {
    expect(touchLimitFor(crit, jacketById('aluminium-oxidised')!)).toMatchObject({
      limitC: 56,
      surface: 'bare-metal',
    });
    expect(touchLimitFor(crit, jacketById('painted-metal')!)).toMatchObject({
      limitC: 56,
      surface: 'coated-metal',
    });
    expect(touchLimitFor(crit, jacketById('pvc')!)).toMatchObject({ limitC: 71, surface: 'plastic' });
  });
  it('fixed numbers stay as an explicit override', () => {
    const fixed = { touchLimitMetalC: 60, touchLimitNonMetalC: 65 };
    expect(touchLimitFor(fixed, jacketById('aluminium-oxidised')!).limitC).toBe(60);
    expect(touchLimitFor(fixed, jacketById('pvc')!).limitC).toBe(65);
  });
});

describe('recommendation, review flag and line page agree on the contact-time limit', () => {
  const line: LineCase = {
    geometry: 'horizontal-pipe',
    pipeOuterDiameterMm: 114.3,
    lengthM: 50,
    normalTempC: 180,
    purposes: ['personnelProtection'],
    accessible: true,
  };
  const system: MaterialSystem = {
    outer: materialById('mineral-wool-pipe')!,
    jacket: jacketById('aluminium-oxidised')!,
  };
  it('a 5 s contact on aluminium holds the surface to 56 °C and names ISO 13732-1; the fixed 60 °C needs no more', () => {
    const timed = recommendLine(line, system, {
      ...DEFAULT_CRITERIA,
      touchContactSeconds: 5,
      sweepAllCandidates: true,
    });
    const fixed = recommendLine(line, system, { ...DEFAULT_CRITERIA, sweepAllCandidates: true });
    const p = timed.outcomes.find((o) => o.id === 'personnel')!;
    expect(p.limitC).toBe(56);
    expect(p.touchSurface).toBe('bare-metal');
    expect(p.touchBasis).toMatch(
      /ISO 13732-1 burn threshold \(clause 4 figures\) for bare \(uncoated\) metal at 5 s contact/,
    );
    expect(p.message).toMatch(
      /Surface ≤ 56 °C at 35 °C still air \(touch limit for bare \(uncoated\) metal, 5 s contact, ISO 13732-1\)/,
    );
    expect(p.conditionSet).toBe('personnel');
    const at = timed.candidates.find((c) => c.totalMm === p.requiredMm)!;
    const before = timed.candidates[timed.candidates.indexOf(at) - 1];
    expect(at.personnel!.surfaceC).toBeLessThanOrEqual(56);
    expect(before.personnel!.surfaceC).toBeGreaterThan(56);
    expect(p.requiredMm!).toBeGreaterThanOrEqual(
      fixed.outcomes.find((o) => o.id === 'personnel')!.requiredMm!,
    );
  });
  it('new projects start from 5 s contact; the flag and the deciding limit use the same number', () => {
    expect(DEFAULT_DESIGN_BASIS.touchLimitMode).toBe('contact-time');
    expect(DEFAULT_DESIGN_BASIS.touchContactSeconds).toBe(5);
    expect(criteriaFor(DEFAULT_DESIGN_BASIS, true).touchContactSeconds).toBe(5);
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
      normalTempC: 180,
      maxTempC: 180,
      steamPressureBarG: null,
      flowKgPerS: null,
      fluidCpKJPerKgK: null,
      elbows: 0,
      tees: 0,
      valves: 0,
      flanges: 0,
      purposes: ['personnelProtection'],
      outdoor: true,
      accessible: true,
      accessHeightM: null,
      jacketId: null,
      notes: '',
    };
    const s = solveLine(DEFAULT_DESIGN_BASIS, l);
    expect(decidingLimits(DEFAULT_DESIGN_BASIS, l, s.system.jacket.id).personnelLimitC).toBe(56);
    const bare = flagsForLine(DEFAULT_DESIGN_BASIS, {
      line: l,
      design: null,
      jacketId: null,
      solved: true,
      stale: false,
      unmet: [],
    }).find((f) => f.type === 'hot-surface')!;
    expect(bare.limitC).toBe(56);
    expect(bare.conditions).toMatch(/bare \(uncoated\) metal, 5 s contact \(ISO 13732-1\)/);
    // PVC-jacketed line: plastics, 71 °C at 5 s.
    const pvc = flagsForLine(DEFAULT_DESIGN_BASIS, {
      line: l,
      design: { layers: [{ materialId: 'mineral-wool-pipe', thicknessMm: 20 }], belowCriterion: null },
      jacketId: 'pvc',
      solved: true,
      stale: false,
      unmet: [],
    });
    const hot = pvc.find((f) => f.type === 'hot-surface');
    if (hot) expect(hot.limitC).toBe(71);
  });
  it('a stored basis without the choice keeps its fixed numbers (it was designed with them)', async () => {
    const { designBasisSchema } = await import('@/lib/lines/design-basis');
    const { touchLimitMode: _m, touchContactSeconds: _s, ...old } = DEFAULT_DESIGN_BASIS;
    const parsed: DesignBasis = designBasisSchema.parse(old);
    expect(parsed.touchLimitMode).toBe('fixed');
    expect(criteriaFor(parsed, true).touchContactSeconds).toBeUndefined();
  });
  it('a contact time under 1 s is refused naming the field', async () => {
    const { designBasisSchema } = await import('@/lib/lines/design-basis');
    const r = designBasisSchema.safeParse({ ...DEFAULT_DESIGN_BASIS, touchContactSeconds: 0.2 });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0].message).toMatch(/Contact time must be at least 1 s/);
  });
});
