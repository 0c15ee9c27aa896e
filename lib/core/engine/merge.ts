/**
 * Merging a run: the parts of its chunks -> RunResult (no model schema here, so the embed's
 * engine can merge without it; simulate.ts validates and runs on one thread).
 *
 * A run is cut into fixed-size chunks (chunks.ts) that any thread can run; the parts are
 * merged here in chunk order, so one thread, a pool of web workers or a server pool give
 * bit-identical results.
 */
import { evaluateCost, evaluateStack, type CostAnalysis, type StackAnalysis } from './analytic';
import { EMPTY_MOMENTS, inputWindow, mergeMoments, type ChunkPart, type Moments, type PreparedRun } from './chunks';
import { achievedCorrelation, type AchievedCorrelation } from './correlation';
import type { DistributionType, Marginal } from './distributions';
import type { NormalMethod } from './normal-gen';
import { RNG_NAME } from './rng';
import { samplingMethodOf, type Design, type SamplingReport } from './samplers';
import type { Template } from './schema';
import { PERCENTILE_DEFINITION, percentileEstimatesBySelection, RankCache, RankStore, type PercentileEstimate } from './stats';
import {
  DEFAULT_ECDF_POINTS,
  DEFAULT_HISTOGRAM_BINS,
  DEFAULT_PERCENTILES,
  RANK_TRIAL_LIMIT,
  summarizeOutputStaged,
  type DriverItem,
  type OutputSummary,
  type ProbabilityEstimate,
} from './summary';

export const ENGINE_VERSION = 'stochos-engine/2';

export type SampleSelection = 'none' | 'outputs' | 'all';
export { inputWindow };

export interface RunOptions {
  /** Dial values by dial id; missing dials take their default. */
  dialValues?: Record<string, number>;
  /** Which sample columns to return as Float64Arrays (default none). */
  samples?: SampleSelection;
  /** Extra percentile levels in (0, 1) to report. */
  percentiles?: number[];
  histogramBins?: number;
  ecdfPoints?: number;
}

export interface Progress {
  runPhase: 'sampling' | 'statistics' | 'done';
  done: number;
  total: number;
  elapsedMs: number;
}

export interface AsyncRunOptions extends RunOptions {
  onProgress?: (p: Progress) => void;
  signal?: AbortSignal;
  /** Trials per step, rounded up to whole chunks (default: one chunk per step). */
  chunkSize?: number;
  /** Minimum time between progress callbacks (default 50 ms). */
  progressIntervalMs?: number;
}

export interface InputReport {
  id: string;
  label: string;
  unit: string;
  distribution: DistributionType;
  sampling: SamplingReport;
  correlated: 'gaussian-copula' | 'iman-conover' | null;
  /** Sample mean and sd of the column. */
  mean: number;
  sd: number;
  /** Closed-form mean and sd of the distribution. */
  analyticMean: number | null;
  analyticSd: number | null;
}

export interface StackContributorResult {
  id: string;
  name: string;
  sigma: number;
  analyticShare: number;
  spearman: number;
  monteCarloShare: number;
}

export interface StackResult {
  analytic: StackAnalysis;
  monteCarlo: {
    mean: number | null;
    sd: number | null;
    ppmObserved: number | null;
    ppmObservedCi: { low: number; high: number } | null;
    ppmNormal: number | null;
    pp: number | null;
    ppk: number | null;
  };
  /** Ranked by analytic share of variance. */
  contributors: StackContributorResult[];
}

export interface CostResult {
  analytic: CostAnalysis;
  confidence: number;
  /** Total at the chosen confidence, with its order-statistic interval. */
  atConfidence: PercentileEstimate;
  /** atConfidence.value - base estimate. */
  contingency: number;
  contingencyShareOfBase: number | null;
  p10: number;
  p50: number;
  p80: number;
  p90: number;
  exceedBudget: ProbabilityEstimate | null;
  /** Where the sum of most-likely values falls on the S-curve: fraction of trials at or below it. */
  sumMostLikelyRank: number;
  baseEstimateRank: number;
}

