import { describe, expect, it } from 'vitest';
import { DEFAULT_TRACER_ALLOWANCES, heatTracingDuty, tracerLengthM, tracingDuty } from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS, designBasisSchema, type DesignBasis } from '@/lib/lines/design-basis';
import { lineTracing, tracingConditions, tracingOfSolved } from '@/lib/lines/tracing';
import { solveLine } from '@/lib/lines/solve-line';
import { parseTraced, type LineInput } from '@/lib/lines/validate';
import { suggestMapping } from '@/lib/lines/mapping';
import { TEMPLATE_HEADERS } from '@/lib/lines/template';
import { runRecommendCase, type RecommendResult } from '@/lib/lines/recommend-case';

const basisWith = (ht: Partial<DesignBasis['heatTracing']> = {}): DesignBasis =>
  designBasisSchema.parse({
    ...DEFAULT_DESIGN_BASIS,
    heatTracing: { ...DEFAULT_DESIGN_BASIS.heatTracing, ...ht },
  });

const pipe = (o: Partial<LineInput> = {}): LineInput => ({
  tag: 'FW-1',
  service: 'Fire water',
  area: 'North',
  geometry: 'horizontal-pipe',
  nps: '4',
  outsideDiameterMm: 114.3,
  lengthM: 80,
  surfaceAreaM2: null,
  heightM: null,
  normalTempC: 12,
  maxTempC: null,
  steamPressureBarG: null,
  flowKgPerS: null,
  fluidCpKJPerKgK: null,
  elbows: 6,
  tees: 2,
  valves: 3,
  flanges: 4,
  purposes: ['freezeProtection'],
  outdoor: true,
  accessible: true,
  accessHeightM: null,
  jacketId: null,
  notes: '',
  heatTraced: false,
  ...o,
});

describe('heat-tracing duty (IEEE 515 / IEC/IEEE 60079-30-2 sizing basis) [X hand calculation]', () => {
  it('required W = SF · (q′·L + fittings); per metre = that ÷ L', () => {
    // 12 W/m over 80 m plus 96 W of fittings, safety factor 1.2: 1.2 × (960 + 96) = 1267.2 W, 15.84 W/m.
    const d = tracingDuty({ heatLossWPerM: 12, fittingsW: 96, lengthM: 80, safetyFactor: 1.2 });
    expect(d.requiredW).toBeCloseTo(1267.2, 9);
    expect(d.requiredWPerM).toBeCloseTo(15.84, 9);
    // The same as the CLI's heatTracingDuty with the fittings as 8 m of insulated pipe (8 × 12 = 96 W).
    expect(
      heatTracingDuty({ heatLossWPerM: 12, safetyFactor: 1.2, fittingsExtraM: 8, lengthM: 80 }).requiredWPerM,
    ).toBeCloseTo(d.requiredWPerM, 9);
    // A pipe that gains heat needs no tracer.
    expect(tracingDuty({ heatLossWPerM: -3, fittingsW: 0, lengthM: 10, safetyFactor: 1.2 }).requiredW).toBe(
      0,
    );
  });

  it('tracer length = run + allowance per fitting and support (common practice allowances)', () => {
    const a = DEFAULT_TRACER_ALLOWANCES;
    expect(
      tracerLengthM({
        lengthM: 80,
        counts: { elbows: 6, tees: 2, valves: 3, flangePairs: 4, supportsPerM: 0.25 },
      }),
    ).toBeCloseTo(80 + 6 * a.elbowM + 2 * a.teeM + 3 * a.valveM + 4 * a.flangePairM + 20 * a.supportM, 12);
    // With the defaults: 80 + 1.8 + 0.6 + 3 + 1.2 + 6 = 92.6 m.
    expect(
      tracerLengthM({
        lengthM: 80,
        counts: { elbows: 6, tees: 2, valves: 3, flangePairs: 4, supportsPerM: 0.25 },
      }),
    ).toBeCloseTo(92.6, 9);
  });
});

