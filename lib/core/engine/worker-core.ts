/**
 * What an engine web worker of the page's pool does (worker.ts for the studio, with the model
 * schema; embed-worker.ts for published models, without it): runs the chunks it is given, keeps each input's
 * chunk columns between runs (so after a dial move only the moved inputs are sampled
 * again), and drops a run as soon as a newer one (or a cancel) arrives. Output columns are
 * transferred; cached input columns are copied so the cache keeps them.
 */
import { ChunkRunner, prepareRunWith } from './chunks';
import { ModelValidationError, SamplingError } from './errors';
import { yieldToEventLoop } from './yield';
import type { ModelCheck } from './set-dials';
import { checkedRunCheck, partTransferList, type WorkerChunksRequest, type WorkerErrorPayload, type WorkerRequest, type WorkerResponse } from './worker-protocol';

interface WorkerScope {
  postMessage(message: WorkerResponse, transfer?: Transferable[]): void;
  addEventListener(type: 'message', listener: (ev: MessageEvent<WorkerRequest>) => void): void;
}

const scope = self as unknown as WorkerScope;

function errorPayload(err: unknown): WorkerErrorPayload {
  if (err instanceof ModelValidationError) return { name: 'ModelValidationError', message: err.message, issues: err.issues };
  if (err instanceof SamplingError) return { name: 'SamplingError', message: err.message, code: err.code, inputId: err.inputId };
  return { name: 'Error', message: err instanceof Error ? err.message : String(err) };
}

/**
 * Serve chunk requests on this worker, checking each model with `check` (null: trusted).
 * `load`, when given, is awaited before a model is prepared when it returns a promise (the
 * embed loads the engine parts a model needs: optional-parts.ts).
 */
export function serveChunks(check: ModelCheck, load?: (model: unknown) => Promise<void> | null): void {
  const runner = new ChunkRunner({ cache: true });
  let current: { runId: number; cancelled: boolean } | null = null;

  async function start(req: WorkerChunksRequest): Promise<void> {
    if (current) current.cancelled = true;
    const me = { runId: req.runId, cancelled: false };
    current = me;
    try {
      const loading = load?.(req.model);
      if (loading) {
        await loading;
        if (me.cancelled) {
          scope.postMessage({ type: 'cancelled', runId: req.runId });
          return;
        }
      }
      const prep = prepareRunWith(checkedRunCheck(check, req.model), req.model, req.dialValues);
      runner.beginRun();
      for (const k of req.chunkIndices) {
        if (me.cancelled) {
          scope.postMessage({ type: 'cancelled', runId: req.runId });
          return;
        }
        const part = runner.runOne(prep, k, { inputWindow: req.inputWindow, skipInputs: req.skipInputs });
        scope.postMessage({ type: 'part', runId: req.runId, part }, partTransferList(part));
        // Let a cancel or a newer run in between chunks.
        await yieldToEventLoop();
      }
      if (me.cancelled) scope.postMessage({ type: 'cancelled', runId: req.runId });
      else scope.postMessage({ type: 'done', runId: req.runId });
    } catch (err) {
      scope.postMessage({ type: 'error', runId: req.runId, error: errorPayload(err) });
    } finally {
      if (current === me) current = null;
    }
  }

  scope.addEventListener('message', (ev) => {
    const msg = ev.data;
    if (!msg || typeof msg !== 'object') return;
    if (msg.type === 'cancel') {
      if (current && current.runId === msg.runId) current.cancelled = true;
      return;
    }
    if (msg.type === 'chunks') void start(msg);
  });
}