export interface RunResult {
  engine: typeof ENGINE_VERSION;
  template: Template;
  title: string;
  run: {
    trials: number;
    seed: string | number;
    design: Design;
    normalMethod: NormalMethod;
    correlationMethod: 'copula' | 'iman-conover';
    rng: string;
    percentileDefinition: string;
    dialValues: Record<string, number>;
  };
  inputs: InputReport[];
  correlation: AchievedCorrelation[];
  outputs: OutputSummary[];
  stack: StackResult | null;
  cost: CostResult | null;
  warnings: string[];
  /** Sample columns as requested (transferable). */
  samples: { outputs: Record<string, Float64Array>; inputs: Record<string, Float64Array> } | null;
  /** Wall-clock figures: not part of the reproducible result. */
  timing: { samplingMs: number; statisticsMs: number; totalMs: number };
}

const now = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/**
 * Merged input columns kept between runs, keyed by the window and by what a column's values
 * depend on (its signature, chunks.ts): after a dial move the unchanged inputs' columns are
 * taken from here, so a pool's workers need not send them again and the page copies nothing.
 */
export class ColumnStore {
  private readonly map = new Map<string, { col: Float64Array; used: number }>();
  private generation = 0;
  /** Start a run: columns unused in the last two runs are dropped. */
  beginRun(): void {
    this.generation++;
    for (const [k, e] of this.map) if (e.used < this.generation - 2) this.map.delete(k);
  }
  private static key(window: number, signature: string): string {
    return `${window}|${signature}`;
  }
  has(window: number, signature: string): boolean {
    return this.map.has(ColumnStore.key(window, signature));
  }
  get(window: number, signature: string): Float64Array | undefined {
    const e = this.map.get(ColumnStore.key(window, signature));
    if (e) e.used = this.generation;
    return e?.col;
  }
  set(window: number, signature: string, col: Float64Array): void {
    this.map.set(ColumnStore.key(window, signature), { col, used: this.generation });
  }
}

/** Caches a thread keeps between runs so a dial move redoes only what changed. */
export interface MergeCaches {
  ranks?: RankStore;
  columns?: ColumnStore;
}

/** Ids of the input and derived columns a store already holds for this run's window (a pool need not send them). */
export function storedInputs(prep: PreparedRun, window: number, store: ColumnStore): string[] {
  const ids = [...prep.plan.inputs.map((i) => i.id), ...prep.plan.derived.map((d) => d.id)];
  return ids.filter((id) => prep.signatures[id] !== undefined && store.has(window, prep.signatures[id]));
}

/** What each step of a staged merge adds: the headline figures, then the charts, then the drivers. */
export type ResultStage = 'headline' | 'charts' | 'drivers';

/**
 * A run's result in three steps, so the figure a viewer watches is shown first:
 *  - headline(): moments, percentiles with their intervals (by selection, no sort), limits,
 *    capability, the stack and cost figures; histograms, ECDFs, drivers and achieved
 *    correlations are empty;
 *  - charts(): adds histograms and ECDFs (one sort per output);
 *  - drivers(): adds drivers, the contributors' rank correlations and achieved correlations:
 *    the complete result, equal bit for bit to mergeParts.
 * Each call returns a new object; call them in this order.
 */
export interface StagedMerge {
  headline(): RunResult;
  charts(): RunResult;
  drivers(): RunResult;
}

/**
 * Merge the parts of every chunk of a run (in any order; they are merged in chunk order)
 * into the run's result. The parts must include the input columns of the window given by
 * inputWindow(prep, options.samples), except those the column store in `caches` holds.
 */
export function mergeParts(prep: PreparedRun, parts: ChunkPart[], options: RunOptions = {}, caches: MergeCaches = {}): RunResult {
  const staged = mergeStaged(prep, parts, options, caches);
  staged.headline();
  staged.charts();
  return staged.drivers();
}

