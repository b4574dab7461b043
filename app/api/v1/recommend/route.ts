import { z } from 'zod';
import { route, readJson } from '@/lib/server/route';
import { runRecommendCase, recommendCaseCost } from '@/lib/lines/recommend-case';
import { AppError } from '@/lib/errors';
import { listOrganizationsForUser } from '@/db/queries/projects';
import { can } from '@/lib/auth/permissions';

// A JSON array of cases; like the CLI, each case answers on its own ({ id, error } for a bad one).
const bodySchema = z
  .array(z.looseObject({}), { error: 'send a JSON array of cases' })
  .min(1, { error: 'send at least one case' })
  .max(5000, { error: 'at most 5000 cases per request' });

/** Work units per request: a recommendation is ~35 solves (~0.2 ms); 5,000 pipes or 1,666 vessels, about 1 s of CPU. */
const MAX_REQUEST_COST = 5000;

export const POST = route(async ({ req, user }) => {
  const orgs = await listOrganizationsForUser({ userId: user.id });
  if (!orgs.some((o) => can(o.role, 'calc.run'))) throw new AppError('forbidden');
  const cases = await readJson(req, bodySchema);
  const cost = cases.reduce((sum, c) => sum + recommendCaseCost(c), 0);
  if (cost > MAX_REQUEST_COST) {
    throw new AppError(
      'invalid',
      `This request is too heavy to run at once (${cost} work units; the limit is ${MAX_REQUEST_COST}: a pipe counts 1, a vessel 3). Split it into smaller requests.`,
    );
  }
  return Response.json(cases.map(runRecommendCase));
});
