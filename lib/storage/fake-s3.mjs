/**
 * Local S3-compatible store for development and tests (s3rver), started by scripts/common.sh on
 * loopback only. Objects live under S3_FAKE_DIR; the bucket S3_BUCKET is created at start.
 * Never for production: point S3_ENDPOINT at real storage instead.
 */
import S3rver from 's3rver';

const port = Number(process.env.S3_FAKE_PORT ?? 4566);
const directory = process.env.S3_FAKE_DIR ?? '.data/s3';
const bucket = process.env.S3_BUCKET || 'lagwise';

const server = new S3rver({
  address: '127.0.0.1',
  port,
  directory,
  silent: true,
  configureBuckets: [{ name: bucket }],
});
await server.run();
console.error(`[s3] local object store on http://127.0.0.1:${port}, bucket ${bucket}, files in ${directory}`);
const stop = () => server.close().finally(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
