/**
 * Engine benchmark: `npm run bench` (add `-- --json` for one JSON object on the last line; `-- --r1` for only
 * the R1 rows that compare with NumPy: parallel, single thread and NumPy, back to back).
 * Every figure is the median of 5 timed runs after a warm-up run, in this Node process.
 *
 *  - draws per second for each distribution and sampling method;
 *  - R1: 10 correlated normals (mu_i = 10 i, sigma_i = 1 + i/10, rho^|i-j| with rho = 0.6),
 *    output = sum, 1,000,000 trials, plain Monte Carlo, through the real model path: the
 *    chunks on one thread (single) and on a pool of Node worker threads, one per core
 *    (parallel); both merge the output column and select P5/P50/P95 on this thread;
 *  - R2: cost range, 40 beta-PERT items (90, 100, 130), items 1-20 pairwise 0.3 through the
 *    copula, 10 risk events (p 0.1, impact triangular 5, 10, 30), 200,000 trials;
 *  - R3: 20-contributor linear stack, 50,000 trials, one dial moved: the interactive path
 *    (a runner that keeps the unchanged contributors' columns, their merged windows and
 *    ranks, as the page's pool does), full report.
 *
 * Times are reported as wall clock and as this process's CPU time (user + system): on a
 * shared machine the CPU time is the steadier figure. When python3 with NumPy is present,
 * tests/bench/r1-numpy.py runs right after R1 so both are measured under the same load.
 */
import { spawnSync } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { ChunkRunner, EMPTY_MOMENTS, mergeMoments, type ChunkPart, type Moments } from '@/lib/core/engine/chunks';
import { prepareRun } from '@/lib/core/engine/prepare-run';
import { createMarginal, type DistributionSpec } from '@/lib/core/engine/distributions';
import { createColumnSampler, type SamplerContext } from '@/lib/core/engine/samplers';
import { ColumnStore, mergeParts, runModelSync } from '@/lib/core/engine/simulate';
import { percentilesBySelection, RankStore } from '@/lib/core/engine/stats';
import { createNodeEnginePool } from '@/tests/support/node-engine-pool';

const json = process.argv.includes('--json');
/** `--r1`: only the R1 rows that compare with NumPy (parallel, single, NumPy), for quick iterations. */
const onlyR1 = process.argv.includes('--r1');
const REPEATS = 5;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** The same for an async function (the worker-thread pool). */
async function timeAsync<T>(fn: () => Promise<T>): Promise<{ ms: number; cpuMs: number; value: T }> {
  let value = await fn();
  const walls: number[] = [];
  const cpus: number[] = [];
  for (let i = 0; i < REPEATS; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    value = await fn();
    walls.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpus.push((c.user + c.system) / 1000);
  }
  return { ms: median(walls), cpuMs: median(cpus), value };
}

/** Warm up once, then time REPEATS runs; medians of wall and CPU milliseconds, and the last value. */
function time<T>(fn: () => T): { ms: number; cpuMs: number; value: T } {
  let value = fn();
  const walls: number[] = [];
  const cpus: number[] = [];
  for (let i = 0; i < REPEATS; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    value = fn();
    walls.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpus.push((c.user + c.system) / 1000);
  }
  return { ms: median(walls), cpuMs: median(cpus), value };
}

// ---- Draws per second --------------------------------------------------------------------
const DRAWS = 1_000_000;
const distCases: [string, DistributionSpec, Partial<SamplerContext>][] = [
  ['uniform (inverse CDF)', { type: 'uniform', min: 0, max: 1 }, {}],
  ['triangular (inverse CDF)', { type: 'triangular', min: 0, mode: 3, max: 10 }, {}],
  ['normal (Box-Muller)', { type: 'normal', mean: 0, sd: 1 }, {}],
  ['normal (ziggurat)', { type: 'normal', mean: 0, sd: 1 }, { normalMethod: 'ziggurat' }],
  ['normal (inverse CDF, Latin hypercube)', { type: 'normal', mean: 0, sd: 1 }, { design: 'latin-hypercube' }],
  ['truncated normal (inverse CDF)', { type: 'normal', mean: 0, sd: 1, min: -1, max: 2 }, {}],
  ['lognormal (Box-Muller)', { type: 'lognormal', mu: 0, sigma: 0.5 }, {}],
  ['truncated lognormal (inverse CDF)', { type: 'lognormal', mu: 0, sigma: 0.5, max: 3 }, {}],
  ['exponential (inverse CDF)', { type: 'exponential', rate: 2 }, {}],
  ['Weibull (inverse CDF)', { type: 'weibull', shape: 2, scale: 1 }, {}],
  ['beta-PERT (rejection)', { type: 'pert', min: 90, mode: 100, max: 130 }, {}],
  ['beta-PERT (tabulated inverse CDF, Latin hypercube)', { type: 'pert', min: 90, mode: 100, max: 130 }, { design: 'latin-hypercube' }],
  ['discrete, 5 values (inverse CDF)', { type: 'discrete', values: [1, 2, 3, 4, 5], probabilities: [0.1, 0.2, 0.4, 0.2, 0.1] }, {}],
  ['Bernoulli (inverse CDF)', { type: 'bernoulli', p: 0.1 }, {}],
  ['empirical, 200 points (inverse ECDF)', { type: 'empirical', data: Array.from({ length: 200 }, (_, i) => Math.sqrt(i)) }, {}],
  ['drawn density, 4 points (rejection)', { type: 'drawn', points: [{ x: 0, y: 0 }, { x: 1, y: 2 }, { x: 3, y: 1 }, { x: 4, y: 0 }] }, {}],
];

