/** @type {import('next').NextConfig} */
const nextConfig = {
  // Native and Node-only packages stay out of the server bundle.
  serverExternalPackages: ['@node-rs/argon2', 'pg', 'exceljs', 'nodemailer'],
  poweredByHeader: false,
  typedRoutes: false,
};
export default nextConfig;
