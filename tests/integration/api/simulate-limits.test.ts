import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startStack, type Stack } from '@/lib/dev/stack';
import { exampleCostRange, exampleFormula, exampleLinearStack, runModelSync } from '../../../lib/core/engine';
import type { Client } from '../../support/http-client';
import { newFirm } from '../../support/firms';

// The limits of server runs, against the production build. This file starts its own instance with small limits
// (a 1.5 s time limit, 1 run at once per key and 2 per firm, 5 runs a minute per key), so each refusal is reached
// with a few requests and the shared instance keeps its defaults. Ports: 3500/2925/2926/12511 + TEST_PORT_OFFSET.

const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);
const LIMITS = {
  SIMULATE_TIME_LIMIT_MS: '1500',
  SIMULATE_MAX_CONCURRENT_PER_KEY: '1',
  SIMULATE_MAX_CONCURRENT_PER_FIRM: '2',
  SIMULATE_RATE_PER_KEY: '5',
  SIMULATE_RATE_PER_FIRM: '1000',
  SIMULATE_THREADS: '1',
};

let stack: Stack;
let dataDir: string;
let appUrl: string;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-limits-'));
  stack = await startStack({ dataDir, appPort: 3500 + OFF, smtpPort: 2925 + OFF, mailboxPort: 2926 + OFF, stripePort: 12511 + OFF, seed: false, quiet: true, extraEnv: LIMITS });
  appUrl = stack.appUrl;
});
afterAll(async () => {
  await stack?.stop();
  if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
});

function stackModel(trials: number, contributors: number) {
  return {
    schema: 'stochos.model/1',
    template: 'linear-stack',
    title: `Test stack, ${contributors} parts`,
    unit: 'mm',
    settings: { trials, seed: 'limits-test', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
    contributors: Array.from({ length: contributors }, (_, i) => ({
      id: `part_${i}`,
      name: `Part ${i}`,
      nominal: 10 + i,
      plusTol: 0.05,
      minusTol: 0.05,
      direction: i % 2 === 0 ? 1 : -1,
      distribution: { type: 'normal', k: 3 },
      meanShift: 0,
    })),
    limits: { lower: -5, upper: 5 },
    dials: [],
  };
}
const tiny = stackModel(1000, 3);
// At the budget (2,000,000 trials × 10 inputs = 20,000,000 draws) and far beyond 1.5 s however fast the sampling:
// Iman–Conover reorders all ten columns of two million trials by rank, which takes some twenty sorts of them.
const long = {
  schema: 'stochos.model/1',
  template: 'formula',
  title: 'Ten correlated inputs',
  settings: { trials: 2_000_000, seed: 'limits-long', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'iman-conover' },
  inputs: Array.from({ length: 10 }, (_, i) => ({ id: `x${i}`, name: `Input ${i}`, unit: '', distribution: { type: 'normal', mean: 10 * (i + 1), sd: 1 + i / 10 } })),
  correlation: {
    inputs: Array.from({ length: 10 }, (_, i) => `x${i}`),
    matrix: Array.from({ length: 10 }, (_, i) => Array.from({ length: 10 }, (_, j) => (i === j ? 1 : 0.3))),
  },
  outputs: [{ id: 'total', name: 'Total', unit: '', formula: Array.from({ length: 10 }, (_, i) => `x${i}`).join(' + ') }],
  dials: [],
};

type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string[]>; retryAfter?: number } };
interface Status {
  limits: { maxWork: number; timeLimitSeconds: number; concurrentPerKey: number; concurrentPerFirm: number; ratePerKeyPerMinute: number };
  firmRunsInProgress: number;
  pool: { threads: number; maxThreads: number; running: number; queued: number };
}

async function newKey(owner: Client, name: string): Promise<string> {
  const created = await owner.json<{ key: { secret: string } }>('POST', '/api/api-keys', { name });
  expect(created.status).toBe(201);
  return created.body.key.secret;
}

