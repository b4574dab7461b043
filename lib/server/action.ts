import 'server-only';
import type { SubmissionResult } from '@conform-to/react';
import { parseWithZod } from '@conform-to/zod/v4';
import type { z } from 'zod';
import type { User } from 'lucia';
import { validateRequest } from '@/lib/auth/session';
import { getOrganizationAccess, getProjectAccess } from '@/db/queries/projects';
import type { Role } from '@/db/schema';
import type { Action } from '@/lib/auth/permissions';
import { AppError, isAppError } from '@/lib/errors';
import { logUnexpected } from '@/lib/log';

type Ctx<T> = { user: User; input: T };
type ProjectCtx<T> = Ctx<T> & Awaited<ReturnType<typeof getProjectAccess>>;
type OrganizationCtx<T> = Ctx<T> & { organizationId: string } & Awaited<
    ReturnType<typeof getOrganizationAccess>
  >;

const SESSION_ENDED = 'Your session has ended. Sign in again.';
const UNEXPECTED = 'Something went wrong on our side. Nothing was saved; try again.';

function toReply(
  submission: { reply: (o?: object) => SubmissionResult<string[]> },
  e: unknown,
  hideFields: string[] | undefined,
): SubmissionResult<string[]> {
  if (isAppError(e))
    return submission.reply({ formErrors: e.fields ? [] : [e.message], fieldErrors: e.fields, hideFields });
  logUnexpected('action', e);
  return submission.reply({ formErrors: [UNEXPECTED], hideFields });
}

const isRedirect = (e: unknown) =>
  !!e &&
  typeof e === 'object' &&
  'digest' in e &&
  String((e as { digest: string }).digest).startsWith('NEXT_REDIRECT');

/**
 * The one wrapper for form server actions: session → zod parse (conform) → scope and role → handler.
 * Returns conform's submission result, with field errors where the handler names fields, and the
 * handler's value as `data`.
 * - Scope: `projectIdField` names the form field carrying the project, `organizationIdField` the
 *   one carrying the organization; access and `permission` are checked on it (a project or
 *   organization outside the user's is not found). A permission without a scope is refused.
 * - `prepare` rewrites the submitted form before it is parsed (e.g. values shown in the project's
 *   units back to SI); it runs after the session is read and gets the user (null when signed out).
 * - `resetForm: false` keeps the typed values after a success; `hideFields` are never echoed back
 *   (secrets).
 */
export function formAction<S extends z.ZodType, R, C extends Ctx<z.infer<S>> = Ctx<z.infer<S>>>(opts: {
  schema: S;
  permission?: Action;
  projectIdField?: string;
  organizationIdField?: string;
  prepare?: (formData: FormData, user: User | null) => Promise<FormData>;
  resetForm?: boolean;
  hideFields?: string[];
  handler: (ctx: C) => Promise<R>;
}) {
  const hideFields = opts.hideFields;
  return async (_prev: unknown, sent: FormData): Promise<SubmissionResult<string[]> & { data?: R }> => {
    const { user } = await validateRequest();
    const formData = opts.prepare ? await opts.prepare(sent, user) : sent;
    const submission = parseWithZod(formData, { schema: opts.schema });
    if (!user) return submission.reply({ formErrors: [SESSION_ENDED], hideFields });
    if (submission.status !== 'success') return submission.reply({ hideFields });
    try {
      const base: Ctx<z.infer<S>> = { user, input: submission.value };
      let ctx: Ctx<z.infer<S>> | ProjectCtx<z.infer<S>> | OrganizationCtx<z.infer<S>> = base;
      if (opts.projectIdField) {
        const projectId = String(formData.get(opts.projectIdField) ?? '');
        ctx = {
          ...base,
          ...(await getProjectAccess({ userId: user.id, projectId, action: opts.permission })),
        };
      } else if (opts.organizationIdField) {
        const organizationId = String(formData.get(opts.organizationIdField) ?? '');
        const access = await getOrganizationAccess({
          userId: user.id,
          organizationId,
          action: opts.permission,
        });
        ctx = { ...base, organizationId, ...access };
      } else if (opts.permission) {
        throw new AppError('forbidden'); // permission without a scope cannot be decided
      }
      const data = await opts.handler(ctx as C);
      // conform's reset reply carries no status; the form's success message needs one.
      const reply = submission.reply(
        opts.resetForm === false ? { hideFields } : { resetForm: true, hideFields },
      );
      return { ...reply, status: 'success' as const, data };
    } catch (e) {
      if (isRedirect(e)) throw e;
      return toReply(submission, e, hideFields);
    }
  };
}

