import fs from 'node:fs';
import path from 'node:path';
import { buildSimulateWorker } from '@/lib/server/simulate/build-worker.mjs';

// Unit tests run server-side runs on the real worker-thread pool without a production build: the worker is built
// once here (esbuild, well under a second) and every test process finds it through SIMULATE_WORKER_FILE.
export async function setup(): Promise<void> {
  // Under node_modules so the worker resolves piscina from the project.
  const target = path.resolve('node_modules/.cache/stochos/simulate-worker.mjs');
  // Removed first, so the build writes a new file: checkouts that share node_modules by hard links would otherwise
  // write one shared file, and a run could load another checkout's engine.
  fs.rmSync(target, { force: true });
  const file = await buildSimulateWorker(target);
  process.env.SIMULATE_WORKER_FILE = file;
}
