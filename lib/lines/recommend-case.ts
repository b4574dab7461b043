/**
 * The recommendation for one case given as JSON — the batch front door (`npm run recommend`,
 * `POST /api/v1/recommend`) to the same code path the product uses for a line: the default design
 * basis fills whatever the case leaves out, `systemForLine` picks the material system, `criteriaFor`
 * the conditions, `recommendLine` decides. SI units throughout.
 */
import { z } from 'zod';
import {
  DEFAULT_CRITERIA,
  condensationLimit,
  describeIssues,
  fittingsHeatLoss,
  heatTracingDuty,
  materialById,
  pipeByNps,
  recommendLine,
  solveSteady,
  solveVessel,
  type Ambient,
  type ConditionSet,
  type Criteria,
  type CriterionId,
  type InsulationMaterial,
  type Jacket,
  type LineCase,
  type MaterialSystem,
  type Purpose,
  type Recommendation,
  compileConductivity,
  designConductivitySpec,
  touchLimitFor,
  screenCui,
  type CuiScreen,
} from '@/lib/thermal';
import { DEFAULT_DESIGN_BASIS } from './design-basis';
import { criteriaFor, systemForLine, vesselDiameterM } from './solve-line';

const num = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, { error: `${what} must be a finite number` });
const positive = (what: string) =>
  num(what).refine((v) => v > 0, { error: `${what} must be greater than 0` });
const temperature = (what: string) =>
  num(what).refine((v) => v > -273.15 && v < 2000, {
    error: `${what} must be above absolute zero and below 2000 °C`,
  });

const PURPOSES = [
  'heatConservation',
  'personnelProtection',
  'condensationControl',
  'processControl',
  'freezeProtection',
] as const;
export const RECOMMEND_GEOMETRIES = [
  'horizontal-pipe',
  'vertical-pipe',
  'horizontal-vessel',
  'vertical-vessel',
  'flat',
] as const;

const conditionSchema = z.object(
  {
    airC: temperature('airC'),
    windMs: num('windMs').refine((v) => v >= 0 && v <= 60, { error: 'windMs must be between 0 and 60' }),
    relativeHumidityPct: num('relativeHumidityPct')
      .refine((v) => v > 0 && v <= 100, { error: 'relativeHumidityPct must be above 0 and at most 100' })
      .optional(),
    surroundingsC: temperature('surroundingsC').optional(),
  },
  { error: 'a condition set must be an object { airC, windMs, relativeHumidityPct?, surroundingsC? }' },
);

const conductivitySchema = z.discriminatedUnion(
  'type',
  [
    z.object({ type: z.literal('linear'), a: num('a'), b: num('b') }),
    z.object({
      type: z.literal('table'),
      points: z
        .array(z.tuple([num('temperature'), positive('k')]), {
          error: 'points must be [[temperature °C, k], …]',
        })
        .min(1, { error: 'give at least one point' })
        .max(200, { error: 'a conductivity table may have at most 200 points' }),
    }),
  ],
  { error: 'conductivity.type must be "linear" or "table"' },
);

