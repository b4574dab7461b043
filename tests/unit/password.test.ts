import { describe, expect, it } from 'vitest';
import { passwordWeakness } from '@/lib/auth/password';

describe('password strength rules', () => {
  it('requires 12 characters', () => {
    expect(passwordWeakness('short-pass1')).toBe('Use at least 12 characters.');
    expect(passwordWeakness('twelve-chars')).toBeNull();
  });
  it('refuses breached-looking passwords', () => {
    expect(passwordWeakness('password1234')).toMatch(/breached/);
    expect(passwordWeakness('Password!!!!')).toMatch(/breached/);
    expect(passwordWeakness('aaaaaaaaaaaa')).toMatch(/repeated/);
    expect(passwordWeakness('123456789012')).toMatch(/sequence/);
  });
  it('refuses a password built from the e-mail address', () => {
    expect(passwordWeakness('dario.fenn-2026', 'dario.fenn@example.com')).toMatch(/e-mail/);
  });
});
