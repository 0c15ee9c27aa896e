// The server's run worker: one whole run per task, on a worker thread of the pool in lib/server/simulate/pool.ts.
// Built by lib/server/simulate/build-worker.mjs into .next/workers/simulate-worker.mjs (a plain ES module Node loads
// as is, outside Next's bundles). Uses the engine's own run function, so the numbers are the browser's.
import { ModelValidationError, runCheckedModelSync, runModelSync, SamplingError, type ModelIssue, type RunResult } from '@/lib/core/engine';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import { budgetMessage, workOf } from './budget';

export type SampleWhich = 'none' | 'outputs' | 'all';

interface RunTaskFields {
  dialValues?: Record<string, number>;
  percentiles?: number[];
  /** 'json': the API's response body, serialised here (never on the request thread); 'result': the RunResult. */
  reply: 'json' | 'result';
  samples?: { which: SampleWhich; limit: number };
  maxWork: number;
}

/**
 * The API's run body carries its model as sent: it is parsed here, off the request thread. The server's own runs
 * (snapshots) carry a model checked when it was read, marked `checked`, and only the dial values applied are checked.
 */
export type RunTask = RunTaskFields & ({ model: unknown; checked?: false } | { model: CheckedModel; checked: true });

export type RunFailure =
  | { kind: 'model'; issues: ModelIssue[] }
  | { kind: 'sampling'; message: string; inputId: string | null }
  | { kind: 'budget'; message: string };

export type RunReply = { ok: true; json: Uint8Array } | { ok: true; result: RunResult } | { ok: false; failure: RunFailure };

/** Runs the task; pure apart from the CPU time, so the same task gives the same bytes on any thread. */
export function runTask(task: RunTask): RunReply {
  const w = workOf(task.model);
  // Checked before the engine allocates its columns (trials × columns doubles).
  if (w && w.work > task.maxWork) return { ok: false, failure: { kind: 'budget', message: budgetMessage(w, task.maxWork) } };
  let result: RunResult;
  try {
    const options = { dialValues: task.dialValues, samples: task.samples?.which ?? 'none', percentiles: task.percentiles } as const;
    result = task.checked ? runCheckedModelSync(task.model, options) : runModelSync(task.model, options);
  } catch (err) {
    if (err instanceof ModelValidationError) return { ok: false, failure: { kind: 'model', issues: err.issues } };
    if (err instanceof SamplingError) return { ok: false, failure: { kind: 'sampling', message: err.message, inputId: err.inputId } };
    throw err;
  }
  if (task.reply === 'result') return { ok: true, result };
  const limit = task.samples?.limit ?? 0;
  const cut = (cols: Record<string, Float64Array>) => Object.fromEntries(Object.entries(cols).map(([k, v]) => [k, Array.from(v.subarray(0, limit))]));
  const body = { ...result, samples: result.samples ? { outputs: cut(result.samples.outputs), inputs: cut(result.samples.inputs) } : null };
  return { ok: true, json: new TextEncoder().encode(JSON.stringify(body)) };
}
