/**
 * The shape every batch CLI shares: `npm run --silent <name> -- cases.json` (or `-` for standard
 * input) reads a JSON array, prints a JSON array of answers in the same order and nothing else on
 * stdout; problems with the file go to stderr with exit code 2.
 */
import { readFileSync } from 'node:fs';

export function runJsonBatch(name: string, answer: (input: unknown) => unknown): number {
  const file = process.argv[2];
  if (!file) {
    process.stderr.write(`usage: npm run --silent ${name} -- <cases.json>\n`);
    return 2;
  }
  let cases: unknown;
  try {
    cases = JSON.parse(readFileSync(file === '-' ? 0 : file, 'utf8'));
  } catch (e) {
    process.stderr.write(`cannot read ${file}: ${(e as Error).message}\n`);
    return 2;
  }
  if (!Array.isArray(cases)) {
    process.stderr.write('the file must hold a JSON array of cases\n');
    return 2;
  }
  process.stdout.write(`${JSON.stringify(cases.map(answer), null, 2)}\n`);
  return 0;
}
