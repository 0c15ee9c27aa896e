import 'server-only';
import { NextResponse } from 'next/server';
import { z } from 'zod';
import { fieldError } from '@/lib/server/http/errors';
import { admitRun, firmRunsInProgress, type RunCaller } from './admission';
import { budgetMessage, workOf } from './budget';
import { runLimits } from './limits';
import { failureError, poolError } from './failures';
import { poolStats, runOnPool, type PoolReply, type PoolStats } from './pool';
import type { RunTask } from './pool-worker';

export const MAX_RETURNED_SAMPLES = 100_000;

export const simulateRequestSchema = z
  .object({
    model: z.unknown().refine((v) => typeof v === 'object' && v !== null && !Array.isArray(v), 'Send the model as a JSON object (schema "stochos.model/1").'),
    dialValues: z.record(z.string(), z.number().finite()).optional(),
    samples: z
      .object({
        which: z.enum(['outputs', 'all']).default('outputs'),
        limit: z.number().int().min(1).max(MAX_RETURNED_SAMPLES, `At most ${MAX_RETURNED_SAMPLES.toLocaleString('en')} samples per column.`).default(10_000),
      })
      .optional(),
    percentiles: z.array(z.number().gt(0).lt(1)).max(50).optional(),
  })
  .strict();

export type SimulateRequest = z.infer<typeof simulateRequestSchema>;

/** Refusals that need no thread: over the work budget, or too many sample values to send back. */
export function checkUpFront(req: SimulateRequest): void {
  const l = runLimits();
  const w = workOf(req.model);
  if (w && w.work > l.maxWork) throw fieldError('model.settings.trials', budgetMessage(w, l.maxWork));
  if (w && req.samples) {
    const m = req.model as { template?: unknown; outputs?: unknown[]; riskEvents?: unknown[] };
    // Output columns: one for stack and cost models, one per formula output. 'all' adds the sampled columns and,
    // for a cost range, each risk event's cost (occurs × impact).
    const outputs = m.template === 'formula' && Array.isArray(m.outputs) ? m.outputs.length : 1;
    const derived = m.template === 'cost-range' && Array.isArray(m.riskEvents) ? m.riskEvents.length : 0;
    const columns = outputs + (req.samples.which === 'all' ? w.columns + derived : 0);
    const values = req.samples.limit * columns;
    if (values > l.maxSampleValues) {
      const most = Math.floor(l.maxSampleValues / columns);
      throw fieldError('samples.limit', `That asks for ${values.toLocaleString('en')} sample values (${columns} columns × ${req.samples.limit.toLocaleString('en')}); a response carries at most ${l.maxSampleValues.toLocaleString('en')}. Set samples.limit to ${most.toLocaleString('en')} or fewer.`);
    }
  }
}

export function runCaller(c: { firmId: string; userId: string | null; keyId: string | null; via: 'api-key' | 'session' }): RunCaller {
  return { firmId: c.firmId, caller: c.keyId ? `key:${c.keyId}` : `user:${c.userId}`, via: c.via };
}

/**
 * Runs the model on a pool thread with the same engine the browser uses. The response body is the worker's JSON,
 * passed through as bytes: the request thread neither runs nor serialises anything heavy.
 */
export async function simulate(req: SimulateRequest, caller: RunCaller): Promise<Response> {
  checkUpFront(req);
  const admission = await admitRun(caller);
  let reply: PoolReply;
  try {
    const task: RunTask = {
      model: req.model,
      dialValues: req.dialValues,
      percentiles: req.percentiles,
      reply: 'json',
      samples: { which: req.samples?.which ?? 'none', limit: req.samples?.limit ?? 0 },
      maxWork: runLimits().maxWork,
    };
    reply = await runOnPool(task).catch(poolError);
  } finally {
    await admission.release();
  }
  if (!reply.ok) throw failureError(reply.failure);
  if (!('json' in reply)) throw new Error('The run worker sent a result where a JSON body was expected.');
  return new NextResponse(reply.json as Uint8Array<ArrayBuffer>, { status: 200, headers: { 'content-type': 'application/json' } });
}

export interface RunStatus {
  limits: {
    maxWork: number;
    timeLimitSeconds: number;
    concurrentPerKey: number;
    concurrentPerFirm: number;
    ratePerKeyPerMinute: number;
    ratePerFirmPerMinute: number;
    maxSampleValues: number;
  };
  /** Runs of the caller's firm in progress on any instance. */
  firmRunsInProgress: number;
  /** This instance's pool. */
  pool: PoolStats;
}

export async function runStatus(caller: RunCaller): Promise<RunStatus> {
  const l = runLimits();
  return {
    limits: {
      maxWork: l.maxWork,
      timeLimitSeconds: l.timeLimitMs / 1000,
      concurrentPerKey: l.concurrentPerKey,
      concurrentPerFirm: l.concurrentPerFirm,
      ratePerKeyPerMinute: l.ratePerKey,
      ratePerFirmPerMinute: l.ratePerFirm,
      maxSampleValues: l.maxSampleValues,
    },
    firmRunsInProgress: await firmRunsInProgress(caller.firmId),
    pool: poolStats(),
  };
}
