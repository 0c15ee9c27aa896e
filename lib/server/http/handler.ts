import 'server-only';
import { randomUUID } from 'node:crypto';
import { NextResponse, type NextRequest } from 'next/server';
import { z } from 'zod';
import { AppError, validationError, type ErrorBody } from '@/lib/server/http/errors';
import { env } from '@/lib/server/env';
import { logger } from '@/lib/server/ops/log';

/** The single mapper from thrown errors to HTTP responses. A 500 carries the request id, logged with the error. */
export function toErrorResponse(err: unknown, requestId: string = randomUUID()): NextResponse<ErrorBody> {
  if (err instanceof z.ZodError) err = validationError(err);
  if (err instanceof AppError) {
    const headers: Record<string, string> = {};
    if (err.retryAfter) headers['Retry-After'] = String(err.retryAfter);
    return NextResponse.json(
      { error: { code: err.code, message: err.message, fields: err.fields, retryAfter: err.retryAfter, title: err.title } },
      { status: err.status, headers },
    );
  }
  const id = requestId;
  logger().error({ reqId: id, err }, 'unhandled error');
  return NextResponse.json(
    { error: { code: 'internal', message: `Something went wrong on our side. Quote reference ${id} if it persists.`, id } },
    { status: 500 },
  );
}

type Ctx<P> = { params: Promise<P> };

// A request id from a proxy or load balancer is kept when it looks like one; otherwise a new one is made.
const REQUEST_ID = /^[A-Za-z0-9._:-]{8,128}$/;
export const requestIdOf = (req: Request): string => {
  const given = req.headers.get('x-request-id');
  return given && REQUEST_ID.test(given) ? given : randomUUID();
};

/**
 * Wraps a route handler: errors of any kind go through `toErrorResponse`; every answer carries `X-Request-Id`
 * and is logged as one JSON line with that id, the status and the time taken.
 */
export function route<P = Record<string, string>>(
  fn: (req: NextRequest, ctx: Ctx<P>) => Promise<Response>,
): (req: NextRequest, ctx: Ctx<P>) => Promise<Response> {
  return async (req, ctx) => {
    const reqId = requestIdOf(req);
    const started = performance.now();
    let res: Response;
    try {
      if (!['GET', 'HEAD', 'OPTIONS'].includes(req.method)) assertSameOrigin(req);
      res = await fn(req, ctx);
    } catch (err) {
      res = toErrorResponse(err, reqId);
    }
    try {
      res.headers.set('X-Request-Id', reqId);
    } catch {
      // A response with immutable headers (passed through from fetch) goes out as it is.
    }
    logger().info({ reqId, method: req.method, path: req.nextUrl.pathname, status: res.status, ms: Math.round((performance.now() - started) * 10) / 10 }, 'request');
    return res;
  };
}

/**
 * Cross-site form posts are refused: a state-changing request from a browser must come from our own origin.
 * Requests without an Origin header (server-to-server API clients with a key) pass; cookies are SameSite=Lax too.
 */
function assertSameOrigin(req: NextRequest): void {
  const origin = req.headers.get('origin');
  if (!origin) return;
  const allowed = new Set([new URL(env().APP_URL).origin, req.nextUrl.origin]);
  if (!allowed.has(origin)) throw new AppError('forbidden', 'Cross-site request refused: this action must come from the Stochos app itself.');
}

/** JSON bodies are capped at 1 MiB unless a route documents more (the simulate API takes 4 MiB). */
export const JSON_BODY_LIMIT = 1024 * 1024;

const size = (bytes: number) => (bytes >= 1024 * 1024 ? `${+(bytes / 1024 / 1024).toFixed(1)} MiB` : `${Math.ceil(bytes / 1024)} KiB`);

function tooLarge(limit: number, what: string): AppError {
  return new AppError('payload_too_large', `The ${what} is larger than ${size(limit)}, the most this endpoint accepts. Send less data.`);
}

/**
 * Reads a request body, counting bytes as they arrive: a missing or false Content-Length does not help, and
 * reading stops at the first byte over the limit (→ 413), so nothing larger is ever held in memory.
 */
export async function readBody(req: Request, limit: number, what = 'request body'): Promise<Uint8Array> {
  const declared = req.headers.get('content-length');
  if (declared !== null && Number(declared) > limit) throw tooLarge(limit, what);
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await discardRest(reader, total);
      throw tooLarge(limit, what);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** Past the limit nothing is kept; bytes are read and dropped (up to 64 MiB) so the client can read the 413. */
async function discardRest(reader: ReadableStreamDefaultReader<Uint8Array>, seen: number): Promise<void> {
  const DRAIN_MAX = 64 * 1024 * 1024;
  try {
    for (let n = seen; n <= DRAIN_MAX; ) {
      const { done, value } = await reader.read();
      if (done) return;
      n += value.byteLength;
    }
    // A sender that keeps going gets its connection closed instead.
    await reader.cancel();
  } catch {
    // The client went away: nothing to answer.
  }
}

/** The body as UTF-8 text, within `limit` bytes. */
export async function readText(req: Request, limit = JSON_BODY_LIMIT): Promise<string> {
  return new TextDecoder().decode(await readBody(req, limit));
}

/** A multipart form within `limit` bytes (the whole body, files included). */
export async function readForm(req: Request, limit: number, what = 'upload'): Promise<FormData> {
  const type = req.headers.get('content-type') ?? '';
  const bytes = await readBody(req, limit, what);
  try {
    return await new Response(bytes as BodyInit, { headers: { 'content-type': type } }).formData();
  } catch {
    throw new AppError('bad_request', 'The upload is not a well-formed multipart/form-data body.');
  }
}

/**
 * Parses a JSON body with a zod schema; wrong content type → 415, over `limit` bytes → 413, malformed JSON → 400,
 * bad fields → 422.
 */
export async function readJson<T extends z.ZodType>(req: Request, schema: T, opts: { limit?: number } = {}): Promise<z.infer<T>> {
  const type = req.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('application/json')) {
    throw new AppError('unsupported_media_type', 'Send the request body as JSON (Content-Type: application/json).');
  }
  const text = new TextDecoder().decode(await readBody(req, opts.limit ?? JSON_BODY_LIMIT, 'JSON body'));
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    throw new AppError('bad_request', 'The request body is not valid JSON.');
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw validationError(parsed.error);
  return parsed.data;
}

export function parseParams<T extends z.ZodType>(params: unknown, schema: T): z.infer<T> {
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw new AppError('not_found', 'That record was not found.');
  return parsed.data;
}

export const json = <T>(data: T, status = 200) => NextResponse.json(data, { status });
export const noContent = () => new NextResponse(null, { status: 204 });
