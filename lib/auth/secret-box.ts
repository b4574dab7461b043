import { createCipheriv, createDecipheriv, createHash, randomBytes } from 'node:crypto';

/**
 * AES-256-GCM for secrets at rest (the organizations' OIDC client secrets). The key comes from
 * LAGWISE_SECRET_KEY (any string; hashed to 32 bytes); the scripts create a local one in .data/.
 */
function key(): Buffer {
  const k = process.env.LAGWISE_SECRET_KEY;
  if (!k) throw new Error('LAGWISE_SECRET_KEY is not set; company sign-in secrets cannot be stored or read');
  return createHash('sha256').update(k).digest();
}

export function sealSecret(plain: string): string {
  const iv = randomBytes(12);
  const c = createCipheriv('aes-256-gcm', key(), iv);
  const enc = Buffer.concat([c.update(plain, 'utf8'), c.final()]);
  return [
    'v1',
    iv.toString('base64url'),
    c.getAuthTag().toString('base64url'),
    enc.toString('base64url'),
  ].join('.');
}

export function openSecret(sealed: string): string {
  const [v, iv, tag, enc] = sealed.split('.');
  if (v !== 'v1') throw new Error('unknown secret format');
  const d = createDecipheriv('aes-256-gcm', key(), Buffer.from(iv, 'base64url'));
  d.setAuthTag(Buffer.from(tag, 'base64url'));
  return Buffer.concat([d.update(Buffer.from(enc, 'base64url')), d.final()]).toString('utf8');
}
