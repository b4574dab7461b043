import { z } from 'zod';
import { route, readJson } from '@/lib/server/route';
import { runCase, calcCaseSchema, caseCost } from '@/lib/thermal';
import { AppError } from '@/lib/errors';
import { listOrganizationsForUser } from '@/db/queries/projects';
import { can } from '@/lib/auth/permissions';

// The body is an array of cases; each is validated on its own so one bad case does not hide the rest,
// but the body as a whole must be an array of objects.
const bodySchema = z
  .array(z.looseObject({}), { error: 'send a JSON array of cases' })
  .min(1, { error: 'send at least one case' })
  .max(5000, { error: 'at most 5000 cases per request' });

/** Work units per request (lib/thermal/case.ts caseCost): ~7,500 single-layer pipes, about 1 s of CPU (70 µs per unit measured). */
const MAX_REQUEST_COST = 15_000;

export const POST = route(async ({ req, user }) => {
  const orgs = await listOrganizationsForUser({ userId: user.id });
  if (!orgs.some((o) => can(o.role, 'calc.run'))) throw new AppError('forbidden');
  const cases = await readJson(req, bodySchema);
  const cost = cases.reduce((sum, c) => sum + caseCost(c), 0);
  if (cost > MAX_REQUEST_COST) {
    throw new AppError(
      'invalid',
      `This request is too heavy to run at once (${Math.round(cost)} work units; the limit is ${MAX_REQUEST_COST}, about ${MAX_REQUEST_COST / 5} insulated pipes with four layers). Split it into smaller requests.`,
    );
  }
  const fields: Record<string, string[]> = {};
  cases.forEach((c, i) => {
    const r = calcCaseSchema.safeParse(c);
    if (!r.success)
      for (const iss of r.error.issues) (fields[[i, ...iss.path].join('.')] ??= []).push(iss.message);
  });
  if (Object.keys(fields).length) throw new AppError('invalid', 'Some cases are not valid.', fields);
  return Response.json(cases.map(runCase));
});
