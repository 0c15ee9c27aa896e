/**
 * Messages between the page and the engine's web workers. The page cuts a run into chunks
 * (chunks.ts) and hands each worker a list of chunk indices; a worker posts one 'part' per
 * chunk (output columns in the transfer list, no copy), then 'done'. A newer 'chunks'
 * request, or a 'cancel', stops the run in progress between two chunks.
 */
import type { ChunkPart } from './chunks';
import type { CheckedModel } from './checked-model';
import type { ModelIssue } from './errors';
import type { ModelCheck } from './set-dials';

/**
 * `check` for a run of a model checked before (a CheckedModel, as the protocol carries): the model passes as it is,
 * and so does the copy setDials makes of a model without dials; a copy with dial values applied is checked. The
 * page and each worker of the studio would otherwise parse the model twice per run.
 */
export function checkedRunCheck(check: ModelCheck, model: CheckedModel): ModelCheck {
  if (!check) return null;
  const noDials = !model.dials?.length;
  return (input) => (input === model || noDials ? { ok: true, model: input as CheckedModel, issues: [] } : check(input));
}

export interface WorkerChunksRequest {
  type: 'chunks';
  runId: number;
  /** The checked model, as plain JSON (the studio's workers check it again with the dial values applied). */
  model: CheckedModel;
  dialValues?: Record<string, number>;
  chunkIndices: number[];
  /** Return input columns of the chunks starting before this trial. */
  inputWindow: number;
  /** Except these (the page keeps them from an earlier run). */
  skipInputs?: string[];
}

export interface WorkerCancelRequest {
  type: 'cancel';
  runId: number;
}

export type WorkerRequest = WorkerChunksRequest | WorkerCancelRequest;

export interface WorkerPartMessage {
  type: 'part';
  runId: number;
  part: ChunkPart;
}

export interface WorkerDoneMessage {
  type: 'done';
  runId: number;
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

export type WorkerResponse = WorkerPartMessage | WorkerDoneMessage | WorkerErrorMessage | WorkerCancelledMessage;

/** The ArrayBuffers of a part's output columns (fresh every run, so they can move). */
export function partTransferList(part: ChunkPart): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  for (const arr of Object.values(part.outputs)) out.add(arr.buffer as ArrayBuffer);
  return [...out];
}
