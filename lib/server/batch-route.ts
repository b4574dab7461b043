import 'server-only';
import type { NextRequest } from 'next/server';
import { can, type TokenScope } from '@/lib/auth/permissions';
import { AppError } from '@/lib/errors';
import { callerOrganizations, route } from './route';

/** Largest number of cases one request may carry, whatever their weight. */
export const MAX_BATCH_CASES = 5000;

/**
 * The one shape of the batch calculation routes (`POST /api/v1/calc`, `POST /api/v1/recommend`):
 * the caller's role must allow `calc.run` (a token: in its own organization, with `scope`); the body
 * is a JSON array of 1 to 5,000 cases whose summed work units stay within `maxCost`, else the whole
 * request is refused with one sentence saying to split it; then every case is answered on its own,
 * in order, exactly as the matching CLI answers it — a bad case as `{ id, error }` naming its fields,
 * a non-object as `{ error }` naming its position — so one bad case never hides the others.
 */
export function batchRoute(o: {
  scope: TokenScope;
  maxCost: number;
  cost: (input: unknown) => number;
  /** The sentence for a request over `maxCost` (receives the rounded cost). */
  tooHeavy: (cost: number) => string;
  answer: (input: unknown) => unknown;
}) {
  return route(
    async (ctx) => {
      const orgs = await callerOrganizations(ctx);
      if (!orgs.some((org) => can(org.role, 'calc.run'))) throw new AppError('forbidden');
      const cases = await readCases(ctx.req);
      const cost = cases.reduce<number>((sum, c) => sum + (isObject(c) ? o.cost(c) : 0), 0);
      if (cost > o.maxCost) throw new AppError('invalid', o.tooHeavy(Math.round(cost)));
      const answers = cases.map((c, i) =>
        isObject(c) ? o.answer(c) : { error: `case ${i + 1}: a case must be a JSON object` },
      );
      ctx.note({ cases: cases.length, errors: answers.filter((a) => isObject(a) && 'error' in a).length });
      return Response.json(answers);
    },
    { scope: o.scope },
  );
}

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

async function readCases(req: NextRequest): Promise<unknown[]> {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new AppError('invalid', 'The body is not valid JSON.');
  }
  if (!Array.isArray(body))
    throw new AppError('invalid', 'Send a JSON array of cases.', {
      '(body)': ['send a JSON array of cases'],
    });
  if (body.length === 0)
    throw new AppError('invalid', 'Send at least one case.', { '(body)': ['send at least one case'] });
  if (body.length > MAX_BATCH_CASES)
    throw new AppError(
      'invalid',
      `At most ${MAX_BATCH_CASES} cases per request; this one has ${body.length}. Split it into smaller requests.`,
      { '(body)': [`at most ${MAX_BATCH_CASES} cases per request`] },
    );
  return body;
}