export const recommendCaseSchema = z
  .object(
    {
      id: z.union([z.string(), z.number()]).optional(),
      geometry: z.enum(RECOMMEND_GEOMETRIES, {
        error: `geometry must be one of ${RECOMMEND_GEOMETRIES.join(', ')}`,
      }),
      pipeOuterDiameterMm: positive('pipeOuterDiameterMm')
        .refine((v) => v <= 10000, { error: 'pipeOuterDiameterMm must be at most 10000' })
        .optional(),
      nps: z
        .union([z.string(), z.number()], {
          error: 'nps must be a nominal pipe size such as "2", "1-1/2" or 4',
        })
        .optional(),
      pipeWallMm: positive('pipeWallMm').optional(),
      heightM: positive('heightM')
        .refine((v) => v <= 500, { error: 'heightM must be at most 500' })
        .optional(),
      lengthM: positive('lengthM').optional(),
      surfaceAreaM2: positive('surfaceAreaM2').optional(),
      normalTempC: temperature('normalTempC'),
      maxTempC: temperature('maxTempC').optional(),
      purposes: z
        .array(z.enum(PURPOSES, { error: `each purpose must be one of ${PURPOSES.join(', ')}` }), {
          error: 'purposes must be an array',
        })
        .min(1, { error: 'give at least one purpose' }),
      accessible: z.boolean({ error: 'accessible must be true or false' }).optional(),
      outdoor: z.boolean({ error: 'outdoor must be true or false' }).optional(),
      thicknessMm: num('thicknessMm')
        .refine((v) => v >= 0 && v <= 1000, { error: 'thicknessMm must be between 0 and 1000' })
        .optional(),
      conditions: z
        .object(
          {
            heatLoss: conditionSchema.optional(),
            personnel: conditionSchema.optional(),
            condensation: conditionSchema.optional(),
            freeze: conditionSchema.optional(),
          },
          { error: 'conditions must be an object with heatLoss, personnel, condensation and/or freeze' },
        )
        .optional(),
      touchLimitC: temperature('touchLimitC').optional(),
      touchContactSeconds: num('touchContactSeconds')
        .refine((v) => v >= 1 && v <= 28800, {
          error: 'touchContactSeconds must be between 1 and 28800 (8 h)',
        })
        .optional(),
      dewPointMarginK: num('dewPointMarginK')
        .refine((v) => v >= 0 && v <= 20, { error: 'dewPointMarginK must be between 0 and 20' })
        .optional(),
      freeze: z
        .object(
          {
            initialWaterTempC: temperature('freeze.initialWaterTempC')
              .refine((v) => v > 0 && v <= 90, {
                error: 'freeze.initialWaterTempC must be above 0 and at most 90 °C',
              })
              .optional(),
            requiredHours: positive('freeze.requiredHours').optional(),
            iceFractionPct: num('freeze.iceFractionPct')
              .refine((v) => v >= 0 && v <= 100, { error: 'freeze.iceFractionPct must be between 0 and 100' })
              .optional(),
          },
          { error: 'freeze must be an object { initialWaterTempC, requiredHours, iceFractionPct }' },
        )
        .optional(),
      energyCode: z.literal('ashrae-90.1', { error: 'energyCode must be "ashrae-90.1"' }).optional(),
      heatTracing: z
        .object(
          {
            maintainTempC: temperature('heatTracing.maintainTempC'),
            minAmbientC: temperature('heatTracing.minAmbientC'),
            windMs: num('heatTracing.windMs')
              .refine((v) => v >= 0 && v <= 60, { error: 'heatTracing.windMs must be between 0 and 60' })
              .optional(),
            safetyFactor: num('heatTracing.safetyFactor')
              .refine((v) => v >= 1 && v <= 3, { error: 'heatTracing.safetyFactor must be between 1 and 3' })
              .optional(),
          },
          { error: 'heatTracing must be an object { maintainTempC, minAmbientC, windMs, safetyFactor }' },
        )
        .optional(),
      cui: z
        .object(
          {
            metals: z
              .array(
                z.enum(['carbon-steel', 'austenitic-stainless'], {
                  error: 'cui.metals: each must be "carbon-steel" or "austenitic-stainless"',
                }),
                { error: 'cui.metals must be an array' },
              )
              .min(1, { error: 'cui.metals: give at least one metal' })
              .optional(),
            idleTempC: temperature('cui.idleTempC').optional(),
            requireCoatingNote: z
              .boolean({ error: 'cui.requireCoatingNote must be true or false' })
              .optional(),
            requireChlorideFree: z
              .boolean({ error: 'cui.requireChlorideFree must be true or false' })
              .optional(),
          },
          {
            error: 'cui must be an object { metals?, idleTempC?, requireCoatingNote?, requireChlorideFree? }',
          },
        )
        .optional(),
      fittings: z
        .object(
          {
            elbows: num('fittings.elbows')
              .refine((v) => v >= 0, { error: 'fittings.elbows must be 0 or more' })
              .optional(),
            tees: num('fittings.tees')
              .refine((v) => v >= 0, { error: 'fittings.tees must be 0 or more' })
              .optional(),
            valves: num('fittings.valves')
              .refine((v) => v >= 0, { error: 'fittings.valves must be 0 or more' })
              .optional(),
            flangePairs: num('fittings.flangePairs')
              .refine((v) => v >= 0, { error: 'fittings.flangePairs must be 0 or more' })
              .optional(),
            supportsPerM: num('fittings.supportsPerM')
              .refine((v) => v >= 0 && v <= 10, { error: 'fittings.supportsPerM must be between 0 and 10' })
              .optional(),
            valvesBare: z.boolean({ error: 'fittings.valvesBare must be true or false' }).optional(),
          },
          {
            error:
              'fittings must be an object { elbows, tees, valves, flangePairs, supportsPerM?, valvesBare? }',
          },
        )
        .optional(),
      insulation: z
        .object(
          {
            materialId: z
              .string()
              .refine((id) => !!materialById(id), { error: 'materialId is not in the material library' })
              .optional(),
            conductivity: conductivitySchema.optional(),
            thicknessesMm: z
              .array(positive('thickness'), { error: 'thicknessesMm must be an array of millimetres' })
              .min(1, { error: 'give at least one thickness' })
              .max(100, { error: 'at most 100 thicknesses' })
              .optional(),
            surfaceEmittance: num('surfaceEmittance')
              .refine((v) => v >= 0 && v <= 1, { error: 'surfaceEmittance must be between 0 and 1' })
              .optional(),
            /** EN ISO 23993 conversion factors applied to the declared conductivity (each ≥ 1). */
            designFactors: z
              .object(
                {
                  ageing: num('insulation.designFactors.ageing')
                    .refine((v) => v >= 1 && v <= 3, {
                      error: 'insulation.designFactors.ageing must be between 1 and 3',
                    })
                    .optional(),
                  moisture: num('insulation.designFactors.moisture')
                    .refine((v) => v >= 1 && v <= 3, {
                      error: 'insulation.designFactors.moisture must be between 1 and 3',
                    })
                    .optional(),
                  installation: num('insulation.designFactors.installation')
                    .refine((v) => v >= 1 && v <= 3, {
                      error: 'insulation.designFactors.installation must be between 1 and 3',
                    })
                    .optional(),
                },
                { error: 'insulation.designFactors must be an object { ageing, moisture, installation }' },
              )
              .optional(),
          },
          { error: 'insulation must be an object' },
        )
        .optional(),
    },
    { error: 'a case must be a JSON object' },
  )
  .superRefine((c, ctx) => {
    const pipe = c.geometry.endsWith('pipe'),
      vessel = c.geometry.endsWith('vessel');
    if (pipe && c.pipeOuterDiameterMm === undefined && c.nps === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['pipeOuterDiameterMm'],
        message: 'a pipe needs pipeOuterDiameterMm or nps',
      });
    }
    if (pipe && c.pipeOuterDiameterMm === undefined && c.nps !== undefined && !pipeByNps(c.nps)) {
      ctx.addIssue({
        code: 'custom',
        path: ['nps'],
        message: `nps ${JSON.stringify(c.nps)} is not a nominal pipe size (ASME B36.10M)`,
      });
    }
    if (vessel) {
      const along = c.geometry === 'vertical-vessel' ? c.heightM : (c.lengthM ?? c.heightM);
      if (along === undefined)
        ctx.addIssue({
          code: 'custom',
          path: [c.geometry === 'vertical-vessel' ? 'heightM' : 'lengthM'],
          message: `a ${c.geometry} needs its ${c.geometry === 'vertical-vessel' ? 'heightM' : 'lengthM'}`,
        });
      if (c.pipeOuterDiameterMm === undefined && c.surfaceAreaM2 === undefined)
        ctx.addIssue({
          code: 'custom',
          path: ['pipeOuterDiameterMm'],
          message:
            'a vessel needs pipeOuterDiameterMm (its diameter) or surfaceAreaM2 (bare shell and heads)',
        });
    }
    if (c.insulation?.conductivity && !c.insulation.thicknessesMm && c.thicknessMm === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['insulation', 'thicknessesMm'],
        message:
          'with your own conductivity give the thicknesses to choose from (thicknessesMm) or one thicknessMm',
      });
    }
    if ((c.heatTracing || c.fittings) && !pipe) {
      ctx.addIssue({
        code: 'custom',
        path: [c.heatTracing ? 'heatTracing' : 'fittings'],
        message: `${c.heatTracing ? 'heatTracing' : 'fittings'} apply to pipes only`,
      });
    }
    if (c.insulation?.conductivity && c.insulation.materialId) {
      ctx.addIssue({
        code: 'custom',
        path: ['insulation'],
        message: 'give materialId or conductivity, not both',
      });
    }
  });

