/**
 * `npm run --silent recommend -- cases.json`: a JSON array of cases in, the recommendation for
 * each out (a bad case answers { id, error }). The same code path as the product
 * (lib/lines/recommend-case.ts).
 */
import { runJsonBatch } from '../cli-batch';
import { runRecommendCase } from './recommend-case';

process.exitCode = runJsonBatch('recommend', runRecommendCase);
