import 'server-only';
import { NextResponse, type NextRequest } from 'next/server';
import type { User } from 'lucia';
import type { z } from 'zod';
import { validateRequest } from '@/lib/auth/session';
import { AppError, isAppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { logUnexpected } from '@/lib/log';

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

/** Mutating requests must come from our own origin and carry JSON. */
function checkMutation(req: NextRequest) {
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

export function route<P>(handler: (ctx: { req: NextRequest; user: User; params: P }) => Promise<Response>) {
  return async (req: NextRequest, context: { params: Promise<P> }) => {
    try {
      if (!['GET', 'HEAD', 'OPTIONS'].includes(req.method)) checkMutation(req);
      const { user } = await validateRequest();
      if (!user) throw new AppError('unauthenticated');
      return await handler({ req, user, params: await context.params });
    } catch (e) {
      return errorResponse(e);
    }
  };
}

export async function readJson<S extends z.ZodType>(req: NextRequest, schema: S): Promise<z.infer<S>> {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new AppError('invalid', 'The body is not valid JSON.');
  }
  const r = schema.safeParse(body);
  if (!r.success) throw new AppError('invalid', 'Some fields are not valid.', fieldsFromZod(r.error));
  return r.data;
}
