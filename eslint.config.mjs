import next from 'eslint-config-next';
import nextTs from 'eslint-config-next/typescript';

const config = [
  { ignores: ['.next/**', 'node_modules/**', 'public/**', '.data/**', 'test-results/**', 'playwright-report/**', 'next-env.d.ts'] },
  ...next,
  ...nextTs,
  // Pages and route handlers reach the database through the services in lib/, which hold each write and its audit row.
  {
    files: ['app/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': ['error', { patterns: [{ group: ['@/db', '@/db/*'], message: 'app/ reaches the database through a service in lib/ (e.g. lib/models/service.ts), never db/ directly.' }] }],
    },
  },
  // db/ holds queries: it may take types from lib/, never code. The demo seed builds its rows with the product's own
  // validation and hashing, so it stays outside this rule until it moves out of db/.
  {
    files: ['db/**/*.ts'],
    ignores: ['db/seed/**'],
    rules: {
      '@typescript-eslint/no-restricted-imports': ['error', { patterns: [{ group: ['@/lib/*'], allowTypeImports: true, message: 'db/ imports only types from lib/ (import type); pass values in from the service that calls it.' }] }],
    },
  },
];
export default config;
