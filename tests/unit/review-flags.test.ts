import { describe, expect, it } from 'vitest';
import { flagsForLine, type FlagInput } from '@/lib/review/flags';
import { DEFAULT_DESIGN_BASIS, type DesignBasis } from '@/lib/lines/design-basis';
import { solveSteady, compileConductivity, materialById, jacketById } from '@/lib/thermal';
import type { LineInput } from '@/lib/lines/validate';

const line = (o: Partial<LineInput> = {}): LineInput => ({
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
  purposes: ['heatConservation', 'personnelProtection'],
  outdoor: true,
  accessible: true,
  accessHeightM: null,
  jacketId: null,
  notes: '',
  ...o,
});
const input = (
  l: LineInput,
  mm: number | null,
  jacketId = 'aluminium-oxidised',
  extra: Partial<FlagInput> = {},
): FlagInput => ({
  line: l,
  design:
    mm === null
      ? null
      : { layers: mm ? [{ materialId: 'mineral-wool-pipe', thicknessMm: mm }] : [], belowCriterion: null },
  jacketId,
  solved: true,
  stale: false,
  unmet: [],
  ...extra,
});

/** The surface temperature the flag rule sees, computed independently with the public solver. */
function surfaceAt(mm: number, emittance: number, processC = 180) {
  const pc = DEFAULT_DESIGN_BASIS.conditions.personnel.outdoor;
  return solveSteady({
    geometry: 'horizontal-pipe',
    pipeOuterDiameterM: 0.1143,
    heightM: 6,
    characteristicLengthM: 1,
    processC,
    ambient: { airC: pc.airC, surroundingsC: pc.airC, windMs: 0, emittance },
    layers: mm
      ? [
          {
            thicknessM: mm / 1000,
            conductivity: compileConductivity(materialById('mineral-wool-pipe')!.conductivity),
          },
        ]
      : [],
  }).surfaceC;
}

// The fixed numbers (the explicit override of the contact-time limit, tests/reference/touch-limits.test.ts).
const FIXED: DesignBasis = { ...DEFAULT_DESIGN_BASIS, touchLimitMode: 'fixed' };

describe('hot-surface flag', () => {
  it('flags a bare accessible hot line with the numbers behind it', () => {
    const f = flagsForLine(FIXED, input(line(), null));
    const hot = f.find((x) => x.type === 'hot-surface')!;
    expect(hot.limitC).toBe(60);
    expect(hot.valueC).toBeCloseTo(surfaceAt(0, 0.8), 6);
    expect(hot.conditions).toMatch(/35 °C air, 0 m\/s, bare \(uncoated\) metal \(fixed limit\)/);
  });
  it('a surface exactly at the limit passes; a hair above is flagged', () => {
    const ts = surfaceAt(25, jacketById('aluminium-oxidised')!.emittance);
    const atLimit: DesignBasis = { ...FIXED, touchLimitMetalC: ts };
    expect(flagsForLine(atLimit, input(line(), 25)).some((x) => x.type === 'hot-surface')).toBe(false);
    const below: DesignBasis = { ...FIXED, touchLimitMetalC: ts - 0.01 };
    expect(flagsForLine(below, input(line(), 25)).some((x) => x.type === 'hot-surface')).toBe(true);
  });
  it('metal and non-metal finishes use their own limits', () => {
    const tsPvc = surfaceAt(25, jacketById('pvc')!.emittance);
    const basis: DesignBasis = { ...FIXED, touchLimitMetalC: tsPvc - 1, touchLimitNonMetalC: tsPvc + 1 };
    expect(flagsForLine(basis, input(line(), 25, 'pvc')).some((x) => x.type === 'hot-surface')).toBe(false);
    expect(
      flagsForLine(basis, input(line(), 25, 'painted-metal')).some((x) => x.type === 'hot-surface'),
    ).toBe(true);
  });
  it('an inaccessible line is not flagged however hot', () => {
    expect(
      flagsForLine(DEFAULT_DESIGN_BASIS, input(line({ accessible: false }), null)).some(
        (x) => x.type === 'hot-surface',
      ),
    ).toBe(false);
  });
});

describe('other flags', () => {
  it('a chilled line left bare sweats under the dew point + margin', () => {
    const f = flagsForLine(
      DEFAULT_DESIGN_BASIS,
      input(line({ normalTempC: 6, maxTempC: 8, purposes: ['condensationControl'] }), null),
    );
    const s = f.find((x) => x.type === 'sweating')!;
    expect(s.limitC).toBeCloseTo(26.17 + 2, 1); // 30 °C, 80 % RH: dew point 26.2 °C (Alduchov & Eskridge 1996) + 2 K
    expect(s.valueC!).toBeLessThan(s.limitC!);
  });
  it("an interface over a layer's service limit is flagged", () => {
    const f = flagsForLine(
      DEFAULT_DESIGN_BASIS,
      input(line({ normalTempC: 200, maxTempC: 200 }), 25, 'aluminium-oxidised', {
        design: { layers: [{ materialId: 'elastomeric-foam', thicknessMm: 25 }], belowCriterion: null },
      }),
    );
    expect(f.find((x) => x.type === 'interface-limit')!.message).toMatch(
      /exceeds its maximum service temperature of 104 °C/,
    );
  });
  it('picks below a criterion and missing data are flagged', () => {
    const f = flagsForLine(
      DEFAULT_DESIGN_BASIS,
      input(line(), 100, 'aluminium-oxidised', {
        design: {
          layers: [{ materialId: 'mineral-wool-pipe', thicknessMm: 100 }],
          belowCriterion: 'personnel',
        },
        stale: true,
        unmet: ['freeze'],
      }),
    );
    expect(f.map((x) => x.type).sort()).toEqual(['below-criterion', 'blocked', 'blocked']);
  });
});
