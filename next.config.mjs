/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // Native and Node-only packages stay out of the server bundle.
  serverExternalPackages: ['better-sqlite3', 'knex', 'pdfkit', 'svg-to-pdfkit', 'smtp-server', 'mailparser', 'nodemailer'],
};
export default nextConfig;
