/**
 * Messages between the page and the engine worker. A new 'run' cancels the run in
 * progress; results carry their sample columns in the transfer list (no copy).
 */
import type { ModelIssue } from './errors';
import type { Progress, RunResult, SampleSelection } from './simulate';

export interface WorkerRunRequest {
  type: 'run';
  runId: number;
  /** Model JSON (validated in the worker). */
  model: unknown;
  dialValues?: Record<string, number>;
  samples?: SampleSelection;
  percentiles?: number[];
  histogramBins?: number;
  ecdfPoints?: number;
}

export interface WorkerCancelRequest {
  type: 'cancel';
  runId: number;
}

export type WorkerRequest = WorkerRunRequest | WorkerCancelRequest;

export interface WorkerProgressMessage {
  type: 'progress';
  runId: number;
  progress: Progress;
}

export interface WorkerResultMessage {
  type: 'result';
  runId: number;
  result: RunResult;
}

export interface WorkerErrorPayload {
  name: 'ModelValidationError' | 'SamplingError' | 'Error';
  message: string;
  issues?: ModelIssue[];
  code?: string;
  inputId?: string | null;
}

export interface WorkerErrorMessage {
  type: 'error';
  runId: number;
  error: WorkerErrorPayload;
}

export interface WorkerCancelledMessage {
  type: 'cancelled';
  runId: number;
}

export type WorkerResponse = WorkerProgressMessage | WorkerResultMessage | WorkerErrorMessage | WorkerCancelledMessage;

/** The ArrayBuffers of a result's sample columns, each once. */
export function transferList(result: RunResult): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  if (result.samples) {
    for (const group of [result.samples.outputs, result.samples.inputs]) {
      for (const arr of Object.values(group)) out.add(arr.buffer as ArrayBuffer);
    }
  }
  return [...out];
}
