import { route, readJson, json } from '@/lib/http/handler';
import { requireMemberOrApiKey } from '@/lib/auth/api-key';
import { simulate, simulateRequestSchema } from '@/lib/simulate/run';

// A model with empirical inputs can carry long value lists: this API takes JSON bodies up to 4 MiB (documented
// in README.md and /docs/model-json); every other JSON endpoint takes 1 MiB.
const SIMULATE_BODY_LIMIT = 4 * 1024 * 1024;

// POST /api/v1/simulate — runs a model on the server; see /docs/model-json for the model format.
export const POST = route(async (req) => {
  await requireMemberOrApiKey('models.run');
  const body = await readJson(req, simulateRequestSchema, { limit: SIMULATE_BODY_LIMIT });
  return json(simulate(body));
});
