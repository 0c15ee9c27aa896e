import 'server-only';
import { AppError, fieldError, type FieldErrors } from '@/lib/server/http/errors';
import { RunQueueFullError, RunTimeoutError } from './pool';
import type { RunFailure } from './pool-worker';

/** A failure reported by the worker becomes a 422 naming every bad field, e.g. `model.contributors.2.minusTol`. */
export function failureError(f: RunFailure): AppError {
  switch (f.kind) {
    case 'model': {
      const fields: FieldErrors = {};
      for (const issue of f.issues) {
        const key = ['model', ...issue.path].join('.');
        (fields[key] ??= []).push(issue.message);
      }
      return new AppError('validation_failed', `The model has ${f.issues.length} problem${f.issues.length === 1 ? '' : 's'}.`, { fields });
    }
    case 'sampling':
      return fieldError(f.inputId ? `model.inputs.${f.inputId}` : 'model', f.message);
    case 'budget':
      return fieldError('model.settings.trials', f.message);
  }
}

/** Pool trouble in words a caller can act on. */
export function poolError(err: unknown): never {
  if (err instanceof RunTimeoutError) {
    throw new AppError(
      'unavailable',
      `The run did not finish within ${err.limitMs / 1000} s, the time limit of a server run, and was stopped. Lower model.settings.trials or the number of inputs, or run it in the browser.`,
    );
  }
  if (err instanceof RunQueueFullError) {
    const why = err.waitedMs === null ? 'is running as many models as it can queue' : `had no free thread for ${err.waitedMs / 1000} s, so the run was not started`;
    throw new AppError('unavailable', `The server ${why}. Try again in a few seconds.`, { retryAfter: 5 });
  }
  throw err;
}

