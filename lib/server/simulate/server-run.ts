import 'server-only';
import type { RunResult } from '@/lib/core/engine';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import { failureError, poolError } from './failures';
import { runLimits } from './limits';
import { runOnPool } from './pool';

/**
 * A model run on the pool for the server's own use (snapshot PDFs), under the same work budget and time limit as the
 * API: the RunResult, or an Error saying what was wrong.
 */
export async function runForServer(model: CheckedModel, dialValues: Record<string, number>): Promise<RunResult> {
  const reply = await runOnPool({ model, checked: true, dialValues, reply: 'result', maxWork: runLimits().maxWork }).catch(poolError);
  if (!reply.ok) {
    const e = failureError(reply.failure);
    const detail = reply.failure.kind === 'model' ? Object.entries(e.fields ?? {}).map(([k, v]) => `${k}: ${v.join(' ')}`) : [];
    throw new Error([e.message, ...detail].join(' '));
  }
  if (!('result' in reply)) throw new Error('The run worker sent a JSON body where a result was expected.');
  return reply.result;
}
