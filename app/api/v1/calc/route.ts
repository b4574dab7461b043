import { z } from 'zod';
import { route, readJson } from '@/lib/server/route';
import { runCase, calcCaseSchema } from '@/lib/thermal';
import { AppError } from '@/lib/errors';
import { listOrganizationsForUser } from '@/db/queries/projects';
import { can } from '@/lib/auth/permissions';

// The body is an array of cases; each is validated on its own so one bad case does not hide the rest,
// but the body as a whole must be an array of objects.
const bodySchema = z.array(z.looseObject({}), { error: 'send a JSON array of cases' }).min(1, { error: 'send at least one case' }).max(5000, { error: 'at most 5000 cases per request' });

export const POST = route(async ({ req, user }) => {
  const orgs = await listOrganizationsForUser({ userId: user.id });
  if (!orgs.some((o) => can(o.role, 'calc.run'))) throw new AppError('forbidden');
  const cases = await readJson(req, bodySchema);
  const fields: Record<string, string[]> = {};
  cases.forEach((c, i) => {
    const r = calcCaseSchema.safeParse(c);
    if (!r.success) for (const iss of r.error.issues) (fields[[i, ...iss.path].join('.')] ??= []).push(iss.message);
  });
  if (Object.keys(fields).length) throw new AppError('invalid', 'Some cases are not valid.', fields);
  return Response.json(cases.map(runCase));
});
