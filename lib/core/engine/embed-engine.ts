/**
 * The embed's engine pool, for published versions the server has checked: no model schema
 * (zod) on the page or in its workers. Dial values are still range-checked and every law is
 * built before a run; if that fails, the schema is loaded on demand to say what is wrong,
 * with the same message the studio gives. The formula parser and the correlation code are
 * fetched only for a model that needs them (optional-parts.ts), here and in each worker.
 */
import { RunCancelledError } from './errors';
import type { RunResult } from './merge';
import { loadPartsFor } from './optional-parts';
import { defaultPoolSize, EngineWorkerClient, type WorkerRunOptions } from './worker-client';
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

const newWorker = () => new Worker(new URL('./embed-worker.ts', import.meta.url));

/** Workers started ahead of the first run (prewarmEmbedEngine), handed to the next pool. */
const warm: Worker[] = [];
let prewarmed = false;

/**
 * Start the pool's workers now, so that fetching and starting their code overlaps with the
 * page's own start (the pass hand-over, the widget request) instead of delaying the first run.
 */
export function prewarmEmbedEngine(workers: number = defaultPoolSize()): void {
  if (prewarmed || typeof Worker === 'undefined') return;
  prewarmed = true;
  while (warm.length < workers) warm.push(newWorker());
}

/** End the workers started ahead (the widget will not run: the pass was refused). */
export function dropWarmEngine(): void {
  for (const w of warm.splice(0)) w.terminate();
}

class EmbedEngine extends EngineWorkerClient {
  /** Bumped by every run, cancel and terminate: a run still waiting for its parts is then dropped. */
  private generation = 0;

  override run(model: CheckedModel, options: WorkerRunOptions = {}): Promise<RunResult> {
    const gen = ++this.generation;
    const loading = loadPartsFor(model);
    if (!loading) return super.run(model, options);
    // The run in flight belongs to older inputs: stop it while the parts load.
    super.cancel();
    return loading.then(() => {
      if (gen !== this.generation) throw new RunCancelledError();
      return super.run(model, options);
    });
  }

  override cancel(): void {
    this.generation++;
    super.cancel();
  }

  override terminate(): void {
    this.generation++;
    super.terminate();
  }
}

export function createEmbedEngine(workers?: number): EngineWorkerClient {
  return new EmbedEngine({ createWorker: () => warm.shift() ?? newWorker(), check: null, explain, workers });
}
