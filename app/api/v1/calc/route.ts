import { batchRoute } from '@/lib/server/batch-route';
import { runCase, caseCost } from '@/lib/thermal';

/** Work units per request (lib/thermal/case.ts caseCost): ~7,500 single-layer pipes, about 1 s of CPU (70 µs per unit measured). */
const MAX_REQUEST_COST = 15_000;

/** The heat-loss calculation for a JSON array of cases; each case answers on its own, like `npm run calc`. */
export const POST = batchRoute({
  scope: 'calc',
  maxCost: MAX_REQUEST_COST,
  cost: caseCost,
  tooHeavy: (cost) =>
    `This request is too heavy to run at once (${cost} work units; the limit is ${MAX_REQUEST_COST}, about ${MAX_REQUEST_COST / 5} insulated pipes with four layers). Split it into smaller requests.`,
  answer: runCase,
});
