import next from 'eslint-config-next';
import nextTs from 'eslint-config-next/typescript';

const config = [
  { ignores: ['.next/**', 'node_modules/**', 'public/**', '.data/**', 'test-results/**', 'playwright-report/**', 'next-env.d.ts'] },
  ...next,
  ...nextTs,
];
export default config;
