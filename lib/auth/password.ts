import { hash, verify } from '@node-rs/argon2';

// argon2id with the OWASP-recommended minimum (19 MiB, 2 passes, 1 lane).
const OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(stored: string, password: string): Promise<boolean> {
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}

// A short list of passwords seen in every breach corpus; long enough to catch the obvious.
const COMMON = [
  'password',
  'qwerty',
  '123456',
  '12345678',
  '123456789',
  '1234567890',
  'letmein',
  'welcome',
  'iloveyou',
  'admin',
  'abc123',
  'monkey',
  'dragon',
  'football',
  'baseball',
  'sunshine',
  'princess',
  'trustno1',
  'passw0rd',
  'changeme',
  'secret',
  'lagwise',
];

/** Returns a user-facing reason the password is too weak, or null. */
export function passwordWeakness(password: string, email?: string): string | null {
  if (password.length < 12) return 'Use at least 12 characters.';
  if (password.length > 256) return 'Use at most 256 characters.';
  const lower = password.toLowerCase();
  if (/^(.)\1+$/.test(password)) return 'This password is a single repeated character.';
  if (/^(0123456789|1234567890|abcdefghijkl|qwertyuiop)/.test(lower))
    return 'This password is a keyboard or number sequence.';
  const stripped = lower.replace(/[^a-z]/g, '');
  if (
    COMMON.some(
      (c) => stripped === c || (lower.startsWith(c) && lower.replace(c, '').replace(/[0-9!?.]/g, '') === ''),
    )
  ) {
    return 'This password appears in lists of breached passwords.';
  }
  if (email) {
    const local = email.split('@')[0].toLowerCase();
    if (local.length >= 4 && lower.includes(local))
      return 'Do not build the password from your e-mail address.';
  }
  return null;
}
