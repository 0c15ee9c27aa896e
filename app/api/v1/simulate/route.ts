import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMemberOrApiKey } from '@/lib/server/auth/api-key';
import { runCaller, runStatus, simulate, simulateRequestSchema } from '@/lib/server/simulate/run';

// A model with empirical inputs can carry long value lists: this API takes JSON bodies up to 4 MiB (documented
// in README.md and /docs/model-json); every other JSON endpoint takes 1 MiB.
const SIMULATE_BODY_LIMIT = 4 * 1024 * 1024;

// POST /api/v1/simulate — runs a model on the server's worker pool; see /docs/model-json for the model format and
// the limits (work budget, time limit, runs in progress, runs per minute).
export const POST = route(async (req) => {
  const caller = runCaller(await requireMemberOrApiKey('models.run'));
  const body = await readJson(req, simulateRequestSchema, { limit: SIMULATE_BODY_LIMIT });
  return simulate(body, caller);
});

// GET /api/v1/simulate — the limits that apply, the firm's runs in progress and this instance's pool.
export const GET = route(async () => {
  const caller = runCaller(await requireMemberOrApiKey('models.run'));
  return json(await runStatus(caller));
});
