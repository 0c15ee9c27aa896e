import path from 'node:path';
import { buildSimulateWorker } from '@/lib/server/simulate/build-worker.mjs';

// Unit tests run server-side runs on the real worker-thread pool without a production build: the worker is built
// once here (esbuild, well under a second) and every test process finds it through SIMULATE_WORKER_FILE.
export async function setup(): Promise<void> {
  // Under node_modules so the worker resolves piscina from the project.
  const file = await buildSimulateWorker(path.resolve('node_modules/.cache/stochos/simulate-worker.mjs'));
  process.env.SIMULATE_WORKER_FILE = file;
}
