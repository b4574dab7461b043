'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { parseWithZod } from '@conform-to/zod/v4';
import type { SubmissionResult } from '@conform-to/react';
import { validateRequest } from '@/lib/auth/session';
import { getProjectAccess } from '@/db/queries/projects';
import { isAppError } from '@/lib/errors';
import { checkBandRanges, designBasisObject, designBasisSchema, fieldName } from '@/lib/lines/design-basis';
import {
  addOwnJacket,
  addOwnMaterial,
  getDesignBasis,
  removeOwnEntry,
  saveDesignBasis,
  updateOwnJacket,
  updateOwnMaterial,
} from '@/lib/lines/store';
import { ownJacketFormSchema, ownMaterialFormSchema } from '@/lib/lines/own-entry-form';
import { logUnexpected } from '@/lib/log';
import { formDataToSi } from '@/lib/format/basis-units';

// Material prices per m³, jacketing rates by jacket and the project's own materials and jackets are
// kept from the stored basis (they are not on this form).
const formSchema = designBasisObject
  .omit({ ownMaterials: true, ownJackets: true })
  .extend({ prices: designBasisObject.shape.prices.omit({ materialPerM3: true, jacketPerM2ById: true }) })
  .superRefine(checkBandRanges);

type Reply = SubmissionResult<string[]> & { revision?: number };

export async function saveDesignBasisAction(_prev: unknown, shownData: FormData): Promise<Reply> {
  const { user } = await validateRequest();
  // The form shows the project's units (shownUnits); the schema and the store speak SI. Fields sent
  // back as shown keep the stored value (read only for a signed-in user with access to the project).
  const shownIn = shownData.get('shownUnits') === 'US' ? 'US' : 'SI';
  let stored: unknown;
  if (user && shownIn === 'US') {
    try {
      const { project } = await getProjectAccess({
        userId: user.id,
        projectId: String(shownData.get('projectId') ?? ''),
        action: 'designBasis.edit',
      });
      stored = (await getDesignBasis({ projectId: project.id })).basis;
    } catch {
      stored = undefined; /* refused below with the usual answer */
    }
  }
  const formData = formDataToSi(shownData, shownIn, stored);
  const submission = parseWithZod(formData, { schema: formSchema });
  if (!user) return submission.reply({ formErrors: ['Your session has ended. Sign in again.'] });
  if (submission.status !== 'success') return submission.reply();
  try {
    const projectId = String(formData.get('projectId') ?? '');
    const { project } = await getProjectAccess({ userId: user.id, projectId, action: 'designBasis.edit' });
    const current = await getDesignBasis({ projectId: project.id });
    const parsed = designBasisSchema.safeParse({
      ...submission.value,
      ownMaterials: current.basis.ownMaterials,
      ownJackets: current.basis.ownJackets,
      prices: {
        ...submission.value.prices,
        materialPerM3: current.basis.prices.materialPerM3,
        jacketPerM2ById: current.basis.prices.jacketPerM2ById,
      },
    });
    if (!parsed.success) {
      const fieldErrors: Record<string, string[]> = {};
      for (const i of parsed.error.issues) (fieldErrors[fieldName(i.path)] ??= []).push(i.message);
      return submission.reply({ fieldErrors });
    }
    const { revision } = await saveDesignBasis({
      projectId: project.id,
      userId: user.id,
      basis: parsed.data,
    });
    revalidatePath(`/projects/${project.id}`, 'layout');
    return { ...submission.reply(), status: 'success', revision };
  } catch (e) {
    if (isAppError(e)) return submission.reply({ formErrors: [e.message] });
    logUnexpected('design-basis', e);
    return submission.reply({ formErrors: ['Something went wrong on our side. Nothing was saved.'] });
  }
}

/** Shared by the add and remove actions: session, role on the project, then the change. */
async function ownEntryAction<S extends z.ZodType>(
  formData: FormData,
  schema: S,
  run: (projectId: string, userId: string, value: z.output<S>) => Promise<{ revision: number }>,
): Promise<Reply> {
  const submission = parseWithZod(formData, { schema });
  const { user } = await validateRequest();
  if (!user) return submission.reply({ formErrors: ['Your session has ended. Sign in again.'] });
  if (submission.status !== 'success') return submission.reply();
  try {
    const { project } = await getProjectAccess({
      userId: user.id,
      projectId: String(formData.get('projectId') ?? ''),
      action: 'designBasis.edit',
    });
    const { revision } = await run(project.id, user.id, submission.value as z.output<S>);
    revalidatePath(`/projects/${project.id}`, 'layout');
    return { ...submission.reply({ resetForm: true }), status: 'success', revision };
  } catch (e) {
    if (isAppError(e)) return submission.reply({ formErrors: [e.message] });
    logUnexpected('design-basis own entry', e);
    return submission.reply({ formErrors: ['Something went wrong on our side. Nothing was saved.'] });
  }
}

/** Adds a project material, or changes one in place when the form carries its id. */
export async function addOwnMaterialAction(_prev: unknown, formData: FormData): Promise<Reply> {
  const id = String(formData.get('id') ?? '');
  return ownEntryAction(formData, ownMaterialFormSchema, (projectId, userId, { pricePerM3, ...material }) =>
    id
      ? updateOwnMaterial({ projectId, userId, id, material, pricePerM3 })
      : addOwnMaterial({ projectId, userId, material, pricePerM3 }),
  );
}

/** Adds a project jacket, or changes one in place when the form carries its id. */
export async function addOwnJacketAction(_prev: unknown, formData: FormData): Promise<Reply> {
  const id = String(formData.get('id') ?? '');
  return ownEntryAction(formData, ownJacketFormSchema, (projectId, userId, jacket) =>
    id ? updateOwnJacket({ projectId, userId, id, jacket }) : addOwnJacket({ projectId, userId, jacket }),
  );
}

export async function removeOwnEntryAction(_prev: unknown, formData: FormData): Promise<Reply> {
  return ownEntryAction(formData, z.object({ id: z.string().min(1) }), (projectId, userId, { id }) =>
    removeOwnEntry({ projectId, userId, id }),
  );
}
