/**
 * Browser-side client of the engine's worker pool: one promise per run, a progress
 * callback and cancellation. A run is cut into fixed-size chunks (chunks.ts); chunk k goes
 * to worker k mod W (the same worker every run, so its cached input columns are reused
 * after a dial move), and the parts are merged here in chunk order, so the result is the
 * same bit for bit whatever W is. Starting a run cancels the previous one (its promise
 * rejects with RunCancelledError), which is what a moving dial needs.
 *
 * After a dial move, the merged input columns of unchanged inputs are kept here (ColumnStore),
 * so the workers do not send them again; the merge then posts the headline figures, the
 * charts and the drivers one after another (onStage), yielding in between so the page can
 * show the number a viewer watches first.
 */
import { prepareRunWith, type ChunkPart, type PreparedRun } from './chunks';
import { ModelValidationError, RunCancelledError, SamplingError, type SamplingErrorCode } from './errors';
import { ColumnStore, inputWindow, mergeStaged, storedInputs, yieldToEventLoop, type Progress, type ResultStage, type RunResult, type SampleSelection } from './merge';
import type { ModelCheck } from './set-dials';
import { markStep } from './step-marks';
import type { CheckedModel } from './checked-model';
import { RankStore } from './stats';
import { checkedRunCheck, type WorkerErrorPayload, type WorkerRequest, type WorkerResponse } from './worker-protocol';

export interface WorkerRunOptions {
  dialValues?: Record<string, number>;
  samples?: SampleSelection;
  percentiles?: number[];
  histogramBins?: number;
  ecdfPoints?: number;
  onProgress?: (p: Progress) => void;
  /**
   * The result as it is built on this thread: 'headline' (the figures, no charts or drivers
   * yet), then 'charts' (no drivers yet); the promise then resolves with the complete result.
   */
  onStage?: (stage: Exclude<ResultStage, 'drivers'>, result: RunResult) => void;
  signal?: AbortSignal;
}

/** Most workers a page starts, whatever the machine (memory and start-up cost per worker). */
export const MAX_POOL_SIZE = 4;

/** Pool size for this browser: navigator.hardwareConcurrency, capped. */
export function defaultPoolSize(): number {
  const hc = typeof navigator !== 'undefined' && navigator.hardwareConcurrency > 0 ? navigator.hardwareConcurrency : 2;
  return Math.max(1, Math.min(MAX_POOL_SIZE, hc));
}

interface ActiveRun {
  runId: number;
  prep: PreparedRun;
  options: WorkerRunOptions;
  parts: ChunkPart[];
  done: number;
  /** Workers that have not said 'done' yet. */
  waiting: Set<number>;
  started: number;
  resolve: (r: RunResult) => void;
  reject: (e: unknown) => void;
  cleanup: () => void;
}

function toError(e: WorkerErrorPayload): Error {
  if (e.name === 'ModelValidationError') return new ModelValidationError(e.issues ?? [{ path: [], message: e.message }]);
  if (e.name === 'SamplingError') return new SamplingError((e.code ?? 'acceptance-collapsed') as SamplingErrorCode, e.message, e.inputId ?? null);
  return new Error(e.message);
}

const now = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

export class EngineWorkerClient {
  private readonly workers: (Worker | null)[];
  private readonly createWorker: () => Worker;
  private nextId = 1;
  private active: ActiveRun | null = null;
  /** The run whose result is being merged on this thread (between its steps), if any. */
  private merging: number | null = null;
  /** Ranks of unchanged inputs, kept between runs (drivers and achieved correlations). */
  private readonly ranks = new RankStore();
  /** Merged input windows of unchanged inputs, kept between runs: workers do not send them again. */
  private readonly columns = new ColumnStore();

  private readonly check: ModelCheck;
  private readonly explain: ((model: CheckedModel, dialValues?: Record<string, number>) => Promise<unknown>) | null;

  /**
   * `createWorker` starts one worker of the pool; `check` is the model check it runs with
   * (the schema's validateModel, or null for a published model: studio-engine.ts and
   * embed-engine.ts). Without a check, a model that fails to prepare is handed to `explain`,
   * which loads the schema on demand and returns its error (null: none, the first error stands).
   */
  constructor(options: { createWorker: () => Worker; check: ModelCheck; explain?: (model: CheckedModel, dialValues?: Record<string, number>) => Promise<unknown>; workers?: number }) {
    this.createWorker = options.createWorker;
    this.check = options.check;
    this.explain = options.explain ?? null;
    this.workers = new Array(Math.max(1, Math.floor(options.workers ?? defaultPoolSize()))).fill(null);
  }

  /** Number of workers in the pool. */
  get size(): number {
    return this.workers.length;
  }

  private worker(i: number): Worker {
    let w = this.workers[i];
    if (!w) {
      w = this.createWorker();
      w.onmessage = (ev: MessageEvent<WorkerResponse>) => this.onMessage(i, ev.data);
      w.onerror = (ev: ErrorEvent) => this.fail(new Error(`The engine worker failed: ${ev.message || 'unknown error'}`));
      this.workers[i] = w;
    }
    return w;
  }

