/** The heat-loss budget and its dashboard figures, summed here from the saved line results. */
import { vesselPartsHeatW } from '@/lib/lines/vessel-parts';
import { and, asc, eq, gt } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '@/db/client';
import { budgets, lineDesigns, lineResults, lines } from '@/db/schema';
import { AppError } from '@/lib/errors';
import { decodeCandidate } from '@/lib/lines/candidate-row';
import { lineFittingsW } from '@/lib/lines/fittings-heat';
import { getDesignBasis } from '@/lib/lines/basis-store';
import { isIncompleteLine } from '@/lib/lines/fields';
import { lineTracing } from '@/lib/lines/tracing';

export const budgetSchema = z
  .object({
    totalKW: z.coerce
      .number({ error: 'Total budget must be a number (kW)' })
      .refine(Number.isFinite, { error: 'Total budget must be a number (kW)' })
      .min(0, { error: 'Total budget cannot be negative' }),
    totalMWhPerYear: z.coerce
      .number({ error: 'Annual budget must be a number (MWh/yr)' })
      .refine(Number.isFinite, { error: 'Annual budget must be a number (MWh/yr)' })
      .min(0, { error: 'Annual budget cannot be negative' }),
    allocations: z.array(
      z.object({
        area: z.string().trim().min(1, { error: 'Name the area' }),
        kW: z.coerce
          .number({ error: 'Allocation must be a number (kW)' })
          .refine(Number.isFinite, { error: 'Allocation must be a number (kW)' })
          .min(0, { error: 'Allocation cannot be negative' }),
      }),
    ),
  })
  .superRefine((b, ctx) => {
    const seen = new Set<string>();
    b.allocations.forEach((a, i) => {
      if (seen.has(a.area))
        ctx.addIssue({
          code: 'custom',
          path: ['allocations', i, 'area'],
          message: `${a.area} is allocated twice`,
        });
      seen.add(a.area);
    });
    const sum = b.allocations.reduce((s, a) => s + a.kW, 0);
    if (sum > b.totalKW + 1e-9)
      ctx.addIssue({
        code: 'custom',
        path: ['allocations'],
        message: `Allocations add up to ${sum.toFixed(1)} kW, more than the ${b.totalKW} kW budget`,
      });
  });
export type Budget = z.output<typeof budgetSchema>;

export async function getBudget({ projectId }: { projectId: string }): Promise<Budget | null> {
  const [b] = await db.select().from(budgets).where(eq(budgets.projectId, projectId));
  return b
    ? {
        totalKW: b.totalKW,
        totalMWhPerYear: b.totalMWhPerYear,
        allocations: b.allocations,
      }
    : null;
}

export async function saveBudget({
  projectId,
  userId,
  budget,
}: {
  projectId: string;
  userId: string;
  budget: unknown;
}) {
  const r = budgetSchema.safeParse(budget);
  if (!r.success) {
    const fields: Record<string, string[]> = {};
    for (const i of r.error.issues) (fields[i.path.join('.') || 'budget'] ??= []).push(i.message);
    throw new AppError('invalid', Object.values(fields).flat().join('; '), fields);
  }
  await db
    .insert(budgets)
    .values({ projectId, ...r.data, updatedBy: userId })
    .onConflictDoUpdate({
      target: budgets.projectId,
      set: { ...r.data, updatedBy: userId, updatedAt: new Date() },
    });
  return r.data;
}

export type Policy = 'chosen' | 'recommended' | 'economic-plus-one';
export interface WhatIf {
  energyPricePerKWh?: number;
  hoursPerYear?: number;
  policy?: Policy;
}

/**
 * Dashboard figures: bare against designed heat loss (kW, MWh/yr, cost/yr, t CO₂/yr), per area
 * against the allocation, the top 20 lines. Designed = the chosen thickness where one is chosen,
 * else the recommendation (or per the what-if policy). Heat gains of cold lines are reported apart.
 */
const DASHBOARD_SLICE = 2_000;