describe('which lines are traced, and under which conditions', () => {
  it('the line-list flag traces a pipe; freeze-protected and process lines only when the project says so', () => {
    const off = basisWith();
    expect(tracingConditions(off, pipe())).toBeNull();
    expect(tracingConditions(off, pipe({ heatTraced: true }))!.reason).toBe('line-list');
    const on = basisWith({ traceFreezeProtection: true, traceProcessControl: true });
    expect(tracingConditions(on, pipe())!.reason).toBe('freeze-protection');
    const proc = tracingConditions(
      on,
      pipe({ purposes: ['processControl', 'heatConservation'], normalTempC: 140 }),
    )!;
    expect(proc.reason).toBe('process-control');
    expect(proc.maintainC).toBe(140); // a process line holds its normal temperature
    expect(tracingConditions(on, pipe({ geometry: 'vessel' }))).toBeNull(); // vessels are not sized here
  });

  it('blank ambient and wind take the freeze condition set; indoor lines see at least 5 °C and still air', () => {
    const b = basisWith({ traceFreezeProtection: true });
    const out = tracingConditions(b, pipe())!;
    expect(out.maintainC).toBe(5);
    expect(out.airC).toBe(b.conditions.freeze.airC);
    expect(out.windMs).toBe(b.conditions.freeze.windMs);
    const own = tracingConditions(
      basisWith({ traceFreezeProtection: true, minAmbientC: -25, windMs: 12 }),
      pipe(),
    )!;
    expect([own.airC, own.windMs]).toEqual([-25, 12]);
    const indoor = tracingConditions(b, pipe({ outdoor: false }))!;
    expect([indoor.airC, indoor.windMs]).toEqual([Math.max(b.conditions.freeze.airC, 5), 0]);
  });

  it('a blank minimum ambient on the form is "not set", not 0 °C', () => {
    const parsed = designBasisSchema.parse({
      ...DEFAULT_DESIGN_BASIS,
      heatTracing: { ...DEFAULT_DESIGN_BASIS.heatTracing, minAmbientC: '', windMs: ' ' },
    });
    expect(parsed.heatTracing.minAmbientC).toBeUndefined();
    expect(parsed.heatTracing.windMs).toBeUndefined();
  });
});

describe('stored tracing → duty at the chosen thickness', () => {
  it('the solve stores each candidate’s loss at the maintain temperature; the duty is SF × (q′·L + fittings) [X]', () => {
    const basis = basisWith({ traceFreezeProtection: true, safetyFactor: 1.25 });
    const l = pipe();
    const s = solveLine(basis, l);
    const stored = tracingOfSolved(basis, l, s.system, s.recommendation.candidates)!;
    expect(stored.lossByMm.map(([mm]) => mm)).toEqual(s.recommendation.candidates.map((c) => c.totalMm));
    const mm = s.recommendation.recommendedMm!;
    const q = stored.lossByMm.find(([x]) => x === mm)![1];
    const bare = stored.lossByMm[0][1];
    expect(bare).toBeGreaterThan(q * 3); // bare pipe at 5 °C in the freeze wind loses far more
    const t = lineTracing(basis, l, stored, mm)!;
    // Hand calculation: fittings at the maintain temperature as equivalent lengths of insulated pipe.
    const f = basis.fittings;
    const eqM =
      l.elbows * f.elbowM +
      l.tees * f.teeM +
      l.valves * f.valveM +
      l.flanges * f.flangePairM +
      f.supportsPerM * l.lengthM! * f.supportM;
    expect(t.fittingsW).toBeCloseTo(eqM * q, 9);
    expect(t.requiredW).toBeCloseTo(1.25 * (q * 80 + eqM * q), 9);
    expect(t.requiredWPerM).toBeCloseTo(t.requiredW / 80, 12);
    // The same pipe through the calculation API (CLI) at the same thickness and conditions.
    const api = runRecommendCase({
      id: 'x',
      geometry: 'horizontal-pipe',
      nps: '4',
      normalTempC: 12,
      purposes: ['freezeProtection'],
      lengthM: 80,
      thicknessMm: mm,
      heatTracing: {
        maintainTempC: 5,
        minAmbientC: basis.conditions.freeze.airC,
        windMs: basis.conditions.freeze.windMs,
        safetyFactor: 1.25,
      },
    }) as RecommendResult;
    expect(api.heatTracing!.heatLossWPerM).toBeCloseTo(q, 6);
  });
});

describe('the heat-tracing column of a line list', () => {
  it('reads yes/no words in the import languages and tracing words [X]', () => {
    for (const w of ['yes', 'Ja', 'oui', 'sí', 'X', 'ET', 'HT', 'traced', 'beheizt', 'Tracé', 'electric'])
      expect(parseTraced(w), w).toBe(true);
    for (const w of ['no', 'Nein', 'non', 'nee', '-', 'none', 'ohne', 'untraced'])
      expect(parseTraced(w), w).toBe(false);
    expect(parseTraced('steam maybe')).toBeNull();
  });

  it('maps the column by its header in several languages, and the template carries it', () => {
    for (const h of ['Heat tracing', 'HT', 'ET', 'Begleitheizung', 'Traçage', 'Traceado', 'Traced'])
      expect(suggestMapping(['Tag', 'Normal temp (°C)', h]).columns.heatTraced, h).toBe(2);
    const m = suggestMapping([...TEMPLATE_HEADERS]);
    expect(m.columns.heatTraced).toBe(TEMPLATE_HEADERS.indexOf('Heat tracing'));
    expect(m.columns.notes).toBe(TEMPLATE_HEADERS.indexOf('Notes'));
  });
});
