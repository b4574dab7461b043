// Prints one closing line for the whole run: "N passed, N failed" (vitest + Playwright).
import { existsSync, readFileSync } from 'node:fs';
let passed = 0,
  failed = 0,
  skipped = 0;
const [vitest, pw] = process.argv.slice(2);
if (existsSync(vitest)) {
  const v = JSON.parse(readFileSync(vitest, 'utf8'));
  passed += v.numPassedTests;
  failed += v.numFailedTests;
  skipped += v.numPendingTests + (v.numTodoTests ?? 0);
} else failed += 1;
if (existsSync(pw)) {
  const s = JSON.parse(readFileSync(pw, 'utf8')).stats;
  passed += s.expected;
  failed += s.unexpected;
  skipped += s.skipped;
  failed += s.flaky ? 0 : 0;
} else failed += 1;
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