export async function dashboard({ projectId, whatIf = {} }: { projectId: string; whatIf?: WhatIf }) {
  const { basis } = await getDesignBasis({ projectId });
  const econ = basis.economics;
  const price = whatIf.energyPricePerKWh ?? econ.energyPricePerKWh;
  const hours = whatIf.hoursPerYear ?? econ.hoursPerYear;
  const policy = whatIf.policy ?? 'chosen';
  // Read a slice of lines at a time (by id): every result's candidate table is needed, and held
  // all at once they were ~10 KB a line (500 MB for 50,000 lines) in the job worker.
  const slice = (after: string | null) =>
    db
      .select({
        id: lines.id,
        tag: lines.tag,
        area: lines.area,
        geometry: lines.geometry,
        lengthM: lines.lengthM,
        elbows: lines.elbows,
        tees: lines.tees,
        valves: lines.valves,
        flanges: lines.flanges,
        result: lineResults,
        chosenMm: lineDesigns.thicknessMm,
        chosenParts: lineDesigns.parts,
        surfaceAreaM2: lines.surfaceAreaM2,
        heightM: lines.heightM,
      })
      .from(lines)
      .innerJoin(lineResults, eq(lineResults.lineId, lines.id))
      .leftJoin(lineDesigns, eq(lineDesigns.lineId, lines.id))
      .where(and(eq(lines.projectId, projectId), after ? gt(lines.id, after) : undefined))
      .orderBy(asc(lines.id))
      .limit(DASHBOARD_SLICE);
  const perArea = new Map<string, { bareKW: number; designedKW: number }>();
  const perLine: {
    tag: string;
    area: string;
    designedKW: number;
    bareKW: number;
    fittingsKW: number;
    thicknessMm: number | null;
  }[] = [];
  // Heat tracing (IEEE 515 / IEC/IEEE 60079-30-2 sizing basis): electrical kW per area, cold lines included.
  const tracingByArea = new Map<string, { kW: number; lines: number; tracerM: number }>();
  let coldGainKW = 0,
    incompleteCount = 0,
    fittingsKW = 0,
    bareFittingsKW = 0;
  async function* everyLine() {
    for (let after: string | null = null; ; ) {
      const rows = await slice(after);
      yield* rows;
      if (rows.length < DASHBOARD_SLICE) return;
      after = rows[rows.length - 1].id;
    }
  }
  for await (const row of everyLine()) {
    const { tag, area, geometry, lengthM, elbows, tees, valves, flanges, result, chosenMm } = row;
    // A pipe without its length yet is solved per metre but counts in no total.
    if (isIncompleteLine({ geometry, lengthM })) {
      incompleteCount++;
      continue;
    }
    const cands = result.candidates.map(decodeCandidate);
    if (!cands.length) continue;
    const bare = cands[0];
    const extent = bare.heatFlow !== 0 ? result.bareHeatW / bare.heatFlow : 0; // metres of pipe, or m² of surface
    const econMm = result.outcomes.find((o) => o.id === 'economic')?.requiredMm ?? null;
    let mm: number | null = policy === 'chosen' ? (chosenMm ?? result.recommendedMm) : result.recommendedMm;
    if (policy === 'economic-plus-one') {
      const base = Math.max(econMm ?? 0, result.recommendedMm ?? 0);
      const i = cands.findIndex((c) => c.mm === base);
      mm = i >= 0 ? cands[Math.min(cands.length - 1, i + 1)].mm : result.recommendedMm;
    }
    const c = cands.find((x) => x.mm === mm) ?? bare;
    // Fittings and supports as equivalent lengths (lib/lines/fittings-heat.ts), bare fittings on a bare line.
    const counts = { geometry, lengthM, elbows, tees, valves, flanges };
    const fitW = lineFittingsW(basis, counts, c.heatFlow, bare.heatFlow, c.mm === 0);
    const bareFitW = lineFittingsW(basis, counts, bare.heatFlow, bare.heatFlow, true);
    // A vessel picked part by part: each part's flux at its own thickness times its area, summed.
    const partsW =
      policy === 'chosen' && geometry === 'vessel' && row.chosenParts
        ? vesselPartsHeatW(cands, row.chosenParts, row.surfaceAreaM2 ?? 1, row.heightM ?? 1)
        : null;
    const tr = lineTracing(basis, counts, result.tracing, c.mm);
    if (tr) {
      const t = tracingByArea.get(area) ?? { kW: 0, lines: 0, tracerM: 0 };
      t.kW += tr.requiredW / 1000;
      t.lines++;
      t.tracerM += tr.tracerM ?? 0;
      tracingByArea.set(area, t);
    }
    const designedW = (partsW ?? c.heatFlow * extent) + fitW,
      bareW = result.bareHeatW + bareFitW;
    if (bareW < 0) {
      coldGainKW += -designedW / 1000;
      continue;
    }
    fittingsKW += fitW / 1000;
    bareFittingsKW += bareFitW / 1000;
    const a = perArea.get(area) ?? { bareKW: 0, designedKW: 0 };
    a.bareKW += bareW / 1000;
    a.designedKW += designedW / 1000;
    perArea.set(area, a);
    perLine.push({
      tag,
      area,
      designedKW: designedW / 1000,
      bareKW: bareW / 1000,
      fittingsKW: fitW / 1000,
      thicknessMm: mm,
    });
  }
  const budget = await getBudget({ projectId });
  const totals = (kW: number) => {
    const mwh = (kW * hours) / 1000;
    return {
      kW,
      mwhPerYear: mwh,
      costPerYear: (mwh * 1000 * price) / econ.efficiency,
      co2TonnesPerYear: (mwh / econ.efficiency) * econ.co2KgPerKWh,
    };
  };
  const bareKW = [...perArea.values()].reduce((s, a) => s + a.bareKW, 0);
  const designedKW = [...perArea.values()].reduce((s, a) => s + a.designedKW, 0);
  const areas = [...perArea.entries()]
    .sort((x, y) => x[0].localeCompare(y[0]))
    .map(([area, v]) => {
      const allocationKW = budget?.allocations.find((a) => a.area === area)?.kW ?? null;
      return { area, ...v, allocationKW, over: allocationKW !== null && v.designedKW > allocationKW };
    });
  const warnings = areas
    .filter((a) => a.over)
    .map(
      (a) =>
        `${a.area}: ${a.designedKW.toFixed(1)} kW designed against ${a.allocationKW!.toFixed(1)} kW allocated (${(a.designedKW - a.allocationKW!).toFixed(1)} kW over).`,
    );
  const designed = totals(designedKW);
  if (budget && designedKW > budget.totalKW)
    warnings.unshift(`Plant total ${designedKW.toFixed(1)} kW is over the ${budget.totalKW} kW budget.`);
  if (budget && designed.mwhPerYear > budget.totalMWhPerYear)
    warnings.push(
      `Annual loss ${designed.mwhPerYear.toFixed(0)} MWh/yr is over the ${budget.totalMWhPerYear} MWh/yr budget.`,
    );
  const tracingAreas = [...tracingByArea.entries()]
    .sort((x, y) => x[0].localeCompare(y[0]))
    .map(([area, v]) => ({ area, ...v }));
  return {
    policy,
    price,
    hours,
    bare: totals(bareKW),
    designed,
    savings: totals(bareKW - designedKW),
    coldGainKW,
    /** Of the designed total: straight runs and fittings/supports (equivalent lengths); of the bare total, the bare fittings. */
    straightKW: designedKW - fittingsKW,
    fittingsKW,
    bareFittingsKW,
    /** Heat-tracing duty per area and in total (electrical kW at the tracing conditions, safety factor included). */
    tracing: {
      areas: tracingAreas,
      kW: tracingAreas.reduce((sum, a) => sum + a.kW, 0),
      lines: tracingAreas.reduce((sum, a) => sum + a.lines, 0),
      tracerM: tracingAreas.reduce((sum, a) => sum + a.tracerM, 0),
    },
    areas,
    top: perLine.sort((a, b) => b.designedKW - a.designedKW).slice(0, 20),
    budget,
    warnings,
    lineCount: perLine.length,
    incompleteCount,
  };
}