export function mergeStaged(prep: PreparedRun, parts: ChunkPart[], options: RunOptions = {}, caches: MergeCaches = {}): StagedMerge {
  const t0 = now();
  const n = prep.settings.trials;
  const byIndex: ChunkPart[] = new Array(prep.chunkCount);
  for (const p of parts) byIndex[p.index] = p;
  for (let k = 0; k < prep.chunkCount; k++) if (!byIndex[k]) throw new Error(`Chunk ${k} of ${prep.chunkCount} is missing from the merge.`);
  const ordered = byIndex;
  const samplingMs = ordered.reduce((s, p) => s + p.ms, 0);

  // Output columns in trial order, and their moments merged in chunk order.
  const outCols = new Map<string, Float64Array>();
  const outMoments = new Map<string, Moments>();
  for (const o of prep.plan.outputs) {
    const col = new Float64Array(n);
    let m: Moments = EMPTY_MOMENTS;
    for (const p of ordered) {
      col.set(p.outputs[o.id], p.start);
      m = mergeMoments(m, p.outputMoments[o.id]);
    }
    outCols.set(o.id, col);
    outMoments.set(o.id, m);
  }
  // Input and derived columns over the window the statistics need: from the store when kept.
  const window = inputWindow(prep, options.samples);
  const inCols = new Map<string, Float64Array>();
  for (const id of [...prep.plan.inputs.map((i) => i.id), ...prep.plan.derived.map((d) => d.id)]) {
    const sig = prep.signatures[id];
    const kept = caches.columns && sig !== undefined ? caches.columns.get(window, sig) : undefined;
    if (kept) {
      inCols.set(id, kept);
      continue;
    }
    const col = new Float64Array(window);
    for (const p of ordered) {
      if (p.start >= window) break;
      const part = p.inputs[id];
      if (!part) throw new Error(`Chunk ${p.index} did not return the column '${id}' the merge needs.`);
      col.set(part.subarray(0, Math.min(p.count, window - p.start)), p.start);
    }
    if (caches.columns && sig !== undefined) caches.columns.set(window, sig, col);
    inCols.set(id, col);
  }
  const inMoments = new Map<string, Moments>();
  for (const inp of prep.plan.inputs) {
    let m: Moments = EMPTY_MOMENTS;
    for (const p of ordered) m = mergeMoments(m, p.inputMoments[inp.id]);
    inMoments.set(inp.id, m);
  }
  const rejection = new Map<string, { attempts: number; accepted: number }>();
  for (const p of ordered) {
    for (const [id, r] of Object.entries(p.rejection)) {
      const acc = rejection.get(id) ?? { attempts: 0, accepted: 0 };
      acc.attempts += r.attempts;
      acc.accepted += r.accepted;
      rejection.set(id, acc);
    }
  }
  const mergeMs = now() - t0;
  const staged = summarizeStaged(prep, options, outCols, outMoments, inCols, inMoments, rejection, caches);
  let statisticsMs = 0;
  const timed = (step: () => RunResult) => () => {
    const t = now();
    const result = step();
    statisticsMs += now() - t;
    result.timing = { samplingMs: samplingMs + mergeMs, statisticsMs, totalMs: samplingMs + mergeMs + statisticsMs };
    return result;
  };
  return { headline: timed(staged.headline), charts: timed(staged.charts), drivers: timed(staged.drivers) };
}

