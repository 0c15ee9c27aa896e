// The browser's one client for the Stochos API, over ./request.ts. No React and no SWR here: the SWR hooks (one per
// resource) and the forms build on `api`; the embed page uses ./request.ts directly with its bearer token, so it
// stays light.
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError, requestJson, type Fallback, type RequestOptions } from './request';

export { ApiError, errorFrom, parseRetryAfter, requestJson } from './request';
export type { Fallback, FieldMessages, RequestOptions } from './request';

// What a failure reads when the response carries no readable error body (a proxy page, an empty 502 ...).
const FALLBACK: Record<number, [string, string]> = {
  400: ['bad_request', 'The request could not be read. Reload the page and try again.'],
  401: ['unauthorized', 'Sign in to continue. Your session may have ended.'],
  403: ['forbidden', 'Your role does not allow this.'],
  404: ['not_found', 'That was not found. It may have been removed.'],
  409: ['conflict', 'That conflicts with the current state. Reload and try again.'],
  410: ['gone', 'That link has expired or was already used.'],
  413: ['payload_too_large', 'That is larger than the server accepts. Send less data.'],
  415: ['unsupported_media_type', 'The request was sent in a format the server does not accept.'],
  422: ['validation_failed', 'Some fields need attention.'],
  429: ['rate_limited', 'Too many attempts. Wait a moment and try again.'],
};

const appFallback: Fallback = (status) => {
  const [code, message] = FALLBACK[status] ?? ['internal', 'Something went wrong on our side. Try again in a moment.'];
  return { code, message };
};

const NETWORK_MESSAGE = 'Could not reach Stochos. Check your connection and try again.';

const APP: RequestOptions = { fallback: appFallback, networkMessage: NETWORK_MESSAGE };

/** JSON bodies are sent as JSON; a FormData body goes as multipart (an upload). */
export const api = {
  get: <T>(url: string) => requestJson<T>(url, APP),
  post: <T>(url: string, body?: unknown) => requestJson<T>(url, { ...APP, method: 'POST', body: body ?? {} }),
  patch: <T>(url: string, body: unknown) => requestJson<T>(url, { ...APP, method: 'PATCH', body }),
  put: <T>(url: string, body: unknown) => requestJson<T>(url, { ...APP, method: 'PUT', body }),
  delete: <T = void>(url: string) => requestJson<T>(url, { ...APP, method: 'DELETE' }),
};

/** SWR fetcher: the key is the URL. */
export const fetcher = <T>(url: string): Promise<T> => api.get<T>(url);

/** A sentence for a banner; adds the wait for rate limits. */
export function errorMessage(err: unknown): string {
  if (err instanceof ApiError) {
    if (err.status === 429 && err.retryAfter && !/\d/.test(err.message)) {
      return `${err.message} Try again in ${formatWait(err.retryAfter)}.`;
    }
    return err.message;
  }
  if (err instanceof Error && err.message) return err.message;
  return 'Something went wrong. Try again in a moment.';
}

/** The server's message for one field of a 422 (joined), if it gave one. */
export function fieldMessage(err: unknown, field: string): string | undefined {
  const m = err instanceof ApiError ? err.fields?.[field] : undefined;
  return m?.length ? m.join(' ') : undefined;
}

export function formatWait(seconds: number): string {
  if (seconds < 60) return `${Math.ceil(seconds)} second${Math.ceil(seconds) === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

/**
 * Puts the server's 422 field messages beside the matching form fields (react-hook-form `setError`).
 * Returns the messages that belong to no field of this form ("_" and unknown paths), to be shown above the form;
 * for any other error, returns the error's own message.
 */
export function applyServerErrors<T extends FieldValues>(
  err: unknown,
  setError: UseFormSetError<T>,
  fieldNames: readonly Path<T>[],
): string[] {
  if (!(err instanceof ApiError)) return [errorMessage(err)];
  if (!err.fields) return [errorMessage(err)];
  const known = new Set<string>(fieldNames);
  const formLevel: string[] = [];
  let placed = 0;
  for (const [path, messages] of Object.entries(err.fields)) {
    if (!messages.length) continue;
    if (known.has(path)) {
      setError(path as Path<T>, { type: 'server', message: messages.join(' ') }, { shouldFocus: placed === 0 });
      placed++;
    } else {
      formLevel.push(...messages.map((m) => (path === '_' ? m : `${path}: ${m}`)));
    }
  }
  if (!formLevel.length && placed === 0) formLevel.push(err.message);
  return formLevel;
}
