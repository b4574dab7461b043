/**
 * `npm run --silent recommend -- cases.json`: reads a JSON array of cases, prints a JSON array of
 * recommendations in the same order and nothing else on stdout (a bad case answers { id, error }).
 * The same code path as the product (lib/lines/recommend-case.ts). Problems with the file go to stderr.
 */
import { readFileSync } from 'node:fs';
import { runRecommendCase } from './recommend-case';

function main(): number {
  const file = process.argv[2];
  if (!file) { process.stderr.write('usage: npm run --silent recommend -- <cases.json>\n'); return 2; }
  let cases: unknown;
  try { cases = JSON.parse(readFileSync(file === '-' ? 0 : file, 'utf8')); }
  catch (e) { process.stderr.write(`cannot read ${file}: ${(e as Error).message}\n`); return 2; }
  if (!Array.isArray(cases)) { process.stderr.write('the file must hold a JSON array of cases\n'); return 2; }
  process.stdout.write(JSON.stringify(cases.map(runRecommendCase), null, 2) + '\n');
  return 0;
}

process.exitCode = main();
