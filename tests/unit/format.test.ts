import { describe, expect, it } from 'vitest';
import {
  convert,
  describeChanges,
  fixed,
  formatter,
  fractionalInches,
  isCurrencyCode,
  money,
  sig,
} from '@/lib/format';

describe('significant figures and fixed decimals', () => {
  it('drops float noise', () => {
    expect(sig(165.10000000000002, 4)).toBe('165.1');
    expect(sig(114.30000000000001, 4)).toBe('114.3');
    expect(sig(0.1 + 0.2, 3)).toBe('0.3');
  });
  it('keeps integer digits and groups thousands', () => {
    expect(sig(12345.6, 3)).toBe('12,346');
    expect(sig(-0.000123456, 2)).toBe('-0.00012');
    expect(sig(0)).toBe('0');
    expect(sig(null)).toBe('—');
  });
  it('never writes -0', () => {
    expect(fixed(-0.04, 1)).toBe('0.0');
    expect(fixed(1234.56, 1)).toBe('1,234.6');
  });
});

describe('fractional inches', () => {
  it('writes the inch series the way the trade does', () => {
    expect(fractionalInches(1.5)).toBe('1-1/2"');
    expect(fractionalInches(0.375)).toBe('3/8"');
    expect(fractionalInches(2)).toBe('2"');
    expect(fractionalInches(2.5)).toBe('2-1/2"');
    expect(fractionalInches(0.5)).toBe('1/2"');
    expect(fractionalInches(1.0625)).toBe('1-1/16"');
  });
  it('falls back to decimals for values off the sixteenth grid', () => {
    expect(fractionalInches(1.23)).toBe('1.23"');
  });
  it('inch-series thicknesses stored in mm come back as fractions (1 in = 25.4 mm exactly)', () => {
    const f = formatter({ unitSystem: 'US', thicknessSeries: 'inch' });
    expect(f.thickness(38.1)).toBe('1-1/2"');
    expect(f.thickness(9.525)).toBe('3/8"');
    expect(f.thickness(0)).toBe('bare');
    // an SI project using the inch series still shows the inch sizes
    expect(formatter({ unitSystem: 'SI', thicknessSeries: 'inch' }).thickness(63.5)).toBe('2-1/2"');
    expect(formatter({ unitSystem: 'SI' }).thickness(165.10000000000002)).toBe('165.1 mm');
  });
});

describe('unit conversions against exact factors (NIST SP 811, Appendix B)', () => {
  // Exact by definition: 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 Btu(IT) = 1055.05585262 J, 1 lb = 0.45359237 kg.
  it('lengths and temperatures', () => {
    expect(convert.mmToIn(25.4)).toBeCloseTo(1, 14);
    expect(convert.mToFt(0.3048)).toBeCloseTo(1, 14);
    expect(convert.cToF(100)).toBe(212);
    expect(convert.cToF(-40)).toBe(-40);
    expect(convert.fToC(32)).toBe(0);
    expect(convert.kToDeltaF(5)).toBe(9);
    expect(convert.m2ToFt2(1)).toBeCloseTo(10.763910417, 8); // 1 / 0.3048² [X]
  });
  it('heat flow per length and area', () => {
    // NIST SP 811 B.9: 1 Btu(IT)/(h·ft²) = 3.154591 W/m² [R]
    expect(convert.btuPerHFt2ToWPerM2(1)).toBeCloseTo(3.154591, 6);
    // 1 Btu(IT)/(h·ft) = 1055.05585262 / (3600 × 0.3048) W/m = 0.9615193 W/m [X]
    expect(convert.btuPerHFtToWPerM(1)).toBeCloseTo(0.9615193, 6);
    expect(convert.wPerMToBtuPerHFt(convert.btuPerHFtToWPerM(7.5))).toBeCloseTo(7.5, 12);
    // NIST SP 811 B.9: 1 Btu(IT)/h = 0.2930711 W [R]
    expect(convert.wToBtuPerH(0.2930711)).toBeCloseTo(1, 6);
  });
  it('conductivity, coefficients, energy, mass, pressure', () => {
    // NIST SP 811 B.9: 1 Btu(IT)·in/(h·ft²·°F) = 0.1442279 W/(m·K) [R]
    expect(convert.wPerMKToBtuInPerHFt2F(0.1442279)).toBeCloseTo(1, 6);
    // NIST SP 811 B.9: 1 Btu(IT)/(h·ft²·°F) = 5.678263 W/(m²·K) [R]
    expect(convert.wPerM2KToBtuPerHFt2F(5.678263)).toBeCloseTo(1, 6);
    // 1 MWh = 3.6e9 J = 3.412142 MMBtu(IT) [X]
    expect(convert.mwhToMMBtu(1)).toBeCloseTo(3.412142, 6);
    expect(convert.kgToLb(0.45359237)).toBeCloseTo(1, 14);
    // NIST SP 811 B.9: 1 psi = 6894.757 Pa [R]
    expect(convert.barToPsi(1)).toBeCloseTo(14.50377, 5);
  });
});

