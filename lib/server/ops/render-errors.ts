import 'server-only';
import { logger } from '@/lib/server/ops/log';

// Errors thrown while rendering a page (not in route handlers, which route() logs with their X-Request-Id). Next
// sends the browser only a digest of such an error; the error screens show it as the reference to quote, and this
// log line carries the same digest, so the one can be found from the other.

export interface RenderErrorRequest {
  path: string;
  method: string;
  headers: Record<string, string | string[] | undefined>;
}

export interface RenderErrorContext {
  routerKind?: string;
  routePath?: string;
  routeType?: string;
}

export function errorDigest(err: unknown): string | null {
  if (err && typeof err === 'object' && 'digest' in err && typeof err.digest === 'string' && err.digest) return err.digest;
  return null;
}

// notFound(), redirect() and friends travel as errors too; they are answers, not failures.
const CONTROL_FLOW = /^(NEXT_HTTP_ERROR_FALLBACK|NEXT_REDIRECT|NEXT_NOT_FOUND|DYNAMIC_SERVER_USAGE|BAILOUT_TO_CLIENT_SIDE_RENDERING)/;

export function logRenderError(err: unknown, request: RenderErrorRequest, context: RenderErrorContext): void {
  const digest = errorDigest(err);
  if (digest && CONTROL_FLOW.test(digest)) return;
  const given = request.headers['x-request-id'];
  logger().error(
    {
      digest,
      reqId: typeof given === 'string' ? given : undefined,
      method: request.method,
      path: request.path.split('?')[0],
      route: context.routePath,
      kind: context.routeType,
      err,
    },
    'render error',
  );
}
