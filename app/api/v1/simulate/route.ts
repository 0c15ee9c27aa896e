import { route, readJson, json } from '@/lib/http/handler';
import { requireMemberOrApiKey } from '@/lib/auth/api-key';
import { simulate, simulateRequestSchema } from '@/lib/simulate/run';

// POST /api/v1/simulate — runs a model on the server; see /docs/model-json for the model format.
export const POST = route(async (req) => {
  await requireMemberOrApiKey('models.run');
  const body = await readJson(req, simulateRequestSchema);
  return json(simulate(body));
});
