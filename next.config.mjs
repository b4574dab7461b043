/** @type {import('next').NextConfig} */
const nextConfig = {
  // Native and Node-only packages stay out of the server bundle.
  serverExternalPackages: ['@node-rs/argon2', 'pg', 'exceljs', 'nodemailer'],
  poweredByHeader: false,
  typedRoutes: false,
  // Line-list uploads go through a server action: 20 MB of file plus form overhead.
  experimental: { serverActions: { bodySizeLimit: '21mb' } },
};
export default nextConfig;
