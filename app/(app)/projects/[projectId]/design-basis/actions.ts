'use server';
import { revalidatePath } from 'next/cache';
import { parseWithZod } from '@conform-to/zod/v4';
import type { SubmissionResult } from '@conform-to/react';
import { validateRequest } from '@/lib/auth/session';
import { getProjectAccess } from '@/db/queries/projects';
import { isAppError } from '@/lib/errors';
import { checkBands, designBasisObject, designBasisSchema } from '@/lib/lines/design-basis';
import { getDesignBasis, saveDesignBasis } from '@/lib/lines/store';

// Material prices per m³ are kept from the stored basis (not edited on this form).
const formSchema = designBasisObject.extend({ prices: designBasisObject.shape.prices.omit({ materialPerM3: true }) }).superRefine(checkBands);

export async function saveDesignBasisAction(_prev: unknown, formData: FormData): Promise<SubmissionResult<string[]> & { revision?: number }> {
  const submission = parseWithZod(formData, { schema: formSchema });
  const { user } = await validateRequest();
  if (!user) return submission.reply({ formErrors: ['Your session has ended. Sign in again.'] });
  if (submission.status !== 'success') return submission.reply();
  try {
    const projectId = String(formData.get('projectId') ?? '');
    const { project } = await getProjectAccess({ userId: user.id, projectId, action: 'designBasis.edit' });
    const current = await getDesignBasis({ projectId: project.id });
    const basis = designBasisSchema.parse({ ...submission.value, prices: { ...submission.value.prices, materialPerM3: current.basis.prices.materialPerM3 } });
    const { revision } = await saveDesignBasis({ projectId: project.id, userId: user.id, basis });
    revalidatePath(`/projects/${project.id}`, 'layout');
    return { ...submission.reply(), status: 'success', revision };
  } catch (e) {
    if (isAppError(e)) return submission.reply({ formErrors: [e.message] });
    console.error('[design-basis]', e);
    return submission.reply({ formErrors: ['Something went wrong on our side. Nothing was saved.'] });
  }
}
