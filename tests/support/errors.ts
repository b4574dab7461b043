import { expect } from 'vitest';
import { isAppError } from '@/lib/errors';

/** Asserts that the promise rejects with an AppError of this code whose message matches (a string: exactly). */
export async function expectAppError(p: Promise<unknown>, code: string, message?: RegExp | string) {
  try {
    await p;
  } catch (e) {
    expect(isAppError(e) && e.code).toBe(code);
    if (typeof message === 'string') expect((e as Error).message).toBe(message);
    else if (message) expect((e as Error).message).toMatch(message);
    return;
  }
  throw new Error('expected an error');
}