const draws: { distribution: string; drawsPerSecond: number }[] = [];
for (const [name, spec, ctx] of onlyR1 ? [] : distCases) {
  const out = new Float64Array(DRAWS);
  const full: SamplerContext = { seed: 'bench', design: 'monte-carlo', normalMethod: 'box-muller', trials: DRAWS, ...ctx };
  const m = createMarginal(spec);
  const { cpuMs } = time(() => createColumnSampler(m, full, 'x').fill(out, 0, DRAWS));
  draws.push({ distribution: name, drawsPerSecond: DRAWS / (cpuMs / 1000) });
}

// ---- R1 -----------------------------------------------------------------------------------
function r1Model(normalMethod: 'box-muller' | 'ziggurat') {
  const k = 10;
  const ids = Array.from({ length: k }, (_, i) => `x${i + 1}`);
  return {
    schema: 'stochos.model/1',
    template: 'formula',
    title: 'R1: ten correlated normals',
    settings: { trials: 1_000_000, seed: 'r1', design: 'monte-carlo', normalMethod },
    inputs: ids.map((id, i) => ({ id, name: id, distribution: { type: 'normal', mean: 10 * (i + 1), sd: 1 + (i + 1) / 10 } })),
    correlation: { inputs: ids, matrix: ids.map((_, i) => ids.map((__, j) => 0.6 ** Math.abs(i - j))) },
    outputs: [{ id: 'total', name: 'Sum', formula: `sum(${ids.join(', ')})` }],
  };
}

interface R1Figures {
  ms: number;
  cpuMs: number;
  mean: number;
  p5: number;
  p50: number;
  p95: number;
}

/**
 * What NumPy's version does: sampling, correlation, the sum, then the mean and three
 * percentiles. The chunks' output columns are merged in chunk order, the moments by the
 * pairwise update, the percentiles by selection.
 */
function r1Figures(parts: ChunkPart[], trials: number): Omit<R1Figures, 'ms' | 'cpuMs'> {
  parts.sort((a, b) => a.index - b.index);
  const y = new Float64Array(trials);
  let m: Moments = EMPTY_MOMENTS;
  for (const p of parts) {
    y.set(p.outputs.total, p.start);
    m = mergeMoments(m, p.outputMoments.total);
  }
  const [p5, p50, p95] = percentilesBySelection(y, [0.05, 0.5, 0.95]);
  return { mean: m.mean, p5, p50, p95 };
}

function r1Core(model: object): R1Figures {
  const r = time(() => {
    const prep = prepareRun(model);
    const parts = new ChunkRunner().run(prep, Array.from({ length: prep.chunkCount }, (_, k) => k));
    return r1Figures(parts, prep.settings.trials);
  });
  return { ms: r.ms, cpuMs: r.cpuMs, ...r.value };
}

/** The full report (all statistics: histogram, ECDF, intervals, drivers, achieved correlations...). */
function r1Full(model: object): R1Figures {
  const r = time(() => runModelSync(model));
  const o = r.value.outputs[0];
  const pct = (p: number) => o.percentiles.find((x) => x.p === p)!.value;
  return { ms: r.ms, cpuMs: r.cpuMs, mean: o.mean as number, p5: pct(0.05), p50: pct(0.5), p95: pct(0.95) };
}

function numpyR1(): (R1Figures & { numpy: string }) | null {
  const script = path.join(__dirname, 'r1-numpy.py');
  const env = { ...process.env };
  // A fair NumPy figure: let OpenBLAS pick its own kernels.
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  const r = spawnSync('python3', [script, '--json'], { env, encoding: 'utf8', timeout: 300_000 });
  if (r.status !== 0) return null;
  const j = JSON.parse(r.stdout.trim().split('\n').at(-1) as string);
  return { numpy: j.numpy, ms: j.wallMs, cpuMs: j.cpuMs, mean: j.mean, p5: j.p5, p50: j.p50, p95: j.p95 };
}

