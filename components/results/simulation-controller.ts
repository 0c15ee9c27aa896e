// The logic behind useSimulation, kept free of React so it can be tested with a fake engine client:
// debounced reruns, cancel-and-restart when the inputs change, progress, run time, and the previous
// result kept on screen until the next one is ready.
import { ModelValidationError, RunCancelledError, type ModelIssue } from '@/lib/core/engine/errors';
import type { Progress, RunResult, SampleSelection } from '@/lib/core/engine/simulate';
import { withEarlierParts } from './staged-result';
import { markStep } from '@/lib/core/engine/step-marks';
import type { WorkerRunOptions } from '@/lib/core/engine/worker-client';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

/** What the controller needs from the engine's worker client (EngineWorkerClient fits). */
export interface RunClient {
  run(model: CheckedModel, options?: WorkerRunOptions): Promise<RunResult>;
  cancel(): void;
  terminate(): void;
}

export type SimulationStatus = 'idle' | 'waiting' | 'running' | 'done' | 'error';

export interface SimulationError {
  message: string;
  /** Located problems when the model (or a dial value) is invalid. */
  issues: ModelIssue[];
}

export interface SimulationSnapshot {
  /** idle: nothing to run; waiting: inputs changed, run starts after the debounce; running; done; error. */
  status: SimulationStatus;
  /** The last successful result; stays while a newer run is on its way or after an error. */
  result: RunResult | null;
  /** True when `result` belongs to older inputs than the current ones. */
  stale: boolean;
  /** Progress of the run in flight (trials done, elapsed), null otherwise. */
  progress: Progress | null;
  /** Wall-clock duration of the last completed run, from request to result, in ms. */
  lastRunMs: number | null;
  error: SimulationError | null;
  /** Completed runs so far. */
  runs: number;
  /**
   * Parts of `result` still being computed for the current inputs ('charts': histograms, ECDFs and
   * drivers; 'drivers': drivers only), shown meanwhile from the previous result; null when complete.
   */
  pending: 'charts' | 'drivers' | null;
}

export interface ControllerOptions {
  /** The engine client, or a factory called on first use (so no worker starts during server rendering). */
  client: RunClient | (() => RunClient);
  debounceMs?: number;
  samples?: SampleSelection;
  now?: () => number;
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (t: unknown) => void;
}

/** How long a charts step waits for the complete result before it is shown by itself (about one frame). */
export const STAGE_FRAME_MS = 16;

const INITIAL: SimulationSnapshot = { status: 'idle', result: null, stale: false, progress: null, lastRunMs: null, error: null, runs: 0, pending: null };

export function errorOf(err: unknown): SimulationError {
  if (err instanceof ModelValidationError) return { message: err.message, issues: err.issues };
  if (err instanceof Error) return { message: err.message || 'The engine stopped without a message.', issues: [] };
  return { message: String(err), issues: [] };
}

export class SimulationController {
  private snapshot: SimulationSnapshot = INITIAL;
  private readonly listeners = new Set<() => void>();
  private client: RunClient | null = null;
  private readonly factory: () => RunClient;
  private readonly debounceMs: number;
  private samples: SampleSelection;
  private readonly now: () => number;
  private readonly setTimer: (fn: () => void, ms: number) => unknown;
  private readonly clearTimer: (t: unknown) => void;
  private timer: unknown = null;
  /** Inputs most recently asked for. */
  private model: CheckedModel | null = null;
  private dialValues: Record<string, number> | undefined;
  private key: string | null = null;
  /** Inputs of the result on screen. */
  private resultKey: string | null = null;
  /** Sequence number of the run in flight; older completions are ignored. */
  private seq = 0;
  /** Shows a charts step unless the complete result comes first. */
  private stageTimer: unknown = null;
  /** When the last run started (for the debounce). */
  private lastStart = -Infinity;

  constructor(opts: ControllerOptions) {
    const c = opts.client;
    this.factory = typeof c === 'function' ? c : () => c;
    this.debounceMs = opts.debounceMs ?? 150;
    this.samples = opts.samples ?? 'none';
    this.now = opts.now ?? (() => (typeof performance !== 'undefined' ? performance.now() : Date.now()));
    this.setTimer = opts.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
    this.clearTimer = opts.clearTimer ?? ((t) => clearTimeout(t as ReturnType<typeof setTimeout>));
  }

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  getSnapshot = (): SimulationSnapshot => this.snapshot;

  private set(patch: Partial<SimulationSnapshot>): void {
    this.snapshot = { ...this.snapshot, ...patch };
    for (const l of this.listeners) l();
  }

