/**
 * The engine keeps no state between calls in module variables: scratch memory lives in a workspace
 * passed down the call (lib/thermal/workspace.ts). This reads every file of lib/thermal with the
 * TypeScript parser and fails on a top-level `let`/`var`, or on any write to a module-level binding
 * (assignment, ++/--, a mutating method, Object.assign) — except the memo caches listed below, whose
 * values are built once from their key and never changed.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { moduleStateProblems } from '../support/module-state';

/** Memo caches (WeakMap keyed by an input object; a value is built once and never changed): file → names. */
const MEMO_CACHES: Record<string, string[]> = {
  'recommend.ts': ['compiled', 'candidateCache', 'annuityCache', 'touchCache'],
};

describe('no module-level mutable state in lib/thermal', () => {
  const dir = path.join(__dirname, '../../lib/thermal');
  const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));

  it('reads every engine file', () => {
    expect(files).toContain('solve.ts');
    expect(files).toContain('recommend.ts');
    expect(files.length).toBeGreaterThan(20);
  });

  it.each(files)('%s: no top-level let/var, no write to a module-level binding', (f) => {
    expect(moduleStateProblems(f, readFileSync(path.join(dir, f), 'utf8'), MEMO_CACHES[f])).toEqual([]);
  });

  it('catches what it is meant to catch', () => {
    const src = [
      'let n = 0;',
      'var v = 1;',
      'const SCRATCH = { q: 0 };',
      'export const SLOPE = { value: 0 };',
      'const LIST: number[] = [];',
      'const memo = new WeakMap<object, number>();',
      'export function f(x: number) {',
      '  SCRATCH.q = x;',
      '  SLOPE.value += 1;',
      '  LIST.push(x);',
      '  LIST[0]++;',
      '  Object.assign(SCRATCH, { q: 2 });',
      '  memo.set(SCRATCH, 1);',
      '  const local = { q: 0 };',
      '  local.q = x;',
      '  const out = SCRATCH;',
      '  out.q = 3;',
      '  return SCRATCH;',
      '}',
    ].join('\n');
    expect(moduleStateProblems('x.ts', src, ['memo'])).toEqual([
      'x.ts:1: module-level `let`',
      'x.ts:2: module-level `var`',
      'x.ts:8: writes module-level `SCRATCH`',
      'x.ts:9: writes module-level `SLOPE`',
      'x.ts:10: mutates module-level `LIST` (.push)',
      'x.ts:11: writes module-level `LIST`',
      'x.ts:12: Object.assign onto module-level `SCRATCH`',
      'x.ts:17: writes module-level `out`',
    ]);
    // Without the allow-list entry, the cache's .set is a breach too.
    expect(moduleStateProblems('x.ts', src)).toContain('x.ts:13: mutates module-level `memo` (.set)');
  });
});