export type RecommendCase = z.input<typeof recommendCaseSchema>;

export interface CriterionResult {
  requiredMm: number | null;
  /** Surface temperature at requiredMm under this criterion's own conditions (null when none meets it). */
  surfaceTempC: number | null;
  message: string;
  /** With thicknessMm given: whether that thickness meets the criterion. */
  met?: boolean;
  limitC?: number;
  dewPointC?: number;
  frostPoint?: boolean;
  limitWPerM?: number;
  limitWPerM2?: number;
  heatLossWPerM?: number;
  heatFluxWPerM2?: number;
  limitK?: number;
  hoursToFreezingPoint?: number;
  hoursToIceFraction?: number;
  iceFractionPct?: number;
  requiredHours?: number;
  tableMm?: number;
  minimumMm?: number;
  annualCostPerUnit?: number;
  /** Personnel: the surface class touched, the contact time (when the limit follows one) and the standard the limit follows. */
  touchSurface?: string;
  contactSeconds?: number;
  touchBasis?: string;
  /** The condition set the criterion is judged under (heatLoss, personnel, condensation, freeze; none for a table minimum). */
  conditionSet?: string;
  /** Vessels, surface criteria: the thickness each part needs by its own surface. */
  parts?: { shell: number | null; top: number | null; bottom: number | null };
}

