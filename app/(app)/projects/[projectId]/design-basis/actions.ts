'use server';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import type { User } from 'lucia';
import { getProjectAccess } from '@/db/queries/projects';
import { AppError } from '@/lib/errors';
import { formAction, type ProjectFormCtx } from '@/lib/server/action';
import { checkBandRanges, designBasisObject, designBasisSchema, fieldName } from '@/lib/lines/design-basis';
import {
  addOwnJacket,
  addOwnMaterial,
  getDesignBasis,
  removeOwnEntry,
  saveDesignBasis,
  updateOwnJacket,
  updateOwnMaterial,
} from '@/lib/lines/basis-store';
import { ownJacketFormSchema, ownMaterialFormSchema } from '@/lib/lines/own-entry-form';
import { formDataToSi } from '@/lib/format/basis-units';

// Material prices per m³, jacketing rates by jacket and the project's own materials and jackets are
// kept from the stored basis (they are not on this form).
const formSchema = designBasisObject
  .omit({ ownMaterials: true, ownJackets: true })
  .extend({ prices: designBasisObject.shape.prices.omit({ materialPerM3: true, jacketPerM2ById: true }) })
  .superRefine(checkBandRanges);

/**
 * The form shows the project's units (shownUnits); the schema and the store speak SI. Fields sent
 * back as shown keep the stored value (read only for a signed-in user with access to the project;
 * anyone else is refused by the wrapper after this).
 */
async function toSi(shownData: FormData, user: User | null): Promise<FormData> {
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
      stored = undefined; /* refused by the wrapper with the usual answer */
    }
  }
  return formDataToSi(shownData, shownIn, stored);
}

export const saveDesignBasisAction = formAction({
  schema: formSchema,
  permission: 'designBasis.edit',
  projectIdField: 'projectId',
  prepare: toSi,
  resetForm: false,
  handler: async ({ project, user, input }: ProjectFormCtx<z.infer<typeof formSchema>>) => {
    const current = await getDesignBasis({ projectId: project.id });
    const parsed = designBasisSchema.safeParse({
      ...input,
      ownMaterials: current.basis.ownMaterials,
      ownJackets: current.basis.ownJackets,
      prices: {
        ...input.prices,
        materialPerM3: current.basis.prices.materialPerM3,
        jacketPerM2ById: current.basis.prices.jacketPerM2ById,
      },
    });
    if (!parsed.success) {
      const fieldErrors: Record<string, string[]> = {};
      for (const i of parsed.error.issues) (fieldErrors[fieldName(i.path)] ??= []).push(i.message);
      throw new AppError('invalid', 'Check the fields marked.', fieldErrors);
    }
    const { revision } = await saveDesignBasis({
      projectId: project.id,
      userId: user.id,
      basis: parsed.data,
    });
    revalidatePath(`/projects/${project.id}`, 'layout');
    return { revision };
  },
});

/** Shared by the add and remove actions: the wrapper checks the session and the role on the project. */
function ownEntryAction<S extends z.ZodType>(
  schema: S,
  run: (projectId: string, userId: string, value: z.output<S>) => Promise<{ revision: number }>,
) {
  return formAction({
    schema,
    permission: 'designBasis.edit',
    projectIdField: 'projectId',
    handler: async ({ project, user, input }: ProjectFormCtx<z.output<S>>) => {
      const { revision } = await run(project.id, user.id, input);
      revalidatePath(`/projects/${project.id}`, 'layout');
      return { revision };
    },
  });
}

/** Adds a project material, or changes one in place when the form carries its id. */
export async function addOwnMaterialAction(prev: unknown, formData: FormData) {
  const id = String(formData.get('id') ?? '');
  return ownEntryAction(ownMaterialFormSchema, (projectId, userId, { pricePerM3, ...material }) =>
    id
      ? updateOwnMaterial({ projectId, userId, id, material, pricePerM3 })
      : addOwnMaterial({ projectId, userId, material, pricePerM3 }),
  )(prev, formData);
}

/** Adds a project jacket, or changes one in place when the form carries its id. */
export async function addOwnJacketAction(prev: unknown, formData: FormData) {
  const id = String(formData.get('id') ?? '');
  return ownEntryAction(ownJacketFormSchema, (projectId, userId, jacket) =>
    id ? updateOwnJacket({ projectId, userId, id, jacket }) : addOwnJacket({ projectId, userId, jacket }),
  )(prev, formData);
}

export const removeOwnEntryAction = ownEntryAction(
  z.object({ id: z.string().min(1) }),
  (projectId, userId, { id }) => removeOwnEntry({ projectId, userId, id }),
);
