// The one request helper under every browser call to the Stochos API: an answer is the parsed JSON body, a failure
// is an ApiError shaped like the server's error body. Small and free of React, SWR and zod, so the embed page uses it
// as it is; the app's client (./api.ts) adds its wording, the SWR fetcher and the form helpers on top.
import type { ErrorBody, FieldErrors } from '@/lib/core/api-types';

export type FieldMessages = FieldErrors;

/** Every failed API call becomes one of these, shaped like the server's error body (`ErrorBody`). */
export class ApiError extends Error {
  /** HTTP status; 0 when the server was never reached. */
  declare readonly status: number;
  declare readonly code: string;
  declare readonly fields?: FieldMessages;
  /** Seconds to wait before trying again (429), from the body or the Retry-After header. */
  declare readonly retryAfter?: number;
  /** The logged id of a 500. */
  declare readonly id?: string;
  /** A heading for the message where the server gave one; `message` starts with it. */
  declare readonly title?: string;

  constructor(status: number, code: string, message: string, extra: { fields?: FieldMessages; retryAfter?: number; id?: string; title?: string } = {}) {
    super(message);
    Object.assign(this, { name: 'ApiError', status, code }, extra);
  }

  /** The message without its heading, for a page that shows `title` above it. */
  get detail(): string {
    const t = this.title;
    return (t && this.message.startsWith(t) && this.message.slice(t.length).replace(/^\.?\s+/, '')) || this.message;
  }
}

/** What a failure reads when the response carries no readable error body (a proxy page, an empty 502 ...). */
export type Fallback = (status: number) => { code: string; message: string; title?: string };

// Without a caller's own wording: the status alone.
const plainFallback: Fallback = (status) => ({ code: status === 429 ? 'rate_limited' : 'internal', message: `The request failed (HTTP ${status}).` });

/** Retry-After is either seconds or an HTTP date (RFC 9110 §10.2.3). */
export function parseRetryAfter(header: string | null, now = Date.now()): number | undefined {
  if (!header?.trim()) return undefined;
  const n = Number(header);
  const seconds = Number.isNaN(n) ? (Date.parse(header) - now) / 1000 : n;
  return seconds > 0 ? Math.ceil(seconds) : undefined;
}

const text = (v: unknown) => (typeof v === 'string' && v ? v : undefined);

/**
 * The one reading of an error response: its JSON error body (`ErrorBody`) when it has one, else the fallback for
 * its status. Field messages are kept only as messages per path, so a stray JSON body cannot pass for them.
 */
export function errorFrom(res: Pick<Response, 'status' | 'headers'>, body: unknown, fallback: Fallback = plainFallback): ApiError {
  const fb = fallback(res.status);
  const e: Record<string, unknown> = Object((body as Partial<ErrorBody> | null)?.error);
  const message = text(e.message);
  const fields = e.fields && typeof e.fields === 'object' && Object.values(e.fields).every((m) => Array.isArray(m) && m.every((x) => typeof x === 'string')) ? (e.fields as FieldMessages) : undefined;
  return new ApiError(res.status, text(e.code) ?? fb.code, message ?? fb.message, {
    fields,
    retryAfter: typeof e.retryAfter === 'number' && e.retryAfter > 0 ? e.retryAfter : parseRetryAfter(res.headers.get('retry-after')),
    id: text(e.id),
    title: message ? text(e.title) : fb.title,
  });
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** JSON-encoded, or sent as it is when it is FormData (an upload: the browser sets the multipart boundary). */
  body?: unknown;
  headers?: Record<string, string>;
  credentials?: RequestCredentials;
  cache?: RequestCache;
  /** For callers outside the app (the embed page), whose refusals read differently. */
  fallback?: Fallback;
  networkMessage?: string;
}

/** One HTTP call: resolves to the parsed JSON body (undefined for 204 or an empty body), or throws an ApiError. */
export async function requestJson<T>(url: string, o: RequestOptions = {}): Promise<T> {
  const { body } = o;
  const json = body !== undefined && !(body instanceof FormData);
  let res: Response;
  try {
    res = await fetch(url, {
      method: o.method ?? 'GET',
      headers: { accept: 'application/json', ...(json ? { 'content-type': 'application/json' } : {}), ...o.headers },
      body: json ? JSON.stringify(body) : (body as FormData | undefined),
      credentials: o.credentials ?? 'same-origin',
      cache: o.cache,
    });
  } catch {
    throw new ApiError(0, 'network', o.networkMessage ?? 'The server could not be reached.');
  }
  // No body, an empty one or one that is not JSON (a proxy's page) all read as nothing.
  const parsed: unknown = res.status === 204 ? null : await res.json().catch(() => null);
  if (!res.ok) throw errorFrom(res, parsed, o.fallback);
  return (parsed ?? undefined) as T;
}