export interface RecommendResult {
  id?: string | number;
  recommendedMm: number | null;
  /** The thickness evaluated when the case gave thicknessMm (then recommendedMm is the one Lagwise would choose). */
  evaluatedMm?: number;
  governing: CriterionId | null;
  layers: { materialId: string; thicknessMm: number }[];
  /** Pipes: W per metre of pipe; vessels and flat surfaces report heatFluxWPerM2 instead. */
  heatLossWPerM: number | null;
  heatFluxWPerM2?: number | null;
  /** The whole line or surface, W, where a length or area is known. */
  heatLossW?: number | null;
  /** At the recommended (or evaluated) thickness under the heat-loss conditions. */
  surfaceTempC: number | null;
  material: string;
  jacket: { name: string; emittance: number; metal: boolean };
  criteria: Partial<Record<CriterionId, CriterionResult>>;
  /** With heatTracing: the heat loss at the maintain temperature in the minimum ambient, and the tracer duty. */
  heatTracing?: { heatLossWPerM: number; requiredWPerM: number };
  /** With fittings: their extra heat flow (equivalent lengths, lib/thermal/fittings.ts) and the run's total, W. */
  fittingsHeatLossW?: number;
  totalHeatLossW?: number;
  /** Vessels: shell and heads decided per part (each meeting its criteria), with each part's heat flux and the vessel's mean flux at those thicknesses. */
  vesselParts?: Omit<NonNullable<Recommendation['vesselParts']>, 'candidateFluxesWPerM2'>;
  /** With cui: the corrosion-under-insulation screen (windows, their sources, what the specification then requires). */
  cui?: CuiScreen;
  unmet: CriterionId[];
  warnings: string[];
}

export type RecommendOutput = RecommendResult | { id?: string | number; error: string };

const merge = (base: ConditionSet, over?: Partial<ConditionSet>): ConditionSet =>
  over ? { ...base, ...over } : base;

