/**
 * Browser entry for the worker parity test: runs the example models through the real
 * worker pool client and workers (1, 2 or 4 of them), and exposes fingerprints of the
 * results to the test.
 */
import { EngineWorkerClient } from '@/lib/core/engine/worker-client';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';
import { fingerprint, type Fingerprint } from './engine-helpers';

declare global {
  interface Window {
    engineParity: {
      run(models: Record<string, unknown>, workers?: number): Promise<Record<string, Fingerprint>>;
      supersede(): Promise<{ first: string; second: string; progressEvents: number }>;
      dialMoves(model: unknown, moves: Record<string, number>[], workers: number, samples: 'none' | 'all'): Promise<{ final: Fingerprint[]; stages: string[][]; headlines: string[] }>;
    };
  }
}

const clients = new Map<number, EngineWorkerClient>();
const poolOf = (workers: number) => {
  let c = clients.get(workers);
  if (!c) clients.set(workers, (c = new EngineWorkerClient({ createWorker: () => new Worker('/worker.js'), check: validateModel, workers })));
  return c;
};
const client = poolOf(2);

/** The page's models arrive as JSON from the test: parsed here, as the studio parses a model before it runs it. */
function checked(model: unknown): CheckedModel {
  const r = validateModel(model);
  if (!r.ok) throw new Error(`The test model does not validate: ${r.issues[0]?.message ?? 'unknown problem'}`);
  return r.model;
}

window.engineParity = {
  async run(models, workers = 2) {
    const out: Record<string, Fingerprint> = {};
    for (const [name, model] of Object.entries(models)) {
      out[name] = fingerprint(await poolOf(workers).run(checked(model), { samples: 'all' }));
    }
    return out;
  },
  /**
   * Dial moves on one pool, as a viewer makes them: each run keeps the unchanged inputs'
   * columns (workers and page) and posts its headline and charts steps before the result.
   */
  async dialMoves(model, moves, workers, samples) {
    const pool = new EngineWorkerClient({ createWorker: () => new Worker('/worker.js'), check: validateModel, workers });
    const final: Fingerprint[] = [];
    const stages: string[][] = [];
    const headlines: string[] = [];
    for (const dialValues of moves) {
      const seen: string[] = [];
      let headline = '';
      const r = await pool.run(checked(model), {
        dialValues,
        samples,
        onStage: (stage, partial) => {
          seen.push(stage);
          if (stage === 'headline') headline = JSON.stringify([partial.outputs.map((o) => [o.mean, o.sd, o.percentiles, o.limits, o.min, o.max]), partial.stack?.monteCarlo ?? null, partial.cost ? { ...partial.cost, analytic: null } : null]);
        },
      });
      seen.push('done');
      stages.push(seen);
      headlines.push(headline === JSON.stringify([r.outputs.map((o) => [o.mean, o.sd, o.percentiles, o.limits, o.min, o.max]), r.stack?.monteCarlo ?? null, r.cost ? { ...r.cost, analytic: null } : null]) ? 'same' : headline);
      final.push(fingerprint(r));
    }
    pool.terminate();
    return { final, stages, headlines };
  },
  async supersede() {
    const big = JSON.parse(JSON.stringify(EXAMPLE_MODELS.formula));
    big.settings.trials = 400_000;
    let progressEvents = 0;
    const first = client.run(checked(big), { onProgress: () => progressEvents++ }).then(
      () => 'finished',
      (e: Error) => e.name,
    );
    await new Promise((r) => setTimeout(r, 30));
    const second = await client.run(checked(EXAMPLE_MODELS['linear-stack']), { onProgress: () => progressEvents++ }).then((r) => `finished ${r.outputs[0].id}`);
    return { first: await first, second, progressEvents };
  },
};