async function r1Parallel(model: object, workers: number): Promise<R1Figures & { workers: number }> {
  const pool = await createNodeEnginePool(workers, { cache: false });
  try {
    const r = await timeAsync(async () => {
      const parts = await pool.parts(model, {}, 0);
      return r1Figures(parts, 1_000_000);
    });
    return { ms: r.ms, cpuMs: r.cpuMs, workers, ...r.value };
  } finally {
    await pool.close();
  }
}

async function r1FullParallel(model: object, workers: number): Promise<R1Figures> {
  const pool = await createNodeEnginePool(workers, { cache: false });
  try {
    const r = await timeAsync(() => pool.run(model));
    const o = r.value.outputs[0];
    const pct = (p: number) => o.percentiles.find((x) => x.p === p)!.value;
    return { ms: r.ms, cpuMs: r.cpuMs, mean: o.mean as number, p5: pct(0.05), p50: pct(0.5), p95: pct(0.95) };
  } finally {
    await pool.close();
  }
}

async function main() {
const cores = os.cpus().length;
// Parallel, single and NumPy back to back, so the three share the machine's load.
const parallel = await r1Parallel(r1Model('ziggurat'), cores);
const single = r1Core(r1Model('ziggurat'));
const numpy = numpyR1();
const fmt = (x: number, d = 1) => x.toFixed(d).padStart(9);
const row = (name: string, f: R1Figures) => console.log(name.padEnd(56) + fmt(f.ms, 0) + fmt(f.cpuMs, 0) + fmt(f.mean, 3) + fmt(f.p5, 3) + fmt(f.p50, 3) + fmt(f.p95, 3));
const r1Rows = () => {
  console.log('\nR1: 10 correlated normals, sum, 1,000,000 trials'.padEnd(57) + ' wall ms   CPU ms     mean       P5      P50      P95');
  row(`  parallel, ziggurat, ${parallel.workers} worker threads`, parallel);
  row('  single thread, ziggurat', single);
  if (numpy) row(`  NumPy ${numpy.numpy} (r1-numpy.py, same load)`, numpy);
  else console.log('  NumPy: python3 with numpy not found, reference not run');
  if (numpy) console.log(`  ratio to NumPy: parallel ${(parallel.ms / numpy.ms).toFixed(2)}, single ${(single.ms / numpy.ms).toFixed(2)} (wall)`);
};
if (onlyR1) {
  console.log(`Stochos engine benchmark, R1 only (Node ${process.version}, median of ${REPEATS} after a warm-up; load average ${os.loadavg().map((x) => x.toFixed(1)).join(' ')} on ${cores} cores)`);
  r1Rows();
  if (json) console.log(JSON.stringify({ node: process.version, repeats: REPEATS, load: os.loadavg(), cores, r1: { parallel, single, numpy, ratioParallel: numpy ? parallel.ms / numpy.ms : null, ratioSingle: numpy ? single.ms / numpy.ms : null } }));
  return;
}
const r1 = {
  parallel,
  single,
  numpy,
  ratioParallel: numpy ? parallel.ms / numpy.ms : null,
  ratioSingle: numpy ? single.ms / numpy.ms : null,
  coreBoxMuller: r1Core(r1Model('box-muller')),
  fullZiggurat: r1Full(r1Model('ziggurat')),
  fullParallelZiggurat: await r1FullParallel(r1Model('ziggurat'), cores),
  // Closed form: mean sum 10 i = 550; sd from the covariance (computed here for the table).
  expectedMean: 550,
  expectedSd: (() => {
    let v = 0;
    for (let i = 1; i <= 10; i++) for (let j = 1; j <= 10; j++) v += 0.6 ** Math.abs(i - j) * (1 + i / 10) * (1 + j / 10);
    return Math.sqrt(v);
  })(),
};

// ---- R2 -----------------------------------------------------------------------------------
const r2Model = {
  schema: 'stochos.model/1',
  template: 'cost-range',
  title: 'R2: 40 PERT items, 10 risks',
  currency: 'k',
  settings: { trials: 200_000, seed: 'r2' },
  items: Array.from({ length: 40 }, (_, i) => ({ id: `item${i + 1}`, name: `Item ${i + 1}`, low: 90, mostLikely: 100, high: 130, distribution: 'pert' })),
  correlationGroups: [{ id: 'g', items: Array.from({ length: 20 }, (_, i) => `item${i + 1}`), rho: 0.3 }],
  riskEvents: Array.from({ length: 10 }, (_, i) => ({ id: `risk${i + 1}`, name: `Risk ${i + 1}`, probability: 0.1, impact: { low: 5, mostLikely: 10, high: 30, distribution: 'triangular' } })),
  confidence: 0.8,
};
const r2run = time(() => runModelSync(r2Model));
const r2 = { ms: r2run.ms, cpuMs: r2run.cpuMs, p50: r2run.value.cost!.p50, p80: r2run.value.cost!.p80, p90: r2run.value.cost!.p90 };

// ---- R3 -----------------------------------------------------------------------------------
const kinds = [{ type: 'normal', k: 3 }, { type: 'uniform' }, { type: 'triangular' }, { type: 'normal', k: 4 }];
const r3Model = {
  schema: 'stochos.model/1',
  template: 'linear-stack',
  title: 'R3: 20-contributor stack',
  unit: 'mm',
  settings: { trials: 50_000, seed: 'r3' },
  contributors: Array.from({ length: 20 }, (_, i) => ({
    id: `c${i + 1}`,
    name: `Part ${i + 1}`,
    nominal: i === 0 ? 95.5 : 5,
    plusTol: 0.02 + 0.002 * i,
    minusTol: 0.02 + 0.002 * i,
    direction: i === 0 ? 1 : -1,
    distribution: kinds[i % kinds.length],
  })),
  limits: { lower: 0.2, upper: 0.8 },
  dials: [{ id: 'part2', label: 'Part 2 nominal', unit: 'mm', min: 4.9, max: 5.1, step: 0.01, default: 5, target: { kind: 'input-param', inputId: 'c2', param: 'nominal' } }],
};
// The interactive path: the thread keeps its runner (input columns) and rank store between runs.
const r3runner = new ChunkRunner({ cache: true });
const r3ranks = new RankStore();
const r3columns = new ColumnStore();
let dial = 4.9;
const r3run = time(() => {
  dial = dial >= 5.1 ? 4.9 : +(dial + 0.01).toFixed(2);
  const prep = prepareRun(r3Model, { part2: dial });
  r3runner.beginRun();
  r3ranks.beginRun();
  r3columns.beginRun();
  const parts = r3runner.run(prep, Array.from({ length: prep.chunkCount }, (_, k) => k), { inputWindow: 25_000 });
  return mergeParts(prep, parts, {}, { ranks: r3ranks, columns: r3columns });
});
// The same run from nothing (a fresh runner: every column sampled, every rank computed).
const r3fresh = time(() => runModelSync(r3Model, { dialValues: { part2: 5.03 } }));
const r3 = { ms: r3run.ms, cpuMs: r3run.cpuMs, freshMs: r3fresh.ms, trials: 50_000, ppmObserved: r3run.value.outputs[0].limits!.ppmObserved };

// ---- Output ---------------------------------------------------------------------------------
if (!json || process.argv.includes('--table')) {
  console.log(`Stochos engine benchmark (Node ${process.version}, median of ${REPEATS} after a warm-up; load average ${os.loadavg().map((x) => x.toFixed(1)).join(' ')} on ${os.cpus().length} cores)\n`);
  console.log('Draws per second (per CPU second)'.padEnd(56) + 'M draws/s');
  for (const d of draws) console.log(d.distribution.padEnd(56) + fmt(d.drawsPerSecond / 1e6));
  r1Rows();
  row('  single thread, Box-Muller', r1.coreBoxMuller);
  row('  full report, ziggurat, one thread', r1.fullZiggurat);
  row(`  full report, ziggurat, ${r1.parallel.workers} worker threads`, r1.fullParallelZiggurat);
  const z = [1.6448536269514722, 0, 1.6448536269514722];
  console.log(
    '  closed form'.padEnd(56) + '                  ' + fmt(550, 3) + fmt(550 - z[0] * r1.expectedSd, 3) + fmt(550, 3) + fmt(550 + z[2] * r1.expectedSd, 3),
  );
  console.log('\nR2: 40 PERT items, 20 correlated, 10 risks, 200,000 trials'.padEnd(57) + ' wall ms   CPU ms      P50      P80      P90');
  console.log('  full report'.padEnd(56) + fmt(r2.ms, 0) + fmt(r2.cpuMs, 0) + fmt(r2.p50, 2) + fmt(r2.p80, 2) + fmt(r2.p90, 2));
  console.log('\nR3: 20-contributor stack, 50,000 trials, one dial moved'.padEnd(57) + ' wall ms   CPU ms');
  console.log('  full report, kept columns (target under 25 ms)'.padEnd(56) + fmt(r3.ms, 1) + fmt(r3.cpuMs, 1));
  console.log('  full report, from nothing'.padEnd(56) + fmt(r3.freshMs, 1));
}
if (json) console.log(JSON.stringify({ node: process.version, repeats: REPEATS, load: os.loadavg(), cores, draws, r1, r2, r3 }));
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
