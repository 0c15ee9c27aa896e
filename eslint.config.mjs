import next from 'eslint-config-next';
import nextTs from 'eslint-config-next/typescript';

// Layers (issue 14). Each block lists everything a folder may not import; blocks never overlap, because
// a later block replaces an earlier one's rule options instead of adding to them.
const NODE = ['node:*', 'fs', 'fs/*', 'path', 'os', 'crypto', 'child_process', 'worker_threads', 'net', 'http', 'https', 'stream', 'url', 'zlib'];
const ban = (group, message, allowTypeImports = false) => ({ group, message, allowTypeImports });
const noUi = ban(['@/components', '@/components/*', '@/app', '@/app/*'], 'lib/ and db/ never import components/ or app/: move the shared code into lib/core.');
const noDb = ban(['@/db', '@/db/*'], 'Only server services import db/.');
const noServer = ban(['@/lib/server', '@/lib/server/*', '**/server/**', 'server-only'], 'Server-only code stays on the server: import from lib/core, or call it through lib/client.');
const noLocal = ban(['@/lib/fakes/*', '@/lib/dev/*'], 'The local fakes and dev tooling are not part of the product.');
const noPlatform = ban([...NODE, 'next', 'next/*', 'react', 'react/*', 'react-dom', 'react-dom/*'], 'lib/core runs everywhere (browser, worker, server, PDF): no Node, React or Next imports.');
const noFetch = ban(['@/lib/client', '@/lib/client/*'], 'lib/core does not fetch.');
const rule = (...patterns) => ({ '@typescript-eslint/no-restricted-imports': ['error', { patterns }], 'no-restricted-imports': 'off' });

export const layers = [
  { files: ['lib/core/**/*.{ts,tsx,mts,mjs}'], rules: rule(noUi, noDb, noServer, noLocal, noPlatform, noFetch) },
  { files: ['lib/client/**/*.{ts,tsx}'], rules: rule(noUi, noDb, noServer, noLocal) },
  { files: ['lib/server/**/*.{ts,tsx,mts,mjs}', 'lib/fakes/**/*.{ts,tsx,mjs}', 'lib/dev/**/*.{ts,tsx,mjs}'], rules: rule(noUi) },
  { files: ['db/**/*.{ts,mjs}'], rules: rule(noUi, ban(['@/lib/*'], 'db/ imports only types from lib/: pass values in from the service.', true)) },
  { files: ['components/**/*.{ts,tsx}'], rules: rule(noDb, noServer, noLocal) },
  // Pages and route handlers reach the database through a service, which holds each write and its audit row. pages/
  // (the embed frame, a Pages Router page) is held to the same rule as app/.
  { files: ['app/**/*.{ts,tsx}', 'pages/**/*.{ts,tsx}'], rules: rule(ban(['@/db', '@/db/*'], 'app/ and pages/ reach the database through a service in lib/server, never db/ directly.'), noLocal) },
];

const config = [
  { ignores: ['.next/**', 'node_modules/**', 'public/**', '.data/**', 'test-results/**', 'playwright-report/**', 'next-env.d.ts'] },
  ...next,
  ...nextTs,
  ...layers,
];
export default config;
