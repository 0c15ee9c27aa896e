import type { Instrumentation } from 'next';

// Runs once when the server starts: a server with a missing or unsafe setting refuses to start
// (AUTH_SECRET, APP_URL, STRIPE_WEBHOOK_SECRET ...) instead of failing on the first request.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME === 'nodejs' && process.env.NEXT_PHASE !== 'phase-production-build') {
    const { checkEnvironmentOrExit } = await import('./lib/server/startup-check');
    checkEnvironmentOrExit();
  }
}

// A page that fails while rendering is logged as one JSON line with the digest its error screen shows.
export const onRequestError: Instrumentation.onRequestError = async (err, request, context) => {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { logRenderError } = await import('./lib/server/ops/render-errors');
  logRenderError(err, request, context);
};
