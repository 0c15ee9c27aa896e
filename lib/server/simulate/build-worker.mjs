// Builds the server's run worker (lib/server/simulate/pool-worker-entry.ts) into one plain ES module that Node loads on a
// worker thread at run time, outside Next's bundles: `next start`, the snapshot worker and the tests share it.
// Runs after `next build` (which empties .next) and before `next dev`.
import { build } from 'esbuild';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

/** Builds the worker to `outfile` (default .next/workers/simulate-worker.mjs) and returns its path. */
export async function buildSimulateWorker(outfile = path.join(root, '.next/workers/simulate-worker.mjs')) {
  await build({
    absWorkingDir: root,
    entryPoints: ['lib/server/simulate/pool-worker-entry.ts'],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: ['node20'],
    // piscina is loaded from node_modules: the worker must share its module with the pool's thread.
    external: ['piscina'],
    legalComments: 'none',
    logLevel: 'warning',
  });
  return outfile;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const out = await buildSimulateWorker(process.argv[2] ? path.resolve(process.argv[2]) : undefined);
  console.log(`simulate worker: ${path.relative(root, out)}`);
}
