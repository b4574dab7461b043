/**
 * Documents kept as issued: the bytes of every issued bill workbook and every line-list original,
 * in S3-compatible object storage through the AWS SDK, each with the SHA-256 and size recorded in
 * PostgreSQL next to the record that names it. Reading back checks both, so a download is the very
 * file that was issued or uploaded, or a clear refusal — never a silently different file.
 *
 * Keys are never reused: each names the record it belongs to (a bill issue's or an upload's id).
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { GetObjectCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { env } from '@/lib/env';
import { AppError } from '@/lib/errors';
import { logUnexpected } from '@/lib/log';

export interface StoredDocument {
  key: string;
  sha256: string;
  bytes: number;
}

const g = globalThis as unknown as { __lagwiseS3?: { client: S3Client; signature: string } };

/** One client per configuration (tests and scripts may set the variables before first use). */
function client(): S3Client {
  // The SDK warns once per process that releases after January 2027 need Node 22; the version in
  // package-lock.json runs on Node 20 (checked). The README's limitations say so once, the log need not.
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';
  const endpoint = env.s3Endpoint();
  const signature = JSON.stringify([endpoint, env.s3Region(), env.s3AccessKeyId(), env.s3ForcePathStyle()]);
  if (g.__lagwiseS3?.signature === signature) return g.__lagwiseS3.client;
  const id = env.s3AccessKeyId();
  const secret = env.s3SecretAccessKey();
  const c = new S3Client({
    endpoint,
    region: env.s3Region(),
    forcePathStyle: env.s3ForcePathStyle(),
    credentials: id && secret ? { accessKeyId: id, secretAccessKey: secret } : undefined,
    // Checksums only where the API requires them: many S3-compatible stores (and local fakes) do not
    // take the SDK's newer default trailing checksums; our own SHA-256 guards the bytes end to end.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 3,
  });
  g.__lagwiseS3 = { client: c, signature };
  return c;
}

export const sha256Hex = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

const UNAVAILABLE = 'The document store is not reachable, so nothing was saved. Try again in a minute.';

/** Stores the bytes under `key`. Throws `unavailable` (nothing to half-write: callers store first, then record). */
export async function putDocument(
  key: string,
  body: Uint8Array,
  contentType: string,
): Promise<StoredDocument> {
  const sha256 = sha256Hex(body);
  try {
    await client().send(
      new PutObjectCommand({
        Bucket: env.s3Bucket(),
        Key: key,
        Body: body,
        ContentType: contentType,
        ContentLength: body.byteLength,
        Metadata: { sha256 },
      }),
    );
  } catch (e) {
    logUnexpected('document store put', e);
    throw new AppError('unavailable', UNAVAILABLE);
  }
  return { key, sha256, bytes: body.byteLength };
}

/**
 * Stores a file already written to disk (a large batch) by streaming it, with the SHA-256 and size
 * its writer computed on the way — the file is never read into memory.
 */
export async function putDocumentFile(
  key: string,
  file: string,
  contentType: string,
  fingerprint: { sha256: string; bytes: number },
): Promise<StoredDocument> {
  try {
    await client().send(
      new PutObjectCommand({
        Bucket: env.s3Bucket(),
        Key: key,
        Body: createReadStream(file),
        ContentType: contentType,
        ContentLength: fingerprint.bytes,
        Metadata: { sha256: fingerprint.sha256 },
      }),
    );
  } catch (e) {
    logUnexpected('document store put', e);
    throw new AppError('unavailable', UNAVAILABLE);
  }
  return { key, ...fingerprint };
}

/** Reads the bytes stored under `key` and checks them against the fingerprint recorded with them. */
export async function getDocument(doc: StoredDocument): Promise<Buffer> {
  let buf: Buffer;
  try {
    const r = await client().send(new GetObjectCommand({ Bucket: env.s3Bucket(), Key: doc.key }));
    buf = Buffer.from(await r.Body!.transformToByteArray());
  } catch (e) {
    if ((e as { name?: string })?.name === 'NoSuchKey')
      throw new AppError('not_found', 'The stored copy of this document is missing from the document store.');
    logUnexpected('document store get', e);
    throw new AppError('unavailable', 'The document store is not reachable. Try again in a minute.');
  }
  if (buf.byteLength !== doc.bytes || sha256Hex(buf) !== doc.sha256) {
    logUnexpected('document store check', new Error(`fingerprint mismatch for ${doc.key}`));
    throw new AppError(
      'conflict',
      'The stored copy of this document does not match the fingerprint recorded when it was kept, so it is not served. Ask your administrator to restore it from backup.',
    );
  }
  return buf;
}

/** A file name safe inside a storage key and a Content-Disposition header (letters, digits, . _ - only). */
export function safeFileName(name: string): string {
  const base = name
    .replace(/^.*[\\/]/, '')
    .normalize('NFKD')
    .replace(/[^\w.-]+/g, '_')
    .replace(/^[._]+/, '');
  return base.slice(-120) || 'file';
}
