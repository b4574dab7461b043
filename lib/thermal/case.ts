import { z } from 'zod';
import { designConductivitySpec } from './design-conductivity';
import { compileConductivity } from './conductivity';
import { condensationThresholdC, dewPointC } from './psychro';
import { solveSteady } from './solve';
import { solveVessel } from './vessel';
import { GEOMETRIES, isPipe } from './surface';
import { materialById } from './materials';

/**
 * The calculation case of the CLI and of POST /api/v1/calc (SI units). Conductivity is either
 * linear, k = a + b·T (T in °C), or a table of (T °C, k) points, piecewise linear and constant
 * beyond its ends; `materialId` may name a library material instead.
 */
const positive = (what: string) =>
  z.number({ error: `${what} must be a number` }).positive({ error: `${what} must be greater than 0` });
const temperature = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .gt(-273.15, { error: `${what} must be above absolute zero` })
    .lt(2000, { error: `${what} must be below 2000 °C` });

/** A declared conductivity curve never needs more points than this; more only costs CPU. */
export const MAX_TABLE_POINTS = 200;

const conductivitySchema = z.discriminatedUnion(
  'type',
  [
    z.object({
      type: z.literal('linear'),
      a: z.number({ error: 'a must be a number' }),
      b: z.number({ error: 'b must be a number' }),
    }),
    z.object({
      type: z.literal('table'),
      points: z
        .array(z.tuple([z.number(), positive('k')]), { error: 'points must be [[temperature °C, k], …]' })
        .min(1, { error: 'give at least one point' })
        .max(MAX_TABLE_POINTS, { error: `a conductivity table may have at most ${MAX_TABLE_POINTS} points` }),
    }),
  ],
  { error: 'conductivity.type must be "linear" or "table"' },
);

const layerSchema = z
  .object({
    thicknessMm: positive('thicknessMm').max(2000, { error: 'thicknessMm must be at most 2000' }),
    conductivity: conductivitySchema.optional(),
    materialId: z.string().optional(),
    minServiceC: z.number().optional(),
    maxServiceC: z.number().optional(),
  })
  .refine((l) => !!l.conductivity !== !!l.materialId, {
    error: 'give either conductivity or materialId',
    path: ['conductivity'],
  })
  .refine((l) => !l.materialId || !!materialById(l.materialId), {
    error: 'unknown materialId',
    path: ['materialId'],
  });

export const calcCaseSchema = z
  .object({
    id: z.union([z.string(), z.number()]).optional(),
    geometry: z.enum([...GEOMETRIES, 'vessel'] as unknown as [string, ...string[]], {
      error: `geometry must be one of ${[...GEOMETRIES, 'vessel'].join(', ')}`,
    }),
    pipeOuterDiameterMm: positive('pipeOuterDiameterMm').max(10000).optional(),
    heightM: positive('heightM').max(500).optional(),
    characteristicLengthM: positive('characteristicLengthM').max(500).optional(),
    processTempC: temperature('processTempC'),
    ambientTempC: temperature('ambientTempC').gt(-90).lt(90),
    surroundingsTempC: temperature('surroundingsTempC').optional(),
    windSpeedMs: z
      .number({ error: 'windSpeedMs must be a number' })
      .min(0, { error: 'windSpeedMs must be 0 or more' })
      .max(60)
      .default(0),
    surfaceEmittance: z
      .number({ error: 'surfaceEmittance must be a number' })
      .min(0, { error: 'surfaceEmittance must be between 0 and 1' })
      .max(1, { error: 'surfaceEmittance must be between 0 and 1' }),
    relativeHumidityPct: z
      .number()
      .gt(0, { error: 'relativeHumidityPct must be above 0 and at most 100' })
      .max(100, { error: 'relativeHumidityPct must be above 0 and at most 100' })
      .optional(),
    surfaceCoefficientWPerM2K: positive('surfaceCoefficientWPerM2K').optional(),
    innerFilmCoefficientWPerM2K: positive('innerFilmCoefficientWPerM2K').optional(),
    layers: z
      .array(layerSchema, { error: 'layers must be an array (empty for a bare surface)' })
      .max(4, { error: 'at most 4 layers' }),
  })
  .superRefine((c, ctx) => {
    if ((isPipe(c.geometry as never) || c.geometry === 'vessel') && c.pipeOuterDiameterMm === undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['pipeOuterDiameterMm'],
        message: `pipeOuterDiameterMm is required for ${c.geometry === 'vessel' ? 'a vessel (its diameter)' : 'pipes'}`,
      });
    if (
      (c.geometry === 'vertical-pipe' || c.geometry === 'vertical-wall' || c.geometry === 'vessel') &&
      c.heightM === undefined
    )
      ctx.addIssue({ code: 'custom', path: ['heightM'], message: `heightM is required for ${c.geometry}` });
    c.layers.forEach((l, i) => {
      if (l.conductivity?.type === 'linear') {
        for (const T of [c.processTempC, c.ambientTempC, c.surroundingsTempC ?? c.ambientTempC]) {
          if (!(l.conductivity.a + l.conductivity.b * T > 0)) {
            ctx.addIssue({
              code: 'custom',
              path: ['layers', i, 'conductivity'],
              message: `k = a + b·T is not positive at ${T} °C`,
            });
            break;
          }
        }
      }
    });
  });
