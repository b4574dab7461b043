/**
 * `npm run --silent calc -- cases.json`: reads a JSON array of cases, prints a JSON array of
 * results in the same order and nothing else on stdout. Problems with the file go to stderr.
 */
import { runJsonBatch } from '../cli-batch';
import { runCase } from './case';

process.exitCode = runJsonBatch('calc', runCase);