  /**
   * New inputs (and optionally a new sample selection, which must then be part of `key`).
   * `key` identifies them (the hook passes their JSON); nothing happens when it is
   * unchanged. A run in flight is cancelled at once; the new run starts after the debounce, or
   * immediately when nothing has been shown yet or no run started within the debounce.
   */
  setInputs(model: CheckedModel | null, dialValues: Record<string, number> | undefined, key: string, samples?: SampleSelection): void {
    if (key === this.key) return;
    this.key = key;
    if (samples) this.samples = samples;
    this.model = model;
    this.dialValues = dialValues;
    this.clearPending();
    if (model === null || model === undefined) {
      this.abortActive();
      this.set({ status: 'idle', progress: null, stale: this.snapshot.result !== null });
      return;
    }
    if (key === this.resultKey && this.snapshot.pending === null) {
      // Back to the inputs already on screen (e.g. a dial returned to where it was).
      this.abortActive();
      this.set({ status: 'done', stale: false, progress: null, error: null });
      return;
    }
    const settled = this.snapshot.status === 'done' || this.snapshot.status === 'error';
    this.abortActive();
    if (this.snapshot.result === null && this.snapshot.status !== 'error') {
      this.start();
      return;
    }
    // The first change after a quiet spell runs at once (a single dial step or keystroke needs no
    // wait); changes that follow within the debounce wait for the burst to end.
    if (settled && this.now() - this.lastStart >= this.debounceMs) {
      this.start();
      return;
    }
    this.set({ status: 'waiting', stale: this.snapshot.result !== null, progress: null });
    this.timer = this.setTimer(() => {
      this.timer = null;
      this.start();
    }, this.debounceMs);
  }

  /** Run the current inputs now (a "Run again" button). */
  runNow(): void {
    this.clearPending();
    if (this.model === null || this.model === undefined) return;
    this.abortActive();
    this.start();
  }

  /** Stop the run in flight (the previous result stays). */
  cancel(): void {
    this.clearPending();
    this.abortActive();
    const s = this.snapshot;
    // A result shown in part (headline only) belongs to no inputs as a whole once its run stops.
    if (s.status === 'running' || s.status === 'waiting') this.set({ status: s.result ? 'done' : 'idle', progress: null, ...(s.pending ? { pending: null, stale: true } : {}) });
    // The inputs were not run; asking for them again must start a run.
    if (this.key !== this.resultKey) this.key = null;
  }

  /** Stop everything and end the worker; the controller can be used again (a new worker starts on demand). */
  dispose(): void {
    this.cancel();
    this.client?.terminate();
    this.client = null;
  }

  private clearStageTimer(): void {
    if (this.stageTimer !== null) {
      this.clearTimer(this.stageTimer);
      this.stageTimer = null;
    }
  }

  private clearPending(): void {
    this.clearStageTimer();
    if (this.timer !== null) {
      this.clearTimer(this.timer);
      this.timer = null;
    }
  }

  private abortActive(): void {
    if (this.snapshot.status === 'running') {
      this.seq++;
      this.client?.cancel();
    }
  }

  private start(): void {
    const model = this.model;
    if (model === null) return;
    const seq = ++this.seq;
    markStep('run-start');
    this.lastStart = this.now();
    const key = this.key;
    const t0 = this.now();
    if (!this.client) this.client = this.factory();
    this.set({ status: 'running', progress: null, stale: this.snapshot.result !== null && this.resultKey !== key });
    let promise: Promise<RunResult>;
    try {
      promise = this.client.run(model, {
        dialValues: this.dialValues,
        samples: this.samples,
        onProgress: (p) => {
          if (seq === this.seq && this.snapshot.status === 'running') this.set({ progress: p });
        },
        // The headline figures at once, then the charts: what is not computed yet stays from the previous result.
        // Each step shown costs the page a render, so the charts step is shown only if the complete result is
        // not ready within a frame (large runs); otherwise the complete result replaces the headline step.
        onStage: (stage, partial) => {
          if (seq !== this.seq || this.snapshot.status !== 'running') return;
          const show = (pending: 'charts' | 'drivers') => {
            if (seq === this.seq && this.snapshot.status === 'running') this.set({ result: withEarlierParts(partial, this.snapshot.result, pending), stale: false, pending });
          };
          this.clearStageTimer();
          if (stage === 'headline') markStep('headline');
          if (stage === 'headline') show('charts');
          else
            this.stageTimer = this.setTimer(() => {
              this.stageTimer = null;
              show('drivers');
            }, STAGE_FRAME_MS);
        },
      });
    } catch (err) {
      promise = Promise.reject(err);
    }
    promise.then(
      (result) => {
        if (seq !== this.seq) return;
        this.clearStageTimer();
        this.resultKey = key;
        this.set({ status: 'done', result, stale: false, progress: null, error: null, lastRunMs: this.now() - t0, runs: this.snapshot.runs + 1, pending: null });
      },
      (err) => {
        if (seq !== this.seq || err instanceof RunCancelledError) return;
        this.set({ status: 'error', error: errorOf(err), progress: null, stale: this.snapshot.result !== null, pending: null });
      },
    );
  }
}