export type CalcCase = z.input<typeof calcCaseSchema>;

export interface CalcResult {
  id?: string | number;
  heatLossWPerM?: number;
  heatFluxWPerM2?: number;
  /** Vessels: total heat flow of shell and heads, W. */
  heatLossW?: number;
  surfaceTempC: number;
  interfaceTempsC: number[];
  convectiveCoefficientWPerM2K: number;
  radiativeCoefficientWPerM2K: number;
  dewPointC?: number;
  /** When the dew point is below 0 °C: the frost point (over ice), the temperature a cold surface must stay above. */
  frostPointC?: number;
  overallCoefficient: ReturnType<typeof solveSteady>['overall'];
  warnings: string[];
}

export type CalcOutput = CalcResult | { id?: string | number; error: string };

/** zod issues as "path: message; …" so the caller sees which field is wrong. */
/**
 * Relative CPU cost of one case, in units of a bare straight pipe (measured with bench-style loops:
 * each layer adds about one solve's worth of work, a 200-point table about as much as six more solves,
 * a vessel is three surfaces). The calculation API bounds a request by the sum, not only the count.
 */
export function caseCost(input: unknown): number {
  const c = (input ?? {}) as { geometry?: unknown; layers?: unknown };
  const layers = Array.isArray(c.layers) ? c.layers : [];
  let cost = 1 + layers.length;
  for (const l of layers) {
    const pts = (l as { conductivity?: { points?: unknown } })?.conductivity?.points;
    if (Array.isArray(pts)) cost += pts.length / 30;
  }
  return c.geometry === 'vessel' ? cost * 3 : cost;
}

export function describeIssues(e: z.ZodError): string {
  return e.issues.map((i) => `${i.path.length ? i.path.join('.') : '(case)'}: ${i.message}`).join('; ');
}

/** Dew point, and the frost point when the dew point is below 0 °C (moisture then deposits as ice). */
function moisture(airC: number, rh: number | undefined): { dewPointC?: number; frostPointC?: number } {
  if (rh === undefined) return {};
  const th = condensationThresholdC(airC, rh);
  return th.basis === 'frost point'
    ? { dewPointC: dewPointC(airC, rh), frostPointC: th.valueC }
    : { dewPointC: th.valueC };
}
function frostWarning(airC: number, rh: number | undefined): string[] {
  if (rh === undefined) return [];
  const th = condensationThresholdC(airC, rh);
  return th.basis === 'frost point'
    ? [
        `The dew point is below 0 °C: moisture deposits as frost, so a cold surface must stay above the frost point (over ice), ${th.valueC.toFixed(1)} °C (frostPointC), not the dew point.`,
      ]
    : [];
}

