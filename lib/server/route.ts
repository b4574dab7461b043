import 'server-only';
import { NextResponse, type NextRequest } from 'next/server';
import type { User } from 'lucia';
import type { z } from 'zod';
import { validateRequest } from '@/lib/auth/session';
import { AppError, isAppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { logUnexpected } from '@/lib/log';
import { authenticateApiToken, recordTokenUse, scopeProblem, type TokenAuth } from '@/lib/auth/api-tokens';
import type { Action, TokenScope } from '@/lib/auth/permissions';
import { getProjectAccess, listOrganizationsForUser } from '@/db/queries/projects';

export function errorResponse(e: unknown) {
  if (isAppError(e))
    return NextResponse.json(
      { error: { code: e.code, message: e.message, fields: e.fields } },
      { status: e.status },
    );
  logUnexpected('route', e);
  return NextResponse.json(
    { error: { code: 'internal', message: 'Something went wrong on our side.' } },
    { status: 500 },
  );
}

/** Mutating requests from a browser must come from our own origin; every mutating request carries JSON. */
function checkMutation(req: NextRequest, bearer: boolean) {
  // A bearer token is never sent by a browser on its own, so a cross-site page cannot ride on it.
  if (!bearer) {
    const origin = req.headers.get('origin');
    const host = req.headers.get('host');
    if (origin) {
      // "null" (sandboxed frames, file: pages, some redirects) and anything unparsable is not our origin.
      let originHost: string | null = null;
      try {
        originHost = new URL(origin).host;
      } catch {
        originHost = null;
      }
      const allowed = new Set([host, new URL(env.appUrl()).host]);
      if (!originHost || !allowed.has(originHost))
        throw new AppError('forbidden', 'Cross-site request refused.');
    } else if (req.headers.get('sec-fetch-site') === 'cross-site') {
      throw new AppError('forbidden', 'Cross-site request refused.');
    }
  }
  if (!(req.headers.get('content-type') ?? '').toLowerCase().startsWith('application/json')) {
    throw new AppError('unsupported', 'Send the body as application/json.');
  }
}

/** zod issues → { "a.b.0": ["message"] } so callers see the field path. */
export function fieldsFromZod(error: z.ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const i of error.issues) (out[i.path.join('.') || '(body)'] ??= []).push(i.message);
  return out;
}

export interface RouteCtx<P> {
  req: NextRequest;
  user: User;
  params: P;
  /** The API token the request came with (null for a browser session). */
  token: TokenAuth | null;
  /** Adds facts to the token-use audit row (e.g. how many cases were answered). */
  note: (detail: Record<string, unknown>) => void;
}

/**
 * The one wrapper for route handlers: a browser session (cookie; mutating requests same-origin and
 * JSON), or — only where `scope` is given — `Authorization: Bearer <API token>` carrying that scope,
 * checked against its maker's current role. Every request that came with a known token is recorded
 * in `api_token_events` with its answer's status.
 */
export function route<P>(
  handler: (ctx: RouteCtx<P>) => Promise<Response>,
  opts: { scope?: TokenScope } = {},
) {
  return async (req: NextRequest, context: { params: Promise<P> }) => {
    const mutating = !['GET', 'HEAD', 'OPTIONS'].includes(req.method);
    const detail: Record<string, unknown> = {};
    const note = (d: Record<string, unknown>) => {
      Object.assign(detail, d);
    };
    let token: { auth: TokenAuth; user: User } | null = null;
    let res: Response;
    try {
      const authorization = req.headers.get('authorization');
      if (authorization !== null) {
        const m = /^Bearer[ ]+([^\s]+)[ ]*$/i.exec(authorization);
        if (!m)
          throw new AppError('unauthenticated', 'Send the API token as "Authorization: Bearer <token>".');
        if (!opts.scope)
          throw new AppError(
            'unauthenticated',
            'This address does not accept API tokens; it serves the signed-in browser.',
          );
        token = await authenticateApiToken(m[1], { method: req.method, path: req.nextUrl.pathname });
        const problem = scopeProblem(token.auth, opts.scope);
        if (problem) throw new AppError('forbidden', problem);
        if (mutating) checkMutation(req, true);
        res = await handler({ req, user: token.user, params: await context.params, token: token.auth, note });
      } else {
        if (mutating) checkMutation(req, false);
        const { user } = await validateRequest();
        if (!user) throw new AppError('unauthenticated');
        res = await handler({ req, user, params: await context.params, token: null, note });
      }
    } catch (e) {
      res = errorResponse(e);
    }
    if (token) {
      const refused = res.status === 401 || res.status === 403;
      await recordTokenUse({
        tokenId: token.auth.tokenId,
        organizationId: token.auth.organizationId,
        userId: token.user.id,
        actorName: token.user.name,
        action: refused ? 'refused' : 'used',
        method: req.method,
        path: req.nextUrl.pathname,
        status: res.status,
        detail,
      }).catch((e) => logUnexpected('token audit', e));
    }
    return res;
  };
}

/**
 * The project and the caller's role, as `getProjectAccess`; a token reaches only projects of the
 * organization it was made in (any other is not found, like a stranger's).
 */
export async function projectAccess(
  ctx: { user: User; token: TokenAuth | null },
  projectId: string,
  action?: Action,
) {
  const access = await getProjectAccess({ userId: ctx.user.id, projectId, action });
  if (ctx.token && access.project.organizationId !== ctx.token.organizationId)
    throw new AppError('not_found');
  return access;
}

/** The caller's organizations: a token's own one only, a session all of the person's. */
export async function callerOrganizations(ctx: { user: User; token: TokenAuth | null }) {
  const orgs = await listOrganizationsForUser({ userId: ctx.user.id });
  return ctx.token ? orgs.filter((o) => o.id === ctx.token!.organizationId) : orgs;
}

export async function readJson<S extends z.ZodType>(req: NextRequest, schema: S): Promise<z.infer<S>> {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new AppError('invalid', 'The body is not valid JSON.');
  }
  const r = schema.safeParse(body);
  if (!r.success) {
    const fields = fieldsFromZod(r.error);
    const said = Object.entries(fields).map(([k, m]) =>
      k === '(body)' ? m.join('; ') : `${k}: ${m.join('; ')}`,
    );
    throw new AppError('invalid', `${said.join('; ')}.`, fields);
  }
  return r.data;
}
