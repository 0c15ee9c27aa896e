/** The studio's engine pool: its workers check every model with the schema (drafts may be invalid). */
import { validateModel } from './schema';
import { EngineWorkerClient } from './worker-client';

export function createStudioEngine(workers?: number): EngineWorkerClient {
  return new EngineWorkerClient({ createWorker: () => new Worker(new URL('./worker.ts', import.meta.url)), check: validateModel, workers });
}