/** Runs one case; never throws — an invalid case comes back as { id, error }. */
export function runCase(input: unknown): CalcOutput {
  const id =
    input && typeof input === 'object' && 'id' in input ? (input as { id?: string | number }).id : undefined;
  const parsed = calcCaseSchema.safeParse(input);
  if (!parsed.success) return { id, error: describeIssues(parsed.error) };
  const c = parsed.data;
  try {
    const layers = c.layers.map((l, i) => {
      const m = l.materialId ? materialById(l.materialId)! : undefined;
      return {
        thicknessM: l.thicknessMm / 1000,
        conductivity: compileConductivity(m ? designConductivitySpec(m) : l.conductivity!),
        name: m?.name ?? `layer ${i + 1}`,
        minServiceC: l.minServiceC ?? m?.minServiceC,
        maxServiceC: l.maxServiceC ?? m?.maxServiceC,
      };
    });
    const ambient = {
      airC: c.ambientTempC,
      surroundingsC: c.surroundingsTempC ?? c.ambientTempC,
      windMs: c.windSpeedMs,
      emittance: c.surfaceEmittance,
      fixedCoefficientWPerM2K: c.surfaceCoefficientWPerM2K,
    };
    if (c.geometry === 'vessel') {
      const v = solveVessel({
        diameterM: c.pipeOuterDiameterMm! / 1000,
        shellHeightM: c.heightM!,
        processC: c.processTempC,
        ambient,
        layers,
      });
      return {
        id,
        heatLossW: v.totalW,
        heatFluxWPerM2: v.meanFluxWPerM2,
        surfaceTempC: v.worstSurfaceC,
        interfaceTempsC: v.shell.interfacesC,
        convectiveCoefficientWPerM2K: v.shell.convectiveWPerM2K,
        radiativeCoefficientWPerM2K: v.shell.radiativeWPerM2K,
        ...moisture(c.ambientTempC, c.relativeHumidityPct),
        overallCoefficient: v.shell.overall,
        warnings: [
          ...new Set([
            ...v.shell.warnings,
            ...v.top.warnings,
            ...v.bottom.warnings,
            ...frostWarning(c.ambientTempC, c.relativeHumidityPct),
          ]),
        ],
        parts: {
          shellWPerM: v.shell.heatFlow,
          topWPerM2: v.top.heatFlow,
          bottomWPerM2: v.bottom.heatFlow,
          areasM2: v.areasM2,
        },
      } as CalcResult;
    }
    const r = solveSteady({
      geometry: c.geometry as never,
      pipeOuterDiameterM: (c.pipeOuterDiameterMm ?? 0) / 1000,
      heightM: c.heightM ?? 1,
      characteristicLengthM: c.characteristicLengthM ?? 1,
      processC: c.processTempC,
      ambient: {
        airC: c.ambientTempC,
        surroundingsC: c.surroundingsTempC ?? c.ambientTempC,
        windMs: c.windSpeedMs,
        emittance: c.surfaceEmittance,
        fixedCoefficientWPerM2K: c.surfaceCoefficientWPerM2K,
      },
      layers,
      innerFilmWPerM2K: c.innerFilmCoefficientWPerM2K,
    });
    if (!Number.isFinite(r.heatFlow) || !Number.isFinite(r.surfaceC))
      return { id, error: 'the case has no physical solution (check conductivities and temperatures)' };
    const pipe = isPipe(c.geometry as never);
    return {
      id,
      ...(pipe ? { heatLossWPerM: r.heatFlow } : { heatFluxWPerM2: r.heatFlow }),
      surfaceTempC: r.surfaceC,
      interfaceTempsC: r.interfacesC,
      convectiveCoefficientWPerM2K: r.convectiveWPerM2K,
      radiativeCoefficientWPerM2K: r.radiativeWPerM2K,
      ...moisture(c.ambientTempC, c.relativeHumidityPct),
      overallCoefficient: r.overall,
      warnings: [...r.warnings, ...frostWarning(c.ambientTempC, c.relativeHumidityPct)],
    };
  } catch (e) {
    return { id, error: `calculation failed: ${(e as Error).message}` };
  }
}
