/** The project's own bill factors, each with its source — free of Next.js. */
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '@/db/client';
import { billFactors } from '@/db/schema';
import { actorName, writeAudit } from '@/lib/audit';
import { DEFAULT_ACCESSORY_FACTORS, type AccessoryFactors, type SourcedFactor } from './quantities';

/** The factors a project may set, with their labels and ranges (the form and the check share them). */
export const EDITABLE_FACTORS = [
  { key: 'bandSpacingM', label: 'Band spacing', unit: 'm', min: 0.05, max: 5 },
  { key: 'bandClosureM', label: 'Band closure allowance', unit: 'm', min: 0, max: 1 },
  { key: 'tieSpacingM', label: 'Tie-wire spacing', unit: 'm', min: 0.05, max: 5 },
  { key: 'tieTwistM', label: 'Tie-wire twist allowance', unit: 'm', min: 0, max: 1 },
  { key: 'sectionLengthM', label: 'Pipe-section length', unit: 'm', min: 0.1, max: 5 },
  { key: 'jacketLongitudinalLapMm', label: 'Jacket longitudinal lap', unit: 'mm', min: 0, max: 300 },
  { key: 'jacketCircumferentialLapMm', label: 'Jacket circumferential lap', unit: 'mm', min: 0, max: 300 },
  { key: 'jacketSheetLengthM', label: 'Jacket sheet length along the pipe', unit: 'm', min: 0.2, max: 5 },
  { key: 'retarderLapFraction', label: 'Vapour-retarder lap allowance', unit: 'fraction', min: 0, max: 1 },
  { key: 'masticLPerM2', label: 'Vapour-retarder mastic', unit: 'L/m²', min: 0, max: 10 },
] as const;
export type EditableFactor = (typeof EDITABLE_FACTORS)[number]['key'];

const factorSchema = (f: (typeof EDITABLE_FACTORS)[number]) =>
  z.object({
    value: z
      .number({ error: `${f.label}: give a number` })
      .min(f.min, { error: `${f.label} must be between ${f.min} and ${f.max} ${f.unit}` })
      .max(f.max, { error: `${f.label} must be between ${f.min} and ${f.max} ${f.unit}` }),
    source: z
      .string({ error: `${f.label}: say where the value comes from` })
      .trim()
      .min(3, { error: `${f.label}: say where the value comes from` })
      .max(300, { error: `${f.label}: the source may have at most 300 characters` }),
  });

export const billFactorsInput = z.object(
  Object.fromEntries(EDITABLE_FACTORS.map((f) => [f.key, factorSchema(f)])) as Record<
    EditableFactor,
    ReturnType<typeof factorSchema>
  >,
);

export async function getOwnBillFactors({
  projectId,
}: {
  projectId: string;
}): Promise<Partial<AccessoryFactors> | null> {
  const [r] = await db.select().from(billFactors).where(eq(billFactors.projectId, projectId));
  return (r?.factors as Partial<AccessoryFactors>) ?? null;
}

/** The editable factors as the project has them now (its own, else the defaults). */
export async function currentBillFactors({ projectId }: { projectId: string }) {
  const own = (await getOwnBillFactors({ projectId })) ?? {};
  return Object.fromEntries(
    EDITABLE_FACTORS.map((f) => [
      f.key,
      (own[f.key] as SourcedFactor | undefined) ?? DEFAULT_ACCESSORY_FACTORS[f.key],
    ]),
  ) as Record<EditableFactor, SourcedFactor>;
}

/** Saves the project's factors (all of them, each with its source) and records the change. */
export async function saveBillFactors(o: {
  projectId: string;
  userId: string;
  factors: z.output<typeof billFactorsInput>;
}) {
  const name = await actorName(o.userId);
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(billFactors)
      .where(eq(billFactors.projectId, o.projectId))
      .for('update');
    await tx
      .insert(billFactors)
      .values({ projectId: o.projectId, factors: o.factors, updatedBy: o.userId })
      .onConflictDoUpdate({
        target: billFactors.projectId,
        set: { factors: o.factors, updatedBy: o.userId, updatedAt: new Date() },
      });
    await writeAudit(tx, [
      {
        projectId: o.projectId,
        actorId: o.userId,
        actorName: name,
        action: 'bill factors',
        before: before?.factors ?? null,
        after: o.factors,
      },
    ]);
    return { saved: true };
  });
}
