import { batchRoute } from '@/lib/server/batch-route';
import { runRecommendCase, recommendCaseCost } from '@/lib/lines/recommend-case';

/** Work units per request: a recommendation is ~35 solves (~0.2 ms); 5,000 pipes or 1,666 vessels, about 1 s of CPU. */
const MAX_REQUEST_COST = 5000;

/** The recommendation for a JSON array of cases; each case answers on its own, like `npm run recommend`. */
export const POST = batchRoute({
  scope: 'recommend',
  maxCost: MAX_REQUEST_COST,
  cost: recommendCaseCost,
  tooHeavy: (cost) =>
    `This request is too heavy to run at once (${cost} work units; the limit is ${MAX_REQUEST_COST}: a pipe counts 1, a vessel 3). Split it into smaller requests.`,
  answer: runRecommendCase,
});