/** The case → the engine's line, material system and criteria. */
function prepare(c: z.output<typeof recommendCaseSchema>) {
  const basis = DEFAULT_DESIGN_BASIS;
  const outdoor = c.outdoor ?? true;
  const base = {
    normalTempC: c.normalTempC,
    maxTempC: c.maxTempC,
    purposes: c.purposes as Purpose[],
    accessible: c.accessible ?? true,
    pipeWallMm: c.pipeWallMm,
  };
  let line: LineCase;
  let engineGeometry: 'pipe' | 'vessel' | 'flat';
  if (c.geometry === 'horizontal-pipe' || c.geometry === 'vertical-pipe') {
    const od = c.pipeOuterDiameterMm ?? pipeByNps(c.nps!)!.outsideDiameterMm;
    line = {
      ...base,
      geometry: c.geometry,
      pipeOuterDiameterMm: od,
      heightM: c.heightM ?? 6,
      lengthM: c.lengthM ?? 1,
    };
    engineGeometry = 'pipe';
  } else if (c.geometry === 'flat') {
    line = { ...base, geometry: 'vertical-wall', heightM: c.heightM ?? 2, areaM2: c.surfaceAreaM2 ?? 1 };
    engineGeometry = 'flat';
  } else {
    const horizontal = c.geometry === 'horizontal-vessel';
    const along = horizontal ? (c.lengthM ?? c.heightM)! : c.heightM!;
    const D =
      c.pipeOuterDiameterMm !== undefined
        ? c.pipeOuterDiameterMm / 1000
        : vesselDiameterM(c.surfaceAreaM2!, along);
    line = {
      ...base,
      geometry: 'vessel',
      vesselOrientation: horizontal ? 'horizontal' : 'vertical',
      pipeOuterDiameterMm: D * 1000,
      heightM: along,
    };
    engineGeometry = 'vessel';
  }

  const crit0 = criteriaFor(basis, outdoor);
  const cond = c.conditions ?? {};
  const crit: Criteria = {
    ...crit0,
    conditions: {
      heatLoss: merge(crit0.conditions.heatLoss, cond.heatLoss),
      personnel: merge(crit0.conditions.personnel, cond.personnel),
      condensation: merge(crit0.conditions.condensation, cond.condensation),
      freeze: merge(crit0.conditions.freeze, cond.freeze),
    },
    freeze: { ...crit0.freeze!, ...(c.freeze ?? {}) },
    energyCode: c.energyCode,
    // The documented batch defaults stay 60 °C metal / 65 °C non-metal; a case's touchContactSeconds
    // makes the limit follow the surface (ISO 13732-1), a touchLimitC fixes it for every surface.
    touchLimitMetalC: c.touchLimitC ?? DEFAULT_CRITERIA.touchLimitMetalC,
    touchLimitNonMetalC: c.touchLimitC ?? DEFAULT_CRITERIA.touchLimitNonMetalC,
    touchContactSeconds: c.touchLimitC === undefined ? c.touchContactSeconds : undefined,
    dewPointMarginK: c.dewPointMarginK ?? crit0.dewPointMarginK,
  };

  const band = systemForLine(basis, {
    normalTempC: c.normalTempC,
    jacketId: null,
    geometry: engineGeometry === 'pipe' ? 'horizontal-pipe' : engineGeometry === 'vessel' ? 'vessel' : 'flat',
  });
  const ins = c.insulation;
  let outer: InsulationMaterial = band.outer;
  let inner = band.inner;
  if (ins?.materialId) {
    outer = materialById(ins.materialId)!;
    inner = undefined;
  }
  if (ins?.conductivity) {
    outer = {
      ...band.outer,
      id: 'case-material',
      name: "the case's insulation",
      conductivity: ins.conductivity as InsulationMaterial['conductivity'],
      minServiceC: -273,
      maxServiceC: 2000,
    };
    inner = undefined;
  }
  if (ins?.designFactors) {
    const f = {
      ageing: ins.designFactors.ageing ?? 1,
      moisture: ins.designFactors.moisture ?? 1,
      installation: ins.designFactors.installation ?? 1,
      source: 'the case',
    };
    outer = { ...outer, designFactors: f };
    if (inner) inner = { ...inner, designFactors: f };
  }
  let jacket: Jacket = band.jacket;
  if (ins?.surfaceEmittance !== undefined) {
    // A given emittance replaces the jacket; low emittance means bright metal (touch limit for metal).
    jacket = {
      id: 'case-jacket',
      name: `surface of emittance ${ins.surfaceEmittance}`,
      emittance: ins.surfaceEmittance,
      metal: ins.surfaceEmittance <= 0.5,
      source: 'the case',
    };
  }
  // Thicknesses: the case's totals (each one layer), or the material's series; a thickness to evaluate is added.
  let thicknesses = ins?.thicknessesMm;
  if (c.thicknessMm !== undefined && c.thicknessMm > 0) {
    const seriesTotals = thicknesses ?? null;
    if (!seriesTotals?.includes(c.thicknessMm)) {
      thicknesses = [...new Set([...(seriesTotals ?? defaultTotals(outer, inner, c, band)), c.thicknessMm])];
    }
  }
  const system: MaterialSystem = thicknesses
    ? {
        outer,
        inner,
        jacket,
        series: {
          thicknessesMm: thicknesses,
          maxLayerMm: Math.max(...thicknesses),
          maxLayers: 1,
          maxTotalMm: Math.max(...thicknesses),
        },
      }
    : { outer, inner, jacket, series: band.series };
  return { line, crit, system, engineGeometry };
}