function summarizeStaged(
  prep: PreparedRun,
  opts: RunOptions,
  outCols: Map<string, Float64Array>,
  outMoments: Map<string, Moments>,
  inCols: Map<string, Float64Array>,
  inMoments: Map<string, Moments>,
  rejection: Map<string, { attempts: number; accepted: number }>,
  caches: MergeCaches,
): StagedMerge {
  const model = prep.model;
  const plan = prep.plan;
  const warnings = [...prep.warnings];
  const levels = new Set<number>([...DEFAULT_PERCENTILES, ...(opts.percentiles ?? []).filter((p) => p > 0 && p < 1)]);
  if (model.template === 'cost-range') levels.add(model.confidence);
  const percentiles = [...levels].sort((a, b) => a - b);
  const rankCache = new RankCache(caches.ranks ?? null);
  for (const [id, col] of inCols) if (prep.signatures[id]) rankCache.name(col, prep.signatures[id]);
  const driverCols = plan.drivers.map((d) => ({ id: d.id, label: d.label, column: inCols.get(d.id) as Float64Array }));
  const stages = plan.outputs.map((o) => {
    const m = outMoments.get(o.id) as Moments;
    return summarizeOutputStaged(o.id, o.label, o.unit, outCols.get(o.id) as Float64Array, {
      percentiles,
      histogramBins: opts.histogramBins ?? DEFAULT_HISTOGRAM_BINS,
      ecdfPoints: opts.ecdfPoints ?? DEFAULT_ECDF_POINTS,
      lower: o.lower,
      upper: o.upper,
      capability: model.template !== 'cost-range',
      drivers: driverCols,
      rankCache,
      moments: { n: m.n, mean: m.mean, variance: m.n > 1 ? m.m2 / (m.n - 1) : NaN },
    });
  });
  let outputs = stages.map((st, i) => {
    const summary = st.headline;
    if (summary.invalid.total > 0) warnings.push(`Output '${plan.outputs[i].label}': ${summary.invalid.total} of ${summary.trials} trials gave NaN or an infinite value and are excluded from its statistics.`);
    return summary;
  });

  const groupOf = new Map<string, 'gaussian-copula' | 'iman-conover'>();
  for (const u of prep.units) if (u.kind !== 'single') for (const id of u.ids) groupOf.set(id, u.kind === 'copula' ? 'gaussian-copula' : 'iman-conover');
  const s = prep.settings;
  const inputs: InputReport[] = plan.inputs.map((inp) => {
    const w = inMoments.get(inp.id) as Moments;
    const m = prep.marginals.get(inp.id) as Marginal;
    const corr = groupOf.get(inp.id) ?? null;
    let sampling: SamplingReport;
    if (corr === 'gaussian-copula') sampling = { method: 'gaussian-copula', scores: s.design === 'latin-hypercube' ? 'inverse-cdf' : s.normalMethod };
    else {
      const method = samplingMethodOf(m, s);
      const r = rejection.get(inp.id);
      sampling =
        method === 'rejection' && r && m.envelope
          ? { method, attempts: r.attempts, accepted: r.accepted, acceptanceRate: r.attempts > 0 ? r.accepted / r.attempts : 0, expectedAcceptance: m.envelope.expectedAcceptance }
          : { method };
    }
    return {
      id: inp.id,
      label: inp.label,
      unit: inp.unit,
      distribution: inp.spec.type,
      sampling,
      correlated: corr,
      mean: w.n > 0 ? w.mean : NaN,
      sd: Math.sqrt(w.n > 1 ? w.m2 / (w.n - 1) : NaN),
      analyticMean: Number.isFinite(m.mean) ? m.mean : null,
      analyticSd: Number.isFinite(m.variance) ? Math.sqrt(m.variance) : null,
    };
  });

  const stackOf = (gap: OutputSummary): StackResult | null => {
    if (model.template !== 'linear-stack') return null;
    const analytic = evaluateStack(model);
    const byId = new Map<string, DriverItem>(gap.drivers.items.map((d) => [d.id, d]));
    return {
      analytic,
      monteCarlo: {
        mean: gap.mean,
        sd: gap.sd,
        ppmObserved: gap.limits?.ppmObserved ?? null,
        ppmObservedCi: gap.limits?.ppmObservedCi ?? null,
        ppmNormal: gap.limits?.ppmNormal ?? null,
        pp: gap.limits?.pp ?? null,
        ppk: gap.limits?.ppk ?? null,
      },
      contributors: analytic.contributors
        .map((c) => ({
          id: c.id,
          name: c.name,
          sigma: c.sigma,
          analyticShare: c.varianceShare,
          spearman: byId.get(c.id)?.spearman ?? 0,
          monteCarloShare: byId.get(c.id)?.share ?? 0,
        }))
        .sort((a, b) => b.analyticShare - a.analyticShare || (a.id < b.id ? -1 : 1)),
    };
  };
  let stack = stackOf(outputs[0]);
  let cost: CostResult | null = null;
  if (model.template === 'cost-range') {
    const analytic = evaluateCost(model);
    const i = plan.outputs.findIndex((o) => o.id === 'total');
    const total = outputs[i];
    const valid = stages[i].valid;
    const [at, p10, p50, p80, p90] = percentileEstimatesBySelection(valid, [model.confidence, 0.1, 0.5, 0.8, 0.9]);
    cost = {
      analytic,
      confidence: model.confidence,
      atConfidence: at,
      contingency: at.value - analytic.baseEstimate,
      contingencyShareOfBase: analytic.baseEstimate !== 0 ? (at.value - analytic.baseEstimate) / analytic.baseEstimate : null,
      p10: p10.value,
      p50: p50.value,
      p80: p80.value,
      p90: p90.value,
      exceedBudget: total.limits?.above ?? null,
      sumMostLikelyRank: fractionAtOrBelowOf(valid, analytic.sumMostLikely),
      baseEstimateRank: fractionAtOrBelowOf(valid, analytic.baseEstimate),
    };
  }

  let samples: RunResult['samples'] = null;
  const sel = opts.samples ?? 'none';
  if (sel !== 'none') {
    samples = { outputs: {}, inputs: {} };
    for (const o of plan.outputs) samples.outputs[o.id] = outCols.get(o.id) as Float64Array;
    if (sel === 'all') {
      for (const i of plan.inputs) samples.inputs[i.id] = inCols.get(i.id) as Float64Array;
      for (const d of plan.derived) samples.inputs[d.id] = inCols.get(d.id) as Float64Array;
    }
  }

  let correlation: AchievedCorrelation[] = [];
  const result = (): RunResult => ({
    engine: ENGINE_VERSION,
    template: model.template,
    title: model.title,
    run: {
      trials: s.trials,
      seed: s.seed,
      design: s.design,
      normalMethod: s.normalMethod,
      correlationMethod: s.correlationMethod,
      rng: RNG_NAME,
      percentileDefinition: PERCENTILE_DEFINITION.id,
      dialValues: prep.dialValues,
    },
    inputs,
    correlation,
    outputs,
    stack,
    cost,
    warnings,
    samples,
    timing: { samplingMs: 0, statisticsMs: 0, totalMs: 0 },
  });

  return {
    headline: result,
    charts() {
      outputs = outputs.map((o, i) => stages[i].charts(o).summary);
      stack = stack ? { ...stack, monteCarlo: { ...stack.monteCarlo } } : null;
      return result();
    },
    drivers() {
      outputs = outputs.map((o, i) => stages[i].drivers(o));
      stack = stackOf(outputs[0]);
      correlation = plan.groups.map((g) => {
        const method = groupOf.get(g.ids[0]) === 'iman-conover' ? 'iman-conover' : 'copula';
        return achievedCorrelation(
          g.ids,
          g.ids.map((id) => inCols.get(id) as Float64Array),
          g.matrix,
          method,
          RANK_TRIAL_LIMIT,
          rankCache,
        );
      });
      return result();
    },
  };
}

/** Fraction of the values <= v (what fractionAtOrBelow reads from the sorted values, by counting). */
function fractionAtOrBelowOf(values: Float64Array, v: number): number {
  const n = values.length;
  if (n === 0) return NaN;
  let c = 0;
  for (let k = 0; k < n; k++) if (values[k] <= v) c++;
  return c / n;
}

// In its own module so that the worker, which merges nothing, does not load this one.
export { yieldToEventLoop } from './yield';
