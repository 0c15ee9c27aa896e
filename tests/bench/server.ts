/**
 * Server benchmark: `npm run bench:server` (add `-- --json` to print only the JSON line; it is always the last line).
 * Needs `npm run build` first. Starts the production build with a fresh database, signs up a firm, then:
 *
 *  - measures `GET /api/me` on an idle server for five seconds (the reference, in the same run);
 *  - sends the request, 2,000,000 trials × 200 contributors, which the work budget refuses up front;
 *  - sends the largest allowed simulate request (2,000,000 trials × 10 contributors = the work budget) and, while
 *    it runs, asks `GET /api/me` back to back, reporting the worst latency.
 *
 * A figure, not a pass/fail check. TEST_PORT_OFFSET moves the ports, as for the tests.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { startStack } from '@/lib/dev/stack';
import { workOf } from '@/lib/server/simulate/budget';
import { newFirm } from '../support/firms';

const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);
const jsonOnly = process.argv.includes('--json');
const log = (...a: unknown[]) => {
  if (!jsonOnly) console.log(...a);
};

function stackModel(trials: number, contributors: number) {
  return {
    schema: 'stochos.model/1',
    template: 'linear-stack',
    title: `Bench stack, ${contributors} parts`,
    unit: 'mm',
    settings: { trials, seed: 'bench-server', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
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

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))] ?? NaN;
};
const r1 = (x: number) => Math.round(x * 10) / 10;

async function timed(f: () => Promise<Response>): Promise<{ ms: number; status: number; text: string }> {
  const t0 = performance.now();
  const res = await f();
  const text = await res.text();
  return { ms: performance.now() - t0, status: res.status, text };
}

async function main(): Promise<void> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-bench-server-'));
  const stack = await startStack({ dataDir, appPort: 3400 + OFF, smtpPort: 2825 + OFF, mailboxPort: 2826 + OFF, stripePort: 12411 + OFF, seed: false, quiet: true });
  try {
    const { owner } = await newFirm(stack.appUrl, 'bench', stack.mailboxUrl);
    const me = () => timed(() => owner.get('/api/me'));
    const simulate = (model: unknown) => timed(() => owner.post('/api/v1/simulate', { model }));
    const limits = (await owner.json<{ limits: { maxWork: number; timeLimitSeconds: number }; pool: { maxThreads: number } }>('GET', '/api/v1/simulate')).body;

    // Warm up the routes (first requests compile nothing in production, but open the database and the pool).
    for (let i = 0; i < 5; i++) await me();
    await simulate(stackModel(1000, 10));

    // Idle reference: the same back-to-back requests for five seconds, so machine noise shows in both figures.
    const idle: number[] = [];
    const idleUntil = performance.now() + 5000;
    while (performance.now() < idleUntil) {
      idle.push((await me()).ms);
      await new Promise((res) => setTimeout(res, 20));
    }

    const tooBig = stackModel(2_000_000, 200);
    const refused = await simulate(tooBig);

    const largest = stackModel(2_000_000, 10);
    const w = workOf(largest)!;
    let running = true;
    const run = simulate(largest).finally(() => (running = false));
    const during: number[] = [];
    const meStatuses = new Set<number>();
    while (running) {
      const r = await me();
      if (running) {
        during.push(r.ms);
        meStatuses.add(r.status);
      }
      await new Promise((res) => setTimeout(res, 20));
    }
    const big = await run;

    const report = {
      measuredAt: new Date().toISOString(),
      cores: os.availableParallelism(),
      limits: { ...limits.limits, threads: limits.pool.maxThreads },
      meIdle: { n: idle.length, medianMs: r1(quantile(idle, 0.5)), p99Ms: r1(quantile(idle, 0.99)), worstMs: r1(Math.max(...idle)) },
      refused: { trials: 2_000_000, contributors: 200, status: refused.status, ms: r1(refused.ms), message: (JSON.parse(refused.text) as { error?: { message: string } }).error?.message ?? null },
      largestAllowed: { trials: w.trials, contributors: w.columns, work: w.work, status: big.status, ms: Math.round(big.ms) },
      meDuringRun: { n: during.length, statuses: [...meStatuses], medianMs: r1(quantile(during, 0.5)), p99Ms: r1(quantile(during, 0.99)), worstMs: r1(Math.max(...during)) },
    };
    log('server benchmark (production build, one instance)');
    log(`  limits: work ${report.limits.maxWork.toLocaleString('en')}, time ${report.limits.timeLimitSeconds} s, ${report.limits.threads} run thread(s) on ${report.cores} cores`);
    log(`  GET /api/me, idle:                 median ${report.meIdle.medianMs} ms, p99 ${report.meIdle.p99Ms} ms, worst ${report.meIdle.worstMs} ms (${report.meIdle.n} requests)`);
    log(`  2,000,000 × 200 simulate:          ${report.refused.status} in ${report.refused.ms} ms — ${report.refused.message}`);
    log(`  2,000,000 × 10 simulate (largest): ${report.largestAllowed.status} in ${report.largestAllowed.ms} ms`);
    log(`  GET /api/me during that run:       median ${report.meDuringRun.medianMs} ms, p99 ${report.meDuringRun.p99Ms} ms, worst ${report.meDuringRun.worstMs} ms (${report.meDuringRun.n} requests, status ${report.meDuringRun.statuses.join(', ')})`);
    console.log(JSON.stringify({ benchServer: report }));
  } finally {
    await stack.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
