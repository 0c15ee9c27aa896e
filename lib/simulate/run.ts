import 'server-only';
import { z } from 'zod';
import { runModelSync, ModelValidationError, SamplingError, type RunResult } from '@/lib/engine';
import { AppError, type FieldErrors } from '@/lib/http/errors';

export const MAX_RETURNED_SAMPLES = 100_000;

export const simulateRequestSchema = z
  .object({
    model: z.unknown().refine((v) => typeof v === 'object' && v !== null && !Array.isArray(v), 'Send the model as a JSON object (schema "stochos.model/1").'),
    dialValues: z.record(z.string(), z.number().finite()).optional(),
    samples: z
      .object({
        which: z.enum(['outputs', 'all']).default('outputs'),
        limit: z.number().int().min(1).max(MAX_RETURNED_SAMPLES, `At most ${MAX_RETURNED_SAMPLES.toLocaleString('en')} samples per column.`).default(10_000),
      })
      .optional(),
    percentiles: z.array(z.number().gt(0).lt(1)).max(50).optional(),
  })
  .strict();

export type SimulateRequest = z.infer<typeof simulateRequestSchema>;

/** Engine problems become 422s naming every bad field, e.g. `model.contributors.2.minusTol`. */
function engineError(err: unknown): never {
  if (err instanceof ModelValidationError) {
    const fields: FieldErrors = {};
    for (const issue of err.issues) {
      const key = ['model', ...issue.path].join('.');
      (fields[key] ??= []).push(issue.message);
    }
    throw new AppError('validation_failed', `The model has ${err.issues.length} problem${err.issues.length === 1 ? '' : 's'}.`, { fields });
  }
  if (err instanceof SamplingError) {
    throw new AppError('validation_failed', err.message, { fields: { [err.inputId ? `model.inputs.${err.inputId}` : 'model']: [err.message] } });
  }
  throw err;
}

/** Runs the model on the server with the same engine the browser uses; typed arrays become plain arrays. */
export function simulate(req: SimulateRequest): Omit<RunResult, 'samples'> & { samples: Record<string, Record<string, number[]>> | null } {
  let result: RunResult;
  try {
    result = runModelSync(req.model, { dialValues: req.dialValues, samples: req.samples ? req.samples.which : 'none', percentiles: req.percentiles });
  } catch (err) {
    engineError(err);
  }
  const limit = req.samples?.limit ?? 0;
  const cut = (cols: Record<string, Float64Array>) => Object.fromEntries(Object.entries(cols).map(([k, v]) => [k, Array.from(v.subarray(0, limit))]));
  return {
    ...result,
    samples: result.samples ? { outputs: cut(result.samples.outputs), inputs: cut(result.samples.inputs) } : null,
  };
}
