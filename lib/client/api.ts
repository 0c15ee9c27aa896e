// Browser-side JSON client for the Stochos API. No React here: hooks and forms build on top of it.
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';

export type FieldMessages = Record<string, string[]>;

/** Every failed API call becomes one of these, shaped like the server's error body. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields?: FieldMessages;
  readonly retryAfter?: number;
  readonly id?: string;

  constructor(status: number, code: string, message: string, extra: { fields?: FieldMessages; retryAfter?: number; id?: string } = {}) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.fields = extra.fields;
    this.retryAfter = extra.retryAfter;
    this.id = extra.id;
  }
}

// Used when a response carries no readable error body (a proxy page, an empty 502 ...).
const FALLBACK: Record<number, [string, string]> = {
  400: ['bad_request', 'The request could not be read. Reload the page and try again.'],
  401: ['unauthorized', 'Sign in to continue. Your session may have ended.'],
  403: ['forbidden', 'Your role does not allow this.'],
  404: ['not_found', 'That was not found. It may have been removed.'],
  409: ['conflict', 'That conflicts with the current state. Reload and try again.'],
  410: ['gone', 'That link has expired or was already used.'],
  415: ['unsupported_media_type', 'The request was sent in a format the server does not accept.'],
  422: ['validation_failed', 'Some fields need attention.'],
  429: ['rate_limited', 'Too many attempts. Wait a moment and try again.'],
};

interface ErrorBodyShape {
  error?: { code?: unknown; message?: unknown; fields?: unknown; retryAfter?: unknown; id?: unknown };
}

function isFieldMessages(v: unknown): v is FieldMessages {
  if (!v || typeof v !== 'object' || Array.isArray(v)) return false;
  return Object.values(v).every((m) => Array.isArray(m) && m.every((s) => typeof s === 'string'));
}

function errorFrom(res: Response, body: unknown): ApiError {
  const [fallbackCode, fallbackMessage] = FALLBACK[res.status] ?? ['internal', 'Something went wrong on our side. Try again in a moment.'];
  const e = (body as ErrorBodyShape | null)?.error;
  const headerRetry = Number(res.headers.get('retry-after'));
  const retryAfter = typeof e?.retryAfter === 'number' ? e.retryAfter : Number.isFinite(headerRetry) && headerRetry > 0 ? headerRetry : undefined;
  return new ApiError(
    res.status,
    typeof e?.code === 'string' ? e.code : fallbackCode,
    typeof e?.message === 'string' && e.message ? e.message : fallbackMessage,
    { fields: isFieldMessages(e?.fields) ? e.fields : undefined, retryAfter, id: typeof e?.id === 'string' ? e.id : undefined },
  );
}

async function request<T>(method: string, url: string, body?: unknown): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  let res: Response;
  try {
    res = await fetch(url, { method, headers, body: body === undefined ? undefined : JSON.stringify(body), credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'Could not reach Stochos. Check your connection and try again.');
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let parsed: unknown = null;
  if (text) {
    try {
      parsed = JSON.parse(text);
    } catch {
      parsed = null;
    }
  }
  if (!res.ok) throw errorFrom(res, parsed);
  return parsed as T;
}

export const api = {
  get: <T>(url: string) => request<T>('GET', url),
  post: <T>(url: string, body?: unknown) => request<T>('POST', url, body ?? {}),
  patch: <T>(url: string, body: unknown) => request<T>('PATCH', url, body),
  put: <T>(url: string, body: unknown) => request<T>('PUT', url, body),
  delete: <T = void>(url: string) => request<T>('DELETE', url),
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