/** The totals the material's series offers (how the product would build them). */
function defaultTotals(
  outer: InsulationMaterial,
  inner: InsulationMaterial | undefined,
  c: z.output<typeof recommendCaseSchema>,
  band: MaterialSystem,
): number[] {
  const probe = recommendLine(
    {
      geometry: 'horizontal-pipe',
      pipeOuterDiameterMm: 60.3,
      normalTempC: c.normalTempC,
      maxTempC: c.maxTempC,
      purposes: [],
    },
    { outer, inner, jacket: band.jacket, series: band.series },
    criteriaFor(DEFAULT_DESIGN_BASIS, true),
  );
  return probe.candidates.map((x) => x.totalMm).filter((t) => t > 0);
}

/** Surface temperature and heat flow of a given build under one condition set (vessels: the worst part, mean flux). */
export function solveAt(
  line: LineCase,
  system: MaterialSystem,
  layers: { materialId: string; thicknessMm: number }[],
  processC: number,
  cs: ConditionSet,
): { surfaceC: number; heatFlow: number } {
  const bare = layers.length === 0;
  const ambient: Ambient = {
    airC: cs.airC,
    surroundingsC: cs.surroundingsC ?? cs.airC,
    windMs: cs.windMs,
    emittance: bare ? 0.8 : system.jacket.emittance,
  };
  const solid = layers.map((l) => {
    const m =
      l.materialId === system.outer.id
        ? system.outer
        : l.materialId === system.inner?.id
          ? system.inner!
          : materialById(l.materialId)!;
    return {
      thicknessM: l.thicknessMm / 1000,
      conductivity: compileConductivity(designConductivitySpec(m)),
      name: m.name,
      minServiceC: m.minServiceC,
      maxServiceC: m.maxServiceC,
    };
  });
  const D = (line.pipeOuterDiameterMm ?? 0) / 1000;
  if (line.geometry === 'vessel') {
    const v = solveVessel({
      diameterM: D,
      shellHeightM: line.heightM ?? 1,
      processC,
      ambient,
      layers: solid,
      horizontal: line.vesselOrientation === 'horizontal',
    });
    return { surfaceC: v.worstSurfaceC, heatFlow: v.meanFluxWPerM2 };
  }
  const r = solveSteady({
    geometry: line.geometry,
    pipeOuterDiameterM: D,
    heightM: line.heightM ?? 1,
    characteristicLengthM: line.characteristicLengthM ?? 1,
    processC,
    ambient,
    layers: solid,
  });
  return { surfaceC: r.surfaceC, heatFlow: r.heatFlow };
}

