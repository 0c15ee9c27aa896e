/** @type {import('next').NextConfig} */

// App-wide security headers. Embed pages (/embed/...) set their own frame-ancestors from the client's allowed origins.
const common = [
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=(), payment=()' },
  { key: 'Cross-Origin-Resource-Policy', value: 'same-site' },
];

const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // `npm test` type-checks the whole project with `tsc --noEmit` first; the build need not do it twice.
  typescript: { ignoreBuildErrors: true },
  // Native and Node-only packages stay out of the server bundle.
  serverExternalPackages: ['better-sqlite3', 'knex', 'pdfkit', 'svg-to-pdfkit', 'smtp-server', 'mailparser', 'nodemailer', 'piscina'],
  async headers() {
    return [
      {
        source: '/((?!embed/).*)',
        headers: [
          ...common,
          { key: 'Content-Security-Policy', value: "frame-ancestors 'none'; base-uri 'self'; form-action 'self' http://localhost:* http://127.0.0.1:*; object-src 'none'" },
          { key: 'X-Frame-Options', value: 'DENY' },
          { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
          { key: 'Cross-Origin-Opener-Policy', value: 'same-origin' },
        ],
      },
    ];
  },
};
export default nextConfig;