describe('the formatter', () => {
  const us = formatter({ unitSystem: 'US', thicknessSeries: 'inch', currency: 'USD' });
  const si = formatter({ unitSystem: 'SI', currency: 'EUR' });
  it('writes temperatures, losses and lengths with their units', () => {
    expect(si.temp(86.94)).toBe('86.9 °C');
    expect(us.temp(60)).toBe('140.0 °F');
    expect(us.tempDelta(-2)).toBe('-3.6 °F');
    expect(si.tempDelta(3.21)).toBe('+3.2 K');
    expect(si.linearLoss(52.345)).toBe('52.3 W/m');
    // 100 W/m × 3600 × 0.3048 / 1055.05585262 = 104.0 Btu/h·ft [X]
    expect(us.linearLoss(100)).toBe('104 Btu/h·ft');
    expect(us.arealLoss(100)).toBe('31.7 Btu/h·ft²');
    expect(si.heatFlowPerUnit(100, true)).toBe('100 W/m²');
    expect(us.length(30.48)).toBe('100 ft');
    expect(us.diameter(114.30000000000001)).toBe('4.5 in');
  });
  it('writes money in the project currency by its ISO code', () => {
    expect(money(1234.5, 'EUR')).toBe('EUR 1,235');
    expect(money(1234.5, 'USD', 2)).toBe('USD 1,234.50');
    expect(us.money(9800)).toBe('USD 9,800');
    expect(money(12, 'JPY')).toBe('JPY 12');
    // $12.40/m is $3.78/ft (× 0.3048) [X]
    expect(us.moneyPerLength(12.4)).toBe('USD 3.78/ft');
    expect(isCurrencyCode('NOK')).toBe(true);
    expect(isCurrencyCode('usd')).toBe(false);
    expect(isCurrencyCode('XX1')).toBe(false);
  });
});

describe('readable audit changes', () => {
  it('turns before/after records into sentences of changes', () => {
    expect(
      describeChanges(
        { thicknessMm: 25, source: 'recommended' },
        { thicknessMm: 40, source: 'manual', reason: 'spec' },
      ),
    ).toEqual(['thickness (mm): 25 → 40', 'source: recommended → manual', 'reason: spec']);
    expect(describeChanges(null, { disposition: 'guard', comment: null })).toEqual(['disposition: guard']);
    expect(describeChanges({ a: { bC: 1.10000000000002 } }, { a: { bC: 2 } })).toEqual([
      'a › b (°C): 1.1 → 2',
    ]);
  });
});

describe('engine messages in the project units', () => {
  it('rewrites SI quantities of a message', async () => {
    const { localizeMessage } = await import('@/lib/format');
    const us = formatter({ unitSystem: 'US', thicknessSeries: 'inch' });
    expect(localizeMessage('Surface ≤ 60 °C at 35 °C still air (metal jacket limit).', us)).toBe(
      'Surface ≤ 140.0 °F at 95.0 °F still air (metal jacket limit).',
    );
    expect(localizeMessage('Heat flow ≤ 50 W/m.', us)).toBe('Heat flow ≤ 52 Btu/h·ft.');
    expect(localizeMessage('dew point 20.0 °C + 2 K margin; 38.1 mm', us)).toBe(
      'dew point 68.0 °F + 3.6 °F margin; 1-1/2"',
    );
    expect(localizeMessage('Within 2 % of the minimum from 76.2 to 101.6 mm (optimum 101.6 mm).', us)).toBe(
      'Within 2 % of the minimum from 3" to 4" (optimum 4").',
    );
    expect(
      localizeMessage('Heat flow ≤ 165.10000000000002 W/m² over 60 °C', formatter({ unitSystem: 'SI' })),
    ).toBe('Heat flow ≤ 165.1 W/m² over 60 °C');
    expect(localizeMessage('U30: 12.5 kW designed', us)).toBe('U30: 42,652 Btu/h designed'); // 12.5 kW × 3412.142 Btu/h per kW = 42 651.8 [X]
  });
});

describe('the design-basis form in US units', () => {
  it('shows each field in its unit and a form saved unchanged comes back to the same SI basis', async () => {
    const { fieldKind, kindUnit, toFormValue, formDataToSi } = await import('@/lib/format/basis-units');
    const { DEFAULT_DESIGN_BASIS } = await import('@/lib/lines/design-basis');
    expect(fieldKind('conditions.personnel.outdoor.airC')).toBe('temp');
    expect(fieldKind('systems[2].toC')).toBe('temp');
    expect(fieldKind('dewPointMarginK')).toBe('tempDelta');
    expect(fieldKind('prices.labourByNps[0].perMPerLayer')).toBe('moneyPerM');
    expect(fieldKind('economics.energyPricePerKWh')).toBe('none');
    expect(kindUnit('wind', 'US')).toBe('mph');
    expect(toFormValue('temp', 'US', 60)).toBe(140);
    expect(toFormValue('wind', 'US', 5)).toBe(11.1847); // 5 / 0.44704 = 11.18468 mph (1 mph = 0.44704 m/s exactly)
    expect(toFormValue('moneyPerM3', 'US', 600)).toBe(16.9901); // 600 × 0.3048³ [X]
    const fd = new FormData();
    const walk = (o: unknown, path: string) => {
      if (typeof o === 'number') fd.append(path, String(toFormValue(fieldKind(path), 'US', o)));
      else if (Array.isArray(o)) for (const [i, x] of o.entries()) walk(x, `${path}[${i}]`);
      else if (o && typeof o === 'object')
        for (const [k, v] of Object.entries(o)) walk(v, path ? `${path}.${k}` : k);
    };
    walk(DEFAULT_DESIGN_BASIS, '');
    const back = formDataToSi(fd, 'US', DEFAULT_DESIGN_BASIS);
    for (const [k, v] of back.entries()) {
      const si = k
        .replace(/\[(\d+)\]/g, '.$1')
        .split('.')
        .reduce<unknown>((a, p) => (a as Record<string, unknown>)[p], DEFAULT_DESIGN_BASIS);
      expect([k, Number(v)]).toEqual([k, si]);
    }
    // A changed field is converted: 150 °F = 65.5556 °C.
    const one = new FormData();
    one.append('touchLimitMetalC', '150');
    expect(Number(formDataToSi(one, 'US', DEFAULT_DESIGN_BASIS).get('touchLimitMetalC'))).toBeCloseTo(
      65.5556,
      4,
    );
  });
});
