/**
 * Running a model on this thread: validate (the model schema), then run the chunks and merge
 * them (merge.ts), the same numbers a pool gives.
 */
import { ChunkRunner, type ChunkPart, type PreparedRun } from './chunks';
import { RunCancelledError } from './errors';
import { inputWindow, mergeParts, yieldToEventLoop, type AsyncRunOptions, type MergeCaches, type Progress, type RunOptions, type RunResult } from './merge';
import { prepareCheckedRun, prepareRun } from './prepare-run';
import type { CheckedModel } from './checked-model';

export * from './merge';

const now = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/**
 * Merge chunk parts produced by runChunks (on any threads) into the run's result: the
 * same model, dial values, seed and trial count as the chunks were run with.
 */
export function mergeChunks(
  model: unknown,
  dialValues: Record<string, number> | undefined,
  seed: string | number | null | undefined,
  trials: number | null | undefined,
  parts: ChunkPart[],
  options: RunOptions = {},
): RunResult {
  return mergeParts(prepareRun(model, dialValues, seed, trials), parts, { ...options, dialValues });
}

/**
 * A run on one thread, chunk by chunk: step() runs whole chunks, finish() merges them.
 * Gives exactly the numbers a pool gives for the same model, dials, seed and trials.
 */
export class Simulation {
  readonly total: number;
  done = 0;
  readonly prep: PreparedRun;
  private readonly options: RunOptions;
  private readonly runner: ChunkRunner;
  private readonly parts: ChunkPart[] = [];
  private readonly window: number;

  /** `prep`: the run prepared from `model` (by default checked with the schema here). */
  constructor(model: unknown, options: RunOptions = {}, runner: ChunkRunner = new ChunkRunner(), prep: PreparedRun = prepareRun(model, options.dialValues)) {
    this.prep = prep;
    this.options = options;
    this.runner = runner;
    this.total = this.prep.settings.trials;
    this.window = inputWindow(this.prep, options.samples);
  }

  get dialValues(): Record<string, number> {
    return this.prep.dialValues;
  }

  /** Run whole chunks, at least one, until at least maxTrials more trials are done; returns how many. */
  step(maxTrials: number): number {
    let ran = 0;
    while (this.done < this.total && (ran === 0 || ran < maxTrials)) {
      const part = this.runner.runOne(this.prep, this.parts.length, { inputWindow: this.window });
      this.parts.push(part);
      this.done += part.count;
      ran += part.count;
    }
    return ran;
  }

  /** Column of an output over the trials run so far (for tests and tools). */
  column(id: string): Float64Array | null {
    if (!this.parts.length || !this.parts[0].outputs[id]) return null;
    const col = new Float64Array(this.done);
    for (const p of this.parts) col.set(p.outputs[id], p.start);
    return col;
  }

  finish(caches: MergeCaches = {}): RunResult {
    if (this.done < this.total) throw new Error(`finish() called after ${this.done} of ${this.total} trials`);
    return mergeParts(this.prep, this.parts, this.options, caches);
  }
}

/** Run a model synchronously (server, tests). Throws ModelValidationError or SamplingError. */
export function runModelSync(model: unknown, options: RunOptions = {}): RunResult {
  const sim = new Simulation(model, options);
  sim.step(sim.total);
  return sim.finish();
}

/** The same for a model checked before (a CheckedModel): only the model with the dial values applied is checked. */
export function runCheckedModelSync(model: CheckedModel, options: RunOptions = {}): RunResult {
  const sim = new Simulation(model, options, new ChunkRunner(), prepareCheckedRun(model, options.dialValues));
  sim.step(sim.total);
  return sim.finish();
}


/**
 * Run a model chunk by chunk, yielding to the event loop between them, reporting progress
 * and honouring an AbortSignal. Gives exactly the numbers runModelSync gives.
 */
export async function runModel(model: unknown, options: AsyncRunOptions = {}): Promise<RunResult> {
  const { onProgress, signal } = options;
  const interval = options.progressIntervalMs ?? 50;
  const t0 = now();
  if (signal?.aborted) throw new RunCancelledError();
  const sim = new Simulation(model, options);
  const chunk = options.chunkSize ?? 1;
  let lastProgress = -Infinity;
  const report = (runPhase: Progress['runPhase']) => onProgress?.({ runPhase, done: sim.done, total: sim.total, elapsedMs: now() - t0 });
  report('sampling');
  lastProgress = now();
  while (sim.done < sim.total) {
    sim.step(chunk);
    const t = now();
    if (t - lastProgress >= interval) {
      report('sampling');
      lastProgress = t;
    }
    await yieldToEventLoop();
    if (signal?.aborted) throw new RunCancelledError();
  }
  report('statistics');
  await yieldToEventLoop();
  if (signal?.aborted) throw new RunCancelledError();
  const result = sim.finish();
  report('done');
  return result;
}
