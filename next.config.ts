import type { NextConfig } from 'next';
import { STATIC_SECURITY_HEADERS } from './lib/server/security-headers';

const nextConfig: NextConfig = {
  // Native and Node-only packages stay out of the server bundle.
  serverExternalPackages: [
    '@node-rs/argon2',
    'pg',
    'pg-boss',
    'exceljs',
    'nodemailer',
    '@react-pdf/renderer',
  ],
  poweredByHeader: false,
  typedRoutes: false,
  // Line-list uploads go through a server action: 20 MB of file plus form overhead (proxy.ts
  // answers 413 above this from Content-Length, lib/server/body-limits.ts).
  // proxy.ts sees every body first; without this it would pass on only the first 10 MB of an upload.
  experimental: { serverActions: { bodySizeLimit: '21mb' }, proxyClientMaxBodySize: '21mb' },
  // Headers that never vary, on every response including static files; the CSP and HSTS are
  // set per request in proxy.ts.
  async headers() {
    return [
      {
        source: '/:path*',
        headers: Object.entries(STATIC_SECURITY_HEADERS).map(([key, value]) => ({ key, value })),
      },
    ];
  },
};
export default nextConfig;
