/**
 * The engine's web worker: runs one model at a time in steps, posts progress at least ten
 * times a second on long runs, and drops a run as soon as a newer one (or a cancel)
 * arrives. Results transfer their sample arrays instead of copying them.
 */
import { ModelValidationError, RunCancelledError, SamplingError } from './errors';
import { runModel } from './simulate';
import { transferList, type WorkerErrorPayload, type WorkerRequest, type WorkerResponse, type WorkerRunRequest } from './worker-protocol';

interface WorkerScope {
  postMessage(message: WorkerResponse, transfer?: Transferable[]): void;
  addEventListener(type: 'message', listener: (ev: MessageEvent<WorkerRequest>) => void): void;
}

const scope = self as unknown as WorkerScope;
let current: { runId: number; controller: AbortController } | null = null;

function errorPayload(err: unknown): WorkerErrorPayload {
  if (err instanceof ModelValidationError) return { name: 'ModelValidationError', message: err.message, issues: err.issues };
  if (err instanceof SamplingError) return { name: 'SamplingError', message: err.message, code: err.code, inputId: err.inputId };
  return { name: 'Error', message: err instanceof Error ? err.message : String(err) };
}

async function start(req: WorkerRunRequest): Promise<void> {
  const controller = new AbortController();
  current = { runId: req.runId, controller };
  try {
    const result = await runModel(req.model, {
      dialValues: req.dialValues,
      samples: req.samples,
      percentiles: req.percentiles,
      histogramBins: req.histogramBins,
      ecdfPoints: req.ecdfPoints,
      signal: controller.signal,
      progressIntervalMs: 50,
      onProgress: (progress) => scope.postMessage({ type: 'progress', runId: req.runId, progress }),
    });
    scope.postMessage({ type: 'result', runId: req.runId, result }, transferList(result));
  } catch (err) {
    if (err instanceof RunCancelledError) scope.postMessage({ type: 'cancelled', runId: req.runId });
    else scope.postMessage({ type: 'error', runId: req.runId, error: errorPayload(err) });
  } finally {
    if (current && current.runId === req.runId) current = null;
  }
}

scope.addEventListener('message', (ev) => {
  const msg = ev.data;
  if (!msg || typeof msg !== 'object') return;
  if (msg.type === 'cancel') {
    if (current && current.runId === msg.runId) current.controller.abort();
    return;
  }
  if (msg.type === 'run') {
    current?.controller.abort();
    void start(msg);
  }
});
