/**
 * The id a server error was logged under. Next gives an error thrown while rendering on the server a `digest`,
 * and instrumentation.ts logs that digest with the error (lib/server/ops/render-errors.ts), so the log line can be found
 * by it. An error thrown in the browser has none.
 */
export function errorReference(error: unknown): string | null {
  if (error && typeof error === 'object' && 'digest' in error && typeof error.digest === 'string' && error.digest) return error.digest;
  return null;
}
