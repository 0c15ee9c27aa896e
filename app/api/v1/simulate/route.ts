import { route, readJson, json } from '@/lib/http/handler';
import { requireMemberOrApiKey } from '@/lib/auth/api-key';
import { runCaller, runStatus, simulate, simulateRequestSchema } from '@/lib/simulate/run';

// POST /api/v1/simulate — runs a model on the server's worker pool; see /docs/model-json for the model format and
// the limits (work budget, time limit, runs in progress, runs per minute).
export const POST = route(async (req) => {
  const caller = runCaller(await requireMemberOrApiKey('models.run'));
  const body = await readJson(req, simulateRequestSchema);
  return simulate(body, caller);
});

// GET /api/v1/simulate — the limits that apply, the firm's runs in progress and this instance's pool.
export const GET = route(async () => {
  const caller = runCaller(await requireMemberOrApiKey('models.run'));
  return json(await runStatus(caller));
});