function criteriaOf(
  r: Recommendation,
  line: LineCase,
  system: MaterialSystem,
  crit: Criteria,
  evaluatedMm: number | undefined,
  pipe: boolean,
): Partial<Record<CriterionId, CriterionResult>> {
  const out: Partial<Record<CriterionId, CriterionResult>> = {};
  const at = (mm: number | null) => (mm === null ? undefined : r.candidates.find((x) => x.totalMm === mm));
  for (const o of r.outcomes) {
    const cand = at(o.requiredMm);
    const res: CriterionResult = { requiredMm: o.requiredMm, surfaceTempC: null, message: o.message };
    if (o.conditionSet) res.conditionSet = o.conditionSet;
    if (o.parts) res.parts = o.parts;
    if (evaluatedMm !== undefined) res.met = o.requiredMm !== null && evaluatedMm >= o.requiredMm;
    switch (o.id) {
      case 'personnel': {
        const tl = touchLimitFor(crit, system.jacket);
        res.limitC = tl.limitC;
        res.touchSurface = tl.surface;
        res.touchBasis = tl.basis;
        if (Number.isFinite(tl.contactSeconds)) res.contactSeconds = tl.contactSeconds;
        res.surfaceTempC = cand?.personnel?.surfaceC ?? null;
        break;
      }
      case 'condensation': {
        const th = condensationLimit(crit.conditions.condensation, crit.dewPointMarginK);
        res.dewPointC = th.valueC;
        res.frostPoint = th.basis !== 'dew point';
        res.limitC = th.needC;
        res.surfaceTempC = cand?.condensation?.surfaceC ?? null;
        break;
      }
      case 'freeze': {
        res.hoursToFreezingPoint = o.hours;
        res.requiredHours = crit.freeze?.requiredHours;
        res.iceFractionPct = crit.freeze?.iceFractionPct ?? 0;
        res.hoursToIceFraction = o.iceHours ?? o.hours;
        res.surfaceTempC = cand
          ? solveAt(line, system, cand.layers, crit.freeze?.initialWaterTempC ?? 10, crit.conditions.freeze)
              .surfaceC
          : null;
        break;
      }
      case 'energyCode': {
        res.tableMm = o.tableMm;
        res.minimumMm = o.minimumMm;
        res.surfaceTempC = cand?.heatLoss.surfaceC ?? null;
        break;
      }
      default: {
        res.surfaceTempC = cand?.heatLoss.surfaceC ?? null;
        if (cand) {
          if (pipe) res.heatLossWPerM = cand.heatLoss.heatFlow;
          else res.heatFluxWPerM2 = cand.heatLoss.heatFlow;
        }
        if (o.id === 'heatLossLimit') {
          if (pipe) res.limitWPerM = crit.heatLossLimitWPerM;
          else res.limitWPerM2 = crit.heatLossLimitWPerM2;
        }
        if (o.id === 'processDrop') res.limitK = crit.maxProcessDropK;
        if (o.id === 'economic' && cand?.annualCost !== undefined) res.annualCostPerUnit = cand.annualCost;
      }
    }
    out[o.id] = res;
  }
  return out;
}