const callWithKey = (key: string, body: unknown) =>
  fetch(`${appUrl}/api/v1/simulate`, { method: 'POST', headers: { authorization: `Bearer ${key}`, 'content-type': 'application/json' }, body: JSON.stringify(body) });

/** Nothing of the firm in progress and nothing on or waiting for this instance's threads. */
async function expectIdle(owner: Client): Promise<void> {
  const s = await owner.json<Status>('GET', '/api/v1/simulate');
  expect(s.status).toBe(200);
  expect(s.body.firmRunsInProgress).toBe(0);
  expect(s.body.pool).toMatchObject({ running: 0, queued: 0 });
}

describe('server run limits (POST /api/v1/simulate)', () => {
  it('states the limits in force', async () => {
    const { owner } = await newFirm(appUrl, 'limits-status', stack.mailboxUrl);
    const s = await owner.json<Status>('GET', '/api/v1/simulate');
    expect(s.status).toBe(200);
    expect(s.body.limits).toMatchObject({ maxWork: 20_000_000, timeLimitSeconds: 1.5, concurrentPerKey: 1, concurrentPerFirm: 2, ratePerKeyPerMinute: 5 });
    expect(s.body.pool.maxThreads).toBe(1);
    expect((await fetch(`${appUrl}/api/v1/simulate`)).status).toBe(401);
  });

  it('gives the worker’s result, bit for bit the engine’s in this process (worker = server)', async () => {
    const { owner } = await newFirm(appUrl, 'limits-bits', stack.mailboxUrl);
    for (const model of [exampleLinearStack, exampleCostRange, exampleFormula].map((m) => ({ ...m, settings: { ...m.settings, trials: 4000 } }))) {
      const res = await owner.json<Record<string, unknown>>('POST', '/api/v1/simulate', { model, samples: { which: 'all', limit: 300 }, percentiles: [0.01, 0.99] });
      expect(res.status).toBe(200);
      const local = runModelSync(model, { samples: 'all', percentiles: [0.01, 0.99] });
      const cut = (cols: Record<string, Float64Array>) => Object.fromEntries(Object.entries(cols).map(([k, v]) => [k, Array.from(v.subarray(0, 300))]));
      const expected = JSON.parse(JSON.stringify({ ...local, samples: { outputs: cut(local.samples!.outputs), inputs: cut(local.samples!.inputs) }, timing: null }));
      expect({ ...res.body, timing: null }).toEqual(expected);
    }
    await expectIdle(owner);
  });

  it('refuses a run over the work budget up front: 422 naming model.settings.trials and the limit', async () => {
    const { owner } = await newFirm(appUrl, 'limits-budget', stack.mailboxUrl);
    const t0 = performance.now();
    const res = await owner.json<ErrorBody>('POST', '/api/v1/simulate', { model: stackModel(2_000_000, 200) });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields ?? {})).toEqual(['model.settings.trials']);
    expect(res.body.error.message).toMatch(/2,000,000 trials × 200 sampled columns = 400,000,000 draws; a server run may use at most 20,000,000/);
    expect(res.body.error.message).toMatch(/set model\.settings\.trials to 100,000 or fewer/);
    // Refused without running: far quicker than the run would be.
    expect(performance.now() - t0).toBeLessThan(5000);
    const samples = await owner.json<ErrorBody>('POST', '/api/v1/simulate', { model: stackModel(10_000, 50), samples: { which: 'all', limit: 100_000 } });
    expect(samples.status).toBe(422);
    expect(Object.keys(samples.body.error.fields ?? {})).toEqual(['samples.limit']);
    await expectIdle(owner);
  });

  it('stops a run over the time limit: 503 saying so, the thread freed, and the next run answers', async () => {
    const { owner } = await newFirm(appUrl, 'limits-time', stack.mailboxUrl);
    const res = await owner.json<ErrorBody>('POST', '/api/v1/simulate', { model: long });
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('unavailable');
    expect(res.body.error.message).toMatch(/did not finish within 1\.5 s, the time limit of a server run, and was stopped/);
    await expectIdle(owner);
    const next = await owner.json<{ outputs: unknown[] }>('POST', '/api/v1/simulate', { model: tiny });
    expect(next.status).toBe(200);
    await expectIdle(owner);
  });

  it('refuses a second run at once from one key, and a third from the firm: 429 with Retry-After', async () => {
    const { owner } = await newFirm(appUrl, 'limits-concurrent', stack.mailboxUrl);
    const [k1, k2, k3] = [await newKey(owner, 'one'), await newKey(owner, 'two'), await newKey(owner, 'three')];
    // Two at once from one key: one runs (and meets the time limit), the other is refused at once.
    const pair = await Promise.all([callWithKey(k1, { model: long }), callWithKey(k1, { model: long })]);
    const statuses = pair.map((r) => r.status).sort();
    expect(statuses).toEqual([429, 503]);
    const refused = pair.find((r) => r.status === 429)!;
    expect(Number(refused.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
    const body = (await refused.json()) as ErrorBody;
    expect(body.error.code).toBe('rate_limited');
    expect(body.error.message).toMatch(/This API key has 1 run in progress, the most at once/);
    await Promise.all(pair.map((r) => r.text().catch(() => '')));
    await expectIdle(owner);

    // Three keys at once: the firm's cap of two refuses one of them.
    const three = await Promise.all([k1, k2, k3].map((k) => callWithKey(k, { model: long })));
    const bodies = await Promise.all(three.map(async (r) => ({ status: r.status, retryAfter: r.headers.get('retry-after'), body: (await r.json()) as ErrorBody })));
    const firmRefusals = bodies.filter((b) => b.status === 429);
    expect(firmRefusals).toHaveLength(1);
    expect(firmRefusals[0]!.body.error.message).toMatch(/Your firm has 2 runs in progress, the most at once/);
    expect(Number(firmRefusals[0]!.retryAfter)).toBeGreaterThanOrEqual(1);
    expect(bodies.filter((b) => b.status === 503)).toHaveLength(2);
    await expectIdle(owner);
    expect((await callWithKey(k3, { model: tiny })).status).toBe(200);
  });

  it('refuses the sixth run in a minute from one key: 429 with Retry-After until the minute ends', async () => {
    const { owner } = await newFirm(appUrl, 'limits-rate', stack.mailboxUrl);
    // The counter is per fixed minute: if a minute boundary falls inside the burst, burst again in the new minute.
    for (let attempt = 0; attempt < 2; attempt++) {
      const key = await newKey(owner, `rate ${attempt}`);
      const minute = Math.floor(Date.now() / 60_000);
      const statuses: number[] = [];
      let last: Response | null = null;
      for (let i = 0; i < 6; i++) {
        last = await callWithKey(key, { model: tiny });
        statuses.push(last.status);
        if (i < 5) await last.text();
      }
      if (Math.floor(Date.now() / 60_000) !== minute) continue;
      expect(statuses).toEqual([200, 200, 200, 200, 200, 429]);
      const retryAfter = Number(last!.headers.get('retry-after'));
      expect(retryAfter).toBeGreaterThanOrEqual(1);
      expect(retryAfter).toBeLessThanOrEqual(60);
      const body = (await last!.json()) as ErrorBody;
      expect(body.error).toMatchObject({ code: 'rate_limited', retryAfter });
      expect(body.error.message).toMatch(/This API key has started 5 runs this minute, the most allowed\. Try again in \d+ seconds?\./);
      await expectIdle(owner);
      // Another key of the same firm still runs: the limit is per key (the firm's is far higher here).
      expect((await callWithKey(await newKey(owner, `other ${attempt}`), { model: tiny })).status).toBe(200);
      return;
    }
    throw new Error('two bursts each crossed a minute boundary');
  });
});