  private fail(err: unknown): void {
    const a = this.active;
    if (!a) return;
    this.stopWorkers(a.runId);
    this.active = null;
    a.cleanup();
    a.reject(err);
  }

  private onMessage(worker: number, msg: WorkerResponse): void {
    const a = this.active;
    if (!a || msg.runId !== a.runId) return; // a superseded run
    switch (msg.type) {
      case 'part':
        a.parts.push(msg.part);
        a.done += msg.part.count;
        a.options.onProgress?.({ runPhase: 'sampling', done: a.done, total: a.prep.settings.trials, elapsedMs: now() - a.started });
        return;
      case 'done':
        a.waiting.delete(worker);
        if (a.waiting.size === 0) void this.finish(a);
        return;
      case 'error':
        this.fail(toError(msg.error));
        return;
      case 'cancelled':
        this.fail(new RunCancelledError());
        return;
    }
  }

  /**
   * Merge on this thread in three steps, yielding between them so the page shows the
   * headline figure before the charts and the charts before the drivers. A newer run or a
   * cancel between the steps drops this one.
   */
  private async finish(a: ActiveRun): Promise<void> {
    const live = () => this.merging === a.runId;
    this.merging = a.runId;
    markStep('parts-in');
    this.active = null;
    a.cleanup();
    try {
      a.options.onProgress?.({ runPhase: 'statistics', done: a.done, total: a.prep.settings.trials, elapsedMs: now() - a.started });
      this.ranks.beginRun();
      const staged = mergeStaged(a.prep, a.parts, a.options, { ranks: this.ranks, columns: this.columns });
      const onStage = a.options.onStage;
      // Every step runs (each adds to the result); only their posting is optional.
      const headline = staged.headline();
      if (onStage) {
        onStage('headline', headline);
        await yieldToEventLoop();
        if (!live()) return a.reject(new RunCancelledError());
      }
      const charts = staged.charts();
      if (onStage) {
        onStage('charts', charts);
        await yieldToEventLoop();
        if (!live()) return a.reject(new RunCancelledError());
      }
      const result = staged.drivers();
      this.merging = null;
      a.options.onProgress?.({ runPhase: 'done', done: a.done, total: a.prep.settings.trials, elapsedMs: now() - a.started });
      a.resolve(result);
    } catch (err) {
      if (this.merging === a.runId) this.merging = null;
      a.reject(err);
    }
  }

  private stopWorkers(runId: number): void {
    for (const w of this.workers) w?.postMessage({ type: 'cancel', runId } satisfies WorkerRequest);
  }

  /** Run a model on the pool. A newer call cancels this one. */
  run(model: CheckedModel, options: WorkerRunOptions = {}): Promise<RunResult> {
    this.cancel();
    const runId = this.nextId++;
    return new Promise<RunResult>((resolve, reject) => {
      const { signal } = options;
      if (signal?.aborted) {
        reject(new RunCancelledError());
        return;
      }
      let prep: PreparedRun;
      try {
        // Validation here too: a bad model is refused before any worker starts.
        prep = prepareRunWith(checkedRunCheck(this.check, model), model, options.dialValues);
      } catch (err) {
        if (this.explain) this.explain(model, options.dialValues).then((e) => reject(e ?? err), () => reject(err));
        else reject(err);
        return;
      }
      const onAbort = () => {
        if (this.active?.runId === runId) this.cancel();
      };
      signal?.addEventListener('abort', onAbort);
      const size = this.workers.length;
      const assigned: number[][] = Array.from({ length: size }, () => []);
      for (let k = 0; k < prep.chunkCount; k++) assigned[k % size].push(k);
      const waiting = new Set<number>();
      assigned.forEach((ks, i) => ks.length && waiting.add(i));
      this.active = { runId, prep, options, parts: [], done: 0, waiting, started: now(), resolve, reject, cleanup: () => signal?.removeEventListener('abort', onAbort) };
      options.onProgress?.({ runPhase: 'sampling', done: 0, total: prep.settings.trials, elapsedMs: 0 });
      const window = inputWindow(prep, options.samples);
      // Columns this thread keeps from earlier runs are not sent again (common random numbers).
      this.columns.beginRun();
      const skipInputs = storedInputs(prep, window, this.columns);
      assigned.forEach((chunkIndices, i) => {
        if (!chunkIndices.length) return;
        this.worker(i).postMessage({ type: 'chunks', runId, model, dialValues: options.dialValues, chunkIndices, inputWindow: window, skipInputs } satisfies WorkerRequest);
      });
    });
  }

  /** Cancel the run in progress, if any (its promise rejects with RunCancelledError). */
  cancel(): void {
    this.merging = null;
    const a = this.active;
    if (!a) return;
    this.fail(new RunCancelledError());
  }

  /** Stop the workers; a later run starts new ones. */
  terminate(): void {
    this.cancel();
    this.workers.forEach((w, i) => {
      w?.terminate();
      this.workers[i] = null;
    });
  }
}
