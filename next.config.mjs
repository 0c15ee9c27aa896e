/** @type {import('next').NextConfig} */

// App-wide security headers. Content-Security-Policy and HSTS of pages come from proxy.ts (a nonce per request);
// embed pages (/embed/...) set their own, with frame-ancestors from the client's allowed origins.
const common = [
  { key: 'X-Content-Type-Options', value: 'nosniff' },
  { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=(), payment=()' },
  { key: 'Cross-Origin-Resource-Policy', value: 'same-site' },
];

// Browser bundles take @stdlib's built-in variants directly. Each of these packages picks, at load time, the
// platform's own Float64Array / Uint*Array / Object.defineProperty when present (always, in every browser the app
// supports) and otherwise a polyfill, which brings feature tests and a printf-style message formatter along. The
// engine's math is unchanged (the same built-ins are used); the embed page carries several KiB less. Node keeps the
// packages as published.
const stdlibBuiltins = {
  'utils-define-property': 'lib/builtin.js',
  'array-float64': 'lib/main.js',
  'array-uint32': 'lib/main.js',
  'array-uint16': 'lib/main.js',
  'array-uint8': 'lib/main.js',
};

const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // Browser source maps only on request, to see which module the embed page's bytes come from
  // (`node tests/bench/embed-weight.mjs --modules`); a normal build serves none.
  productionBrowserSourceMaps: process.env.STOCHOS_BROWSER_SOURCE_MAPS === '1',
  turbopack: {
    resolveAlias: Object.fromEntries(Object.entries(stdlibBuiltins).map(([pkg, file]) => [`@stdlib/${pkg}`, { browser: `./node_modules/@stdlib/${pkg}/${file}` }])),
  },
  // `npm test` type-checks the whole project with `tsc --noEmit` first; the build need not do it twice.
  typescript: { ignoreBuildErrors: true },
  // Native and Node-only packages stay out of the server bundle.
  serverExternalPackages: ['better-sqlite3', 'knex', 'pg', 'pdfkit', 'svg-to-pdfkit', 'smtp-server', 'mailparser', 'nodemailer', 'piscina'],
  async headers() {
    return [
      {
        source: '/((?!embed/).*)',
        headers: [
          ...common,
          { key: 'X-Frame-Options', value: 'DENY' },
          { key: 'Referrer-Policy', value: 'strict-origin-when-cross-origin' },
          { key: 'Cross-Origin-Opener-Policy', value: 'same-origin' },
        ],
      },
      // Pages get a per-request policy with a script nonce from proxy.ts; API answers load nothing, so theirs
      // allows nothing. (Static files carry none: the web worker's script would take it as its own policy.)
      {
        source: '/api/:path*',
        headers: [{ key: 'Content-Security-Policy', value: "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'" }],
      },
    ];
  },
};
export default nextConfig;