/** One case; never throws — an invalid case comes back as { id, error } naming the field. */
export function runRecommendCase(input: unknown): RecommendOutput {
  const id =
    input && typeof input === 'object' && 'id' in input ? (input as { id?: string | number }).id : undefined;
  const parsed = recommendCaseSchema.safeParse(input);
  if (!parsed.success) return { id, error: describeIssues(parsed.error) };
  const c = parsed.data;
  try {
    const { line, crit, system, engineGeometry } = prepare(c);
    const r = recommendLine(line, system, crit);
    const pipe = engineGeometry === 'pipe';
    const shownMm = c.thicknessMm ?? r.recommendedMm;
    const shown = shownMm === null ? undefined : r.candidates.find((x) => x.totalMm === shownMm);
    const flow = shown?.heatLoss.heatFlow ?? null;
    const extent = pipe
      ? (c.lengthM ?? null)
      : engineGeometry === 'vessel'
        ? (c.surfaceAreaM2 ??
          Math.PI * (line.pipeOuterDiameterMm! / 1000) * line.heightM! +
            (Math.PI * (line.pipeOuterDiameterMm! / 1000) ** 2) / 2)
        : (c.surfaceAreaM2 ?? null);
    const warnings = [...r.warnings];
    const condensationTh = condensationLimit(crit.conditions.condensation, crit.dewPointMarginK);
    if (r.outcomes.some((o) => o.id === 'condensation') && condensationTh.basis !== 'dew point')
      warnings.push(
        `The condensation limit is the frost point (over ice), ${condensationTh.valueC.toFixed(1)} °C, because it is below 0 °C.`,
      );
    let tracing: RecommendResult['heatTracing'];
    if (c.heatTracing && pipe) {
      const ht = c.heatTracing;
      const q = solveAt(line, system, shown?.layers ?? [], ht.maintainTempC, {
        airC: ht.minAmbientC,
        windMs: ht.windMs ?? crit.conditions.freeze.windMs,
      }).heatFlow;
      const extra = c.fittings
        ? fittingsHeatLoss({ counts: c.fittings, lengthM: c.lengthM ?? 1, insulatedWPerM: 1, bareWPerM: 0 })
            .insulatedEquivalentM
        : 0;
      tracing = heatTracingDuty({
        heatLossWPerM: q,
        safetyFactor: ht.safetyFactor,
        fittingsExtraM: extra,
        lengthM: c.lengthM,
      });
    }
    let fittingsW: number | undefined, totalW: number | undefined;
    if (c.fittings && pipe && flow !== null) {
      const run = c.lengthM ?? 1;
      if (c.lengthM === undefined)
        warnings.push('No lengthM: the fittings are added to 1 m of straight run.');
      fittingsW = fittingsHeatLoss({
        counts: c.fittings,
        lengthM: run,
        insulatedWPerM: flow,
        bareWPerM: r.candidates[0].heatLoss.heatFlow,
      }).fittingsW;
      totalW = flow * run + fittingsW;
    }
    return {
      id,
      recommendedMm: r.recommendedMm,
      ...(c.thicknessMm !== undefined ? { evaluatedMm: c.thicknessMm } : {}),
      governing: r.governing,
      layers: shown?.layers ?? [],
      heatLossWPerM: pipe ? flow : null,
      ...(pipe ? {} : { heatFluxWPerM2: flow }),
      heatLossW: flow !== null && extent !== null ? flow * extent : null,
      surfaceTempC: shown?.heatLoss.surfaceC ?? null,
      material:
        system.inner && shown?.layers.some((l) => l.materialId === system.inner!.id)
          ? `${system.inner.name} inside ${system.outer.name}`
          : system.outer.name,
      jacket: { name: system.jacket.name, emittance: system.jacket.emittance, metal: system.jacket.metal },
      criteria: criteriaOf(r, line, system, crit, c.thicknessMm, pipe),
      ...(tracing ? { heatTracing: tracing } : {}),
      ...(fittingsW !== undefined ? { fittingsHeatLossW: fittingsW, totalHeatLossW: totalW } : {}),
      // The per-candidate part fluxes are for the stored result (the budget), not for the answer.
      ...(r.vesselParts ? { vesselParts: withoutCandidateFluxes(r.vesselParts) } : {}),
      ...(c.cui
        ? {
            cui: screenCui(
              { normalC: c.normalTempC, maxC: c.maxTempC, idleC: c.cui.idleTempC },
              {
                metals: c.cui.metals ?? ['carbon-steel'],
                screenIdle: c.cui.idleTempC !== undefined,
                requireCoatingNote: c.cui.requireCoatingNote ?? false,
                requireChlorideFree: c.cui.requireChlorideFree ?? false,
              },
            ),
          }
        : {}),
      unmet: r.unmet,
      warnings,
    };
  } catch (e) {
    return { id, error: `calculation failed: ${(e as Error).message}` };
  }
}

/** Relative CPU cost of a recommendation case (about 35 solves; a vessel three surfaces each). */
export function recommendCaseCost(input: unknown): number {
  const g = (input as { geometry?: unknown } | null)?.geometry;
  return typeof g === 'string' && g.endsWith('vessel') ? 3 : 1;
}

function withoutCandidateFluxes(v: NonNullable<Recommendation['vesselParts']>) {
  const { candidateFluxesWPerM2: _, ...rest } = v;
  return rest;
}
