import 'server-only';
import type { SubmissionResult } from '@conform-to/react';
import { parseWithZod } from '@conform-to/zod/v4';
import type { z } from 'zod';
import type { User } from 'lucia';
import { validateRequest } from '@/lib/auth/session';
import { getProjectAccess } from '@/db/queries/projects';
import type { Action } from '@/lib/auth/permissions';
import { AppError, isAppError } from '@/lib/errors';
import { logUnexpected } from '@/lib/log';

type Ctx<T> = { user: User; input: T };
type ProjectCtx<T> = Ctx<T> & Awaited<ReturnType<typeof getProjectAccess>>;

function toReply(
  submission: { reply: (o?: object) => SubmissionResult<string[]> },
  e: unknown,
): SubmissionResult<string[]> {
  if (isAppError(e))
    return submission.reply({ formErrors: e.fields ? [] : [e.message], fieldErrors: e.fields });
  logUnexpected('action', e);
  return submission.reply({
    formErrors: ['Something went wrong on our side. Nothing was saved; try again.'],
  });
}

/**
 * The one wrapper for form server actions: session → zod parse (conform) → role check → handler.
 * Returns conform's submission result, with field errors where the handler names fields.
 * `projectIdField` names the form field carrying the project; access and role are checked on it.
 */
export function formAction<S extends z.ZodType, R>(opts: {
  schema: S;
  permission?: Action;
  projectIdField?: string;
  handler: (ctx: ProjectCtx<z.infer<S>> | Ctx<z.infer<S>>) => Promise<R>;
}) {
  return async (_prev: unknown, formData: FormData): Promise<SubmissionResult<string[]> & { data?: R }> => {
    const submission = parseWithZod(formData, { schema: opts.schema });
    const { user } = await validateRequest();
    if (!user) return submission.reply({ formErrors: ['Your session has ended. Sign in again.'] });
    if (submission.status !== 'success') return submission.reply();
    try {
      let ctx: Ctx<z.infer<S>> | ProjectCtx<z.infer<S>> = { user, input: submission.value };
      if (opts.projectIdField) {
        const projectId = String(formData.get(opts.projectIdField) ?? '');
        ctx = {
          ...ctx,
          ...(await getProjectAccess({ userId: user.id, projectId, action: opts.permission })),
        };
      } else if (opts.permission) {
        throw new AppError('forbidden'); // permission without a scope cannot be decided
      }
      const data = await opts.handler(ctx);
      // conform's reset reply carries no status; the form's success message needs one.
      return { ...submission.reply({ resetForm: true }), status: 'success' as const, data };
    } catch (e) {
      if (
        e &&
        typeof e === 'object' &&
        'digest' in e &&
        String((e as { digest: string }).digest).startsWith('NEXT_REDIRECT')
      )
        throw e;
      return toReply(submission, e);
    }
  };
}

export type ActionResult<R> =
  | { ok: true; data: R }
  | { ok: false; error: string; fields?: Record<string, string[]> };

/**
 * The wrapper for JSON-style server actions on a project (not forms): session → project access and
 * role → zod parse → handler. Errors come back as a message (and field messages), never thrown.
 */
export function projectAction<S extends z.ZodType, R>(
  permission: Action,
  schema: S,
  handler: (ctx: ProjectCtx<z.infer<S>>) => Promise<R>,
) {
  return async (projectId: string, input: unknown): Promise<ActionResult<R>> => {
    try {
      const { user } = await validateRequest();
      if (!user) throw new AppError('unauthenticated', 'Your session has ended. Sign in again.');
      const access = await getProjectAccess({ userId: user.id, projectId, action: permission });
      // A schema's own messages are sentences for the user; where a schema has none, zod's wording
      // (and the field path) is replaced by one plain sentence: the browser sent something we did not expect.
      const parsed = schema.safeParse(input, {
        error: () => 'This request is not valid; reload the page and try again.',
      });
      if (!parsed.success) {
        const fields: Record<string, string[]> = {};
        for (const i of parsed.error.issues) (fields[i.path.join('.') || 'input'] ??= []).push(i.message);
        throw new AppError(
          'invalid',
          [...new Set(parsed.error.issues.map((i) => i.message))].join(' '),
          fields,
        );
      }
      return { ok: true, data: await handler({ user, input: parsed.data, ...access }) };
    } catch (e) {
      if (isAppError(e)) return { ok: false, error: e.message, fields: e.fields };
      logUnexpected('action', e);
      return { ok: false, error: 'Something went wrong on our side. Nothing was saved; try again.' };
    }
  };
}
