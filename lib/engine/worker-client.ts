/**
 * Browser-side client of the engine worker: one promise per run, a progress callback and
 * cancellation. Starting a run cancels the previous one (its promise rejects with
 * RunCancelledError), which is what a moving dial needs.
 */
import { ModelValidationError, RunCancelledError, SamplingError, type SamplingErrorCode } from './errors';
import type { Progress, RunResult, SampleSelection } from './simulate';
import type { WorkerErrorPayload, WorkerRequest, WorkerResponse } from './worker-protocol';

export interface WorkerRunOptions {
  dialValues?: Record<string, number>;
  samples?: SampleSelection;
  percentiles?: number[];
  histogramBins?: number;
  ecdfPoints?: number;
  onProgress?: (p: Progress) => void;
  signal?: AbortSignal;
}

interface Pending {
  resolve: (r: RunResult) => void;
  reject: (e: unknown) => void;
  onProgress?: (p: Progress) => void;
  cleanup: () => void;
}

function toError(e: WorkerErrorPayload): Error {
  if (e.name === 'ModelValidationError') return new ModelValidationError(e.issues ?? [{ path: [], message: e.message }]);
  if (e.name === 'SamplingError') return new SamplingError((e.code ?? 'acceptance-collapsed') as SamplingErrorCode, e.message, e.inputId ?? null);
  return new Error(e.message);
}

export class EngineWorkerClient {
  private worker: Worker | null = null;
  private readonly createWorker: () => Worker;
  private nextId = 1;
  private active: { runId: number; pending: Pending } | null = null;

  constructor(options: { createWorker?: () => Worker } = {}) {
    this.createWorker = options.createWorker ?? (() => new Worker(new URL('./worker.ts', import.meta.url)));
  }

  private ensureWorker(): Worker {
    if (!this.worker) {
      const w = this.createWorker();
      w.onmessage = (ev: MessageEvent<WorkerResponse>) => this.onMessage(ev.data);
      w.onerror = (ev: ErrorEvent) => {
        const a = this.active;
        this.active = null;
        a?.pending.cleanup();
        a?.pending.reject(new Error(`The engine worker failed: ${ev.message || 'unknown error'}`));
      };
      this.worker = w;
    }
    return this.worker;
  }

  private post(msg: WorkerRequest): void {
    this.ensureWorker().postMessage(msg);
  }

  private onMessage(msg: WorkerResponse): void {
    const a = this.active;
    if (!a || msg.runId !== a.runId) return; // a superseded run
    switch (msg.type) {
      case 'progress':
        a.pending.onProgress?.(msg.progress);
        return;
      case 'result':
        this.active = null;
        a.pending.cleanup();
        a.pending.resolve(msg.result);
        return;
      case 'error':
        this.active = null;
        a.pending.cleanup();
        a.pending.reject(toError(msg.error));
        return;
      case 'cancelled':
        this.active = null;
        a.pending.cleanup();
        a.pending.reject(new RunCancelledError());
        return;
    }
  }

  /** Run a model in the worker. A newer call cancels this one. */
  run(model: unknown, options: WorkerRunOptions = {}): Promise<RunResult> {
    this.cancel();
    const runId = this.nextId++;
    return new Promise<RunResult>((resolve, reject) => {
      const { signal } = options;
      if (signal?.aborted) {
        reject(new RunCancelledError());
        return;
      }
      const onAbort = () => {
        if (this.active?.runId === runId) this.cancel();
      };
      signal?.addEventListener('abort', onAbort);
      const pending: Pending = { resolve, reject, onProgress: options.onProgress, cleanup: () => signal?.removeEventListener('abort', onAbort) };
      this.active = { runId, pending };
      this.post({
        type: 'run',
        runId,
        model,
        dialValues: options.dialValues,
        samples: options.samples,
        percentiles: options.percentiles,
        histogramBins: options.histogramBins,
        ecdfPoints: options.ecdfPoints,
      });
    });
  }

  /** Cancel the run in progress, if any (its promise rejects with RunCancelledError). */
  cancel(): void {
    const a = this.active;
    if (!a) return;
    this.active = null;
    this.worker?.postMessage({ type: 'cancel', runId: a.runId } satisfies WorkerRequest);
    a.pending.cleanup();
    a.pending.reject(new RunCancelledError());
  }

  /** Stop the worker; a later run starts a new one. */
  terminate(): void {
    this.cancel();
    this.worker?.terminate();
    this.worker = null;
  }
}
