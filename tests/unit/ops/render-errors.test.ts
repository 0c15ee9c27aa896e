import { describe, it, expect, beforeEach } from 'vitest';
import { captureLog } from '../../support/captured-log';
import { logRenderError } from '@/lib/server/ops/render-errors';
import { onRequestError } from '@/instrumentation';

// A page that fails while rendering shows its digest as the reference (components/segments/error-screen.tsx); the
// server's log line must carry the same digest, or the reference leads nowhere.
const lines = captureLog();
beforeEach(() => {
  lines.length = 0;
});

const settle = () => new Promise((r) => setImmediate(r));
const failure = (message: string, digest: string) => Object.assign(new Error(message), { digest });
const request = { path: '/app/models/x?tab=runs', method: 'GET', headers: { 'x-request-id': 'req-12345678' } };
const context = { routerKind: 'App Router', routePath: '/app/models/[id]', routeType: 'render' };

describe('render errors in the log', () => {
  it('logs one error line with the digest the error screen shows, the route and the request id', async () => {
    logRenderError(failure('query failed', '4079023984'), request, context);
    await settle();
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ level: 'error', msg: 'render error', digest: '4079023984', reqId: 'req-12345678', method: 'GET', path: '/app/models/x', route: '/app/models/[id]', kind: 'render' });
    expect((lines[0]!.err as { message: string }).message).toBe('query failed');
  });

  it('leaves out notFound() and redirect(), which are answers rather than failures', async () => {
    logRenderError(failure('NEXT_HTTP_ERROR_FALLBACK;404', 'NEXT_HTTP_ERROR_FALLBACK;404'), request, context);
    logRenderError(failure('NEXT_REDIRECT', 'NEXT_REDIRECT;replace;/sign-in;307;'), request, context);
    await settle();
    expect(lines).toEqual([]);
  });

  it('is what instrumentation.ts hands Next as onRequestError on the Node.js runtime', async () => {
    const runtime = process.env.NEXT_RUNTIME;
    process.env.NEXT_RUNTIME = 'nodejs';
    try {
      await onRequestError(failure('boom', '1234567'), request, { ...context, renderSource: 'server-rendering', revalidateReason: undefined, renderType: 'dynamic' } as never);
    } finally {
      if (runtime === undefined) delete process.env.NEXT_RUNTIME;
      else process.env.NEXT_RUNTIME = runtime;
    }
    await settle();
    expect(lines.map((l) => l.digest)).toEqual(['1234567']);
  });
});