/** `formAction`'s handler context with a project scope (`projectIdField`). */
export type ProjectFormCtx<T> = ProjectCtx<T>;
/** `formAction`'s handler context with an organization scope (`organizationIdField`). */
export type OrganizationFormCtx<T> = OrganizationCtx<T>;

/**
 * A plain `<form action>` on an organization (no form state on the client): session → zod parse →
 * organization access and role → handler. Failures are thrown as `AppError` (the error boundary
 * shows the sentence); `invalid` is the sentence for a form that does not parse.
 */
export function organizationFormAction<S extends z.ZodType>(opts: {
  schema: S;
  permission: Action;
  invalid: string;
  handler: (ctx: OrganizationCtx<z.infer<S>>) => Promise<void>;
}) {
  return async (formData: FormData): Promise<void> => {
    const parsed = opts.schema.safeParse(Object.fromEntries(formData));
    if (!parsed.success) throw new AppError('invalid', opts.invalid);
    const { user } = await validateRequest();
    if (!user) throw new AppError('unauthenticated');
    const organizationId = String(formData.get('organizationId') ?? '');
    const access = await getOrganizationAccess({ userId: user.id, organizationId, action: opts.permission });
    await opts.handler({ user, input: parsed.data, organizationId, ...access });
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
      if (!user) throw new AppError('unauthenticated', SESSION_ENDED);
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
      return { ok: false, error: UNEXPECTED };
    }
  };
}

/**
 * The file-upload variant of `projectAction`: the client sends the project and a FormData (files do
 * not travel as JSON). Session → project access and role → handler with the FormData; the handler
 * reads and checks its own fields (with sentences naming them). Errors come back as a message;
 * `unexpected` is the sentence for a failure that is not the user's to fix.
 */
export function projectFormDataAction<R>(
  permission: Action,
  handler: (
    ctx: Awaited<ReturnType<typeof getProjectAccess>> & { user: User; formData: FormData },
  ) => Promise<R>,
  unexpected = UNEXPECTED,
) {
  return async (projectId: string, formData: FormData): Promise<ActionResult<R>> => {
    try {
      const { user } = await validateRequest();
      if (!user) throw new AppError('unauthenticated', SESSION_ENDED);
      const access = await getProjectAccess({ userId: user.id, projectId, action: permission });
      return { ok: true, data: await handler({ user, formData, ...access }) };
    } catch (e) {
      if (isAppError(e)) return { ok: false, error: e.message, fields: e.fields };
      logUnexpected('action', e);
      return { ok: false, error: unexpected };
    }
  };
}

/** Parses with the schema's own sentences, or one plain sentence where the schema has none. */
function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
  const parsed = schema.safeParse(input, {
    error: () => 'This request is not valid; reload the page and try again.',
  });
  if (parsed.success) return parsed.data;
  const fields: Record<string, string[]> = {};
  for (const i of parsed.error.issues) (fields[i.path.join('.') || 'input'] ??= []).push(i.message);
  throw new AppError('invalid', [...new Set(parsed.error.issues.map((i) => i.message))].join(' '), fields);
}

async function runAction<R>(body: () => Promise<R>): Promise<ActionResult<R>> {
  try {
    return { ok: true, data: await body() };
  } catch (e) {
    if (isAppError(e)) return { ok: false, error: e.message, fields: e.fields };
    logUnexpected('action', e);
    return { ok: false, error: 'Something went wrong on our side. Nothing was saved; try again.' };
  }
}

/**
 * The wrapper for JSON-style server actions in an organization: session → membership and role
 * (not a member: not found) → zod parse → handler.
 */
export function organizationAction<S extends z.ZodType, R>(
  permission: Action,
  schema: S,
  handler: (ctx: Ctx<z.infer<S>> & { organizationId: string; role: Role }) => Promise<R>,
) {
  return async (organizationId: string, input: unknown): Promise<ActionResult<R>> =>
    runAction(async () => {
      const { user } = await validateRequest();
      if (!user) throw new AppError('unauthenticated', 'Your session has ended. Sign in again.');
      const { role } = await getOrganizationAccess({ userId: user.id, organizationId, action: permission });
      return handler({ user, input: parseInput(schema, input), organizationId, role });
    });
}

/** The wrapper for JSON-style server actions on the signed-in person's own things (their tokens): session → zod parse → handler. */
export function ownAction<S extends z.ZodType, R>(schema: S, handler: (ctx: Ctx<z.infer<S>>) => Promise<R>) {
  return async (input: unknown): Promise<ActionResult<R>> =>
    runAction(async () => {
      const { user } = await validateRequest();
      if (!user) throw new AppError('unauthenticated', 'Your session has ended. Sign in again.');
      return handler({ user, input: parseInput(schema, input) });
    });
}
