/**
 * The embed's engine pool, for published versions the server has checked: no model schema
 * (zod) on the page or in its workers. Dial values are still range-checked and every law is
 * built before a run; if that fails, the schema is loaded on demand to say what is wrong,
 * with the same message the studio gives.
 */
import { EngineWorkerClient } from './worker-client';
import type { CheckedModel } from './checked-model';

/** The schema's error for this model and these dial values (null if it finds none). */
async function explain(model: CheckedModel, dialValues?: Record<string, number>): Promise<unknown> {
  const { prepareRun } = await import('./prepare-run');
  try {
    prepareRun(model, dialValues);
  } catch (err) {
    return err;
  }
  return null;
}

export function createEmbedEngine(workers?: number): EngineWorkerClient {
  return new EngineWorkerClient({ createWorker: () => new Worker(new URL('./embed-worker.ts', import.meta.url)), check: null, explain, workers });
}
