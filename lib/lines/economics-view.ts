/**
 * What a cost engineer reads beside the economic thickness of one line: the optimum and its flat
 * range, payback and net present value of a thickness against bare and against the next thinner,
 * and how the optimum moves with labour and energy prices ±30 %. Computed from the same
 * recommendation the line's stored result came from (solveLine), so the numbers agree.
 */
import { capitalRecoveryFactor, levelisingFactor, type CandidateResult } from '@/lib/thermal';
import type { DesignBasis } from './design-basis';
import { solveLine } from './solve-line';
import type { LineInput } from './validate';

export interface Comparison {
  againstMm: number;
  extraInstalled: number;
  annualSaving: number;
  paybackYears: number | null;
  npv: number;
}

export interface EconomicsView {
  optimumMm: number | null;
  range: { fromMm: number; toMm: number } | null;
  flatRangePct: number;
  choice: 'optimum' | 'thinnest-within-range';
  /** The thickness compared (the chosen design, else the recommendation). */
  atMm: number | null;
  vsBare: Comparison | null;
  vsThinner: Comparison | null;
  sensitivity: { label: string; optimumMm: number | null }[];
  /** Per metre (pipes) or per m² (surfaces, vessels). */
  per: 'm' | 'm²';
}

function compare(a: CandidateResult, ref: CandidateResult, crf: number, lf: number): Comparison {
  const extra = (a.installedCost ?? 0) - (ref.installedCost ?? 0);
  const saving = (ref.energyCostPerYear ?? 0) - (a.energyCostPerYear ?? 0);
  // NPV over the life: levelised annual saving as a present value, less the extra first cost.
  const npv = (saving * lf) / crf - extra;
  return {
    againstMm: ref.totalMm,
    extraInstalled: extra,
    annualSaving: saving,
    paybackYears: saving > 0 ? extra / saving : null,
    npv,
  };
}

export function economicsView(
  basis: DesignBasis,
  line: LineInput,
  chosenMm: number | null,
): EconomicsView | null {
  if (!line.purposes.includes('heatConservation')) return null;
  const s = solveLine(basis, line);
  const r = s.recommendation;
  const e = r.outcomes.find((o) => o.id === 'economic');
  if (!e) return null;
  const econ = basis.economics;
  const crf = capitalRecoveryFactor(econ.discountRate, econ.lifeYears);
  const lf = levelisingFactor(econ.discountRate, econ.escalationRate, econ.lifeYears);
  const atMm = chosenMm ?? r.recommendedMm;
  const i = atMm === null ? -1 : r.candidates.findIndex((c) => c.totalMm === atMm);
  const at = i >= 0 ? r.candidates[i] : null;
  const sens = (label: string, b: DesignBasis) => ({
    label,
    optimumMm:
      solveLine(b, line).recommendation.outcomes.find((o) => o.id === 'economic')?.range?.optimumMm ?? null,
  });
  const scalePrices = (f: number): DesignBasis => ({
    ...basis,
    prices: {
      ...basis.prices,
      labourPerMPerLayer: basis.prices.labourPerMPerLayer * f,
      labourPerM2PerLayer: basis.prices.labourPerM2PerLayer * f,
      labourByNps: basis.prices.labourByNps?.map((b) => ({ ...b, perMPerLayer: b.perMPerLayer * f })),
      fittingItem: basis.prices.fittingItem && {
        elbow: basis.prices.fittingItem.elbow * f,
        tee: basis.prices.fittingItem.tee * f,
        valve: basis.prices.fittingItem.valve * f,
        flangePair: basis.prices.fittingItem.flangePair * f,
      },
    },
  });
  const scaleEnergy = (f: number): DesignBasis => ({
    ...basis,
    economics: {
      ...econ,
      energyPricePerKWh: econ.energyPricePerKWh * f,
      cooling: econ.cooling && {
        ...econ.cooling,
        electricityPricePerKWh: econ.cooling.electricityPricePerKWh * f,
      },
    },
  });
  return {
    optimumMm: e.range?.optimumMm ?? e.requiredMm,
    range: e.range ? { fromMm: e.range.fromMm, toMm: e.range.toMm } : null,
    flatRangePct: econ.flatRangePct ?? 2,
    choice: econ.economicChoice ?? 'optimum',
    atMm,
    vsBare: at && i > 0 ? compare(at, r.candidates[0], crf, lf) : null,
    vsThinner: at && i > 0 ? compare(at, r.candidates[i - 1], crf, lf) : null,
    sensitivity: [
      sens('Labour −30 %', scalePrices(0.7)),
      sens('Labour +30 %', scalePrices(1.3)),
      sens('Energy price −30 %', scaleEnergy(0.7)),
      sens('Energy price +30 %', scaleEnergy(1.3)),
    ],
    per: s.perUnit === 'W/m' ? 'm' : 'm²',
  };
}
