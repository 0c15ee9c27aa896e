/** Preparing a run with the model schema: every caller but the embed's engine (see prepareRunWith). */
import { ChunkRunner, inputWindow, prepareRunWith, type ChunkOptions, type ChunkPart, type PreparedRun } from './chunks';
import { validateModel } from './schema';
import type { ModelCheck } from './set-dials';
import type { CheckedModel } from './checked-model';

/**
 * Validate the model, apply the dial values and compile the plan. `seed` and `trials`, when
 * given, replace the model's settings (null or undefined keep them).
 */
export function prepareRun(model: unknown, dialValues?: Record<string, number>, seed?: string | number | null, trials?: number | null): PreparedRun {
  return prepareRunWith(validateModel, model, dialValues, seed, trials);
}

/**
 * Prepare a run of a model checked before (a CheckedModel read from the database): the model itself is not
 * checked again; the model with the dial values applied (or with `seed`/`trials` replaced) still is.
 */
export function prepareCheckedRun(model: CheckedModel, dialValues?: Record<string, number>, seed?: string | number | null, trials?: number | null): PreparedRun {
  const checkOthers: ModelCheck = (input) => (input === model ? { ok: true, model, issues: [] } : validateModel(input));
  return prepareRunWith(checkOthers, model, dialValues, seed, trials);
}

/**
 * Run the given chunks of a run (any subset, any order; the parts come back in the order
 * asked). `seed` and `trials` default to the model's settings. A pool thread calls this;
 * the gathering thread passes every part to mergeChunks.
 */
export function runChunks(
  model: unknown,
  dialValues: Record<string, number> | undefined,
  seed: string | number | null | undefined,
  trials: number | null | undefined,
  chunkIndices: number[],
  options: ChunkOptions = {},
): ChunkPart[] {
  const prep = prepareRun(model, dialValues, seed, trials);
  return new ChunkRunner().run(prep, chunkIndices, { inputWindow: options.inputWindow ?? inputWindow(prep) });
}
