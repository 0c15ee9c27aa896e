/**
 * The simulator: validated model + dial values + seed + trial count -> RunResult.
 *
 * A Simulation advances in steps of any size; every input column is filled from its own
 * stream in trial order, so the numbers do not depend on how the run is chunked (a browser
 * worker and the server give bit-identical results).
 */
import { evaluateCost, evaluateStack, type CostAnalysis, type StackAnalysis } from './analytic';
import { compilePlan, type Plan } from './compile';
import { achievedCorrelation, CopulaGroupSampler, imanConover, type AchievedCorrelation } from './correlation';
import { applyDials } from './dials';
import { createMarginal, type DistributionType, type Marginal } from './distributions';
import { ModelValidationError, RunCancelledError } from './errors';
import { compileFormula, type CompiledFormula } from './formula';
import type { NormalMethod } from './normal-gen';
import { RNG_NAME } from './rng';
import { createColumnSampler, type ColumnSampler, type Design, type SamplerContext, type SamplingReport } from './samplers';
import { validateModel, type StochosModel, type Template } from './schema';
import { fractionAtOrBelow, meanVariance, PERCENTILE_DEFINITION, percentileEstimates, RankCache, type PercentileEstimate } from './stats';
import {
  DEFAULT_ECDF_POINTS,
  DEFAULT_HISTOGRAM_BINS,
  DEFAULT_PERCENTILES,
  RANK_TRIAL_LIMIT,
  summarizeOutput,
  type DriverItem,
  type OutputSummary,
  type ProbabilityEstimate,
} from './summary';

export const ENGINE_VERSION = 'stochos-engine/1';

export type SampleSelection = 'none' | 'outputs' | 'all';

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
  /** Trials per step; by default steps are sized to take about 15 ms. */
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

interface GroupRun {
  ids: string[];
  matrix: number[][];
  method: 'gaussian-copula' | 'iman-conover';
  copula: CopulaGroupSampler | null;
}

export class Simulation {
  readonly total: number;
  done = 0;
  readonly model: StochosModel;
  readonly plan: Plan;
  readonly dialValues: Record<string, number>;
  private readonly options: RunOptions;
  private readonly ctx: SamplerContext;
  private readonly columns = new Map<string, Float64Array>();
  private readonly marginals = new Map<string, Marginal>();
  private readonly samplers: { id: string; sampler: ColumnSampler }[] = [];
  private readonly groups: GroupRun[] = [];
  private readonly derived: { id: string; f: CompiledFormula }[] = [];
  private readonly outputs: { id: string; f: CompiledFormula }[] = [];
  private readonly deferFormulas: boolean;
  private readonly warnings: string[] = [];
  private readonly started = now();
  private samplingMs = 0;

  constructor(model: unknown, options: RunOptions = {}) {
    const checked = validateModel(model);
    if (!checked.ok) throw new ModelValidationError(checked.issues);
    const applied = applyDials(checked.model, options.dialValues ?? {});
    this.model = applied.model;
    this.dialValues = applied.values;
    this.options = options;
    const s = this.model.settings;
    this.total = s.trials;
    this.ctx = { seed: s.seed, design: s.design, normalMethod: s.normalMethod, trials: s.trials };
    this.plan = compilePlan(this.model, applied.variables);

    for (const inp of this.plan.inputs) {
      this.columns.set(inp.id, new Float64Array(this.total));
      this.marginals.set(inp.id, createMarginal(inp.spec));
    }
    const grouped = new Set<string>();
    const method = s.correlationMethod === 'iman-conover' ? 'iman-conover' : 'gaussian-copula';
    for (const g of this.plan.groups) {
      const marginals = g.ids.map((id) => this.marginals.get(id) as Marginal);
      g.ids.forEach((id) => grouped.add(id));
      let copula: CopulaGroupSampler | null = null;
      if (method === 'gaussian-copula') {
        copula = new CopulaGroupSampler(marginals, g.matrix, this.ctx, g.ids.map((id) => this.streamOf(id)));
        const rej = g.ids.filter((id) => (this.marginals.get(id) as Marginal).natural === 'rejection');
        if (rej.length) this.warnings.push(`Correlated input${rej.length > 1 ? 's' : ''} ${rej.join(', ')} ${rej.length > 1 ? 'are' : 'is'} sampled through the inverse CDF (Gaussian copula), not by rejection.`);
      } else {
        for (const id of g.ids) this.samplers.push({ id, sampler: createColumnSampler(this.marginals.get(id) as Marginal, this.ctx, this.streamOf(id), id) });
      }
      this.groups.push({ ids: g.ids, matrix: g.matrix, method, copula });
    }
    for (const inp of this.plan.inputs) {
      if (grouped.has(inp.id)) continue;
      this.samplers.push({ id: inp.id, sampler: createColumnSampler(this.marginals.get(inp.id) as Marginal, this.ctx, inp.streamId, inp.id) });
    }
    if (s.design === 'latin-hypercube') this.warnings.push('Latin hypercube design: every input is sampled by the inverse CDF of stratified uniforms.');

    const env = {
      column: (name: string) => this.columns.get(name) ?? null,
      scalar: (name: string) => (Object.prototype.hasOwnProperty.call(this.plan.scalars, name) ? this.plan.scalars[name] : null),
    };
    for (const d of this.plan.derived) {
      this.columns.set(d.id, new Float64Array(this.total));
      this.derived.push({ id: d.id, f: compileFormula(d.ast, env) });
    }
    for (const o of this.plan.outputs) {
      this.columns.set(o.id, new Float64Array(this.total));
      this.outputs.push({ id: o.id, f: compileFormula(o.ast, env) });
    }
    this.deferFormulas = this.groups.some((g) => g.method === 'iman-conover');
  }

  private streamOf(id: string): string {
    return this.plan.inputs.find((i) => i.id === id)?.streamId ?? id;
  }

  /** Run up to maxTrials more trials; returns how many were run. */
  step(maxTrials: number): number {
    const count = Math.max(0, Math.min(Math.floor(maxTrials), this.total - this.done));
    if (count === 0) return 0;
    const t0 = now();
    const start = this.done;
    for (const { id, sampler } of this.samplers) sampler.fill(this.columns.get(id) as Float64Array, start, count);
    for (const g of this.groups) {
      if (g.copula) g.copula.fill(g.ids.map((id) => this.columns.get(id) as Float64Array), start, count);
    }
    if (!this.deferFormulas) this.evaluateFormulas(start, count);
    this.done += count;
    this.samplingMs += now() - t0;
    return count;
  }

  private evaluateFormulas(start: number, count: number): void {
    for (const d of this.derived) d.f.evaluate(this.columns.get(d.id) as Float64Array, start, count);
    for (const o of this.outputs) o.f.evaluate(this.columns.get(o.id) as Float64Array, start, count);
  }

  /** Column of a sampled input, derived quantity or output (for tests and tools). */
  column(id: string): Float64Array | null {
    return this.columns.get(id) ?? null;
  }

  finish(): RunResult {
    if (this.done < this.total) throw new Error(`finish() called after ${this.done} of ${this.total} trials`);
    const t0 = now();
    if (this.deferFormulas) {
      for (const g of this.groups) {
        if (g.method === 'iman-conover') {
          imanConover(
            g.ids.map((id) => this.columns.get(id) as Float64Array),
            g.matrix,
            this.ctx.seed,
            g.ids.map((id) => this.streamOf(id)),
          );
        }
      }
      this.evaluateFormulas(0, this.total);
    }
    this.samplingMs += now() - t0;
    const t1 = now();
    const result = this.summarize();
    const t2 = now();
    result.timing = { samplingMs: this.samplingMs, statisticsMs: t2 - t1, totalMs: t2 - this.started };
    return result;
  }

  private summarize(): RunResult {
    const model = this.model;
    const opts = this.options;
    const levels = new Set<number>([...DEFAULT_PERCENTILES, ...(opts.percentiles ?? []).filter((p) => p > 0 && p < 1)]);
    if (model.template === 'cost-range') levels.add(model.confidence);
    const percentiles = [...levels].sort((a, b) => a - b);
    const driverCols = this.plan.drivers.map((d) => ({ id: d.id, label: d.label, column: this.columns.get(d.id) as Float64Array }));
    const rankCache = new RankCache();
    const sortedById = new Map<string, Float64Array>();
    const outputs = this.plan.outputs.map((o) => {
      const { summary, sorted } = summarizeOutput(o.id, o.label, o.unit, this.columns.get(o.id) as Float64Array, {
        percentiles,
        histogramBins: opts.histogramBins ?? DEFAULT_HISTOGRAM_BINS,
        ecdfPoints: opts.ecdfPoints ?? DEFAULT_ECDF_POINTS,
        lower: o.lower,
        upper: o.upper,
        capability: model.template !== 'cost-range',
        drivers: driverCols,
        rankCache,
      });
      sortedById.set(o.id, sorted);
      if (summary.invalid.total > 0) this.warnings.push(`Output '${o.label}': ${summary.invalid.total} of ${summary.trials} trials gave NaN or an infinite value and are excluded from its statistics.`);
      return summary;
    });

    const groupOf = new Map<string, 'gaussian-copula' | 'iman-conover'>();
    for (const g of this.groups) for (const id of g.ids) groupOf.set(id, g.method);
    const samplerOf = new Map(this.samplers.map((s) => [s.id, s.sampler]));
    const inputs: InputReport[] = this.plan.inputs.map((inp) => {
      const col = this.columns.get(inp.id) as Float64Array;
      const w = meanVariance(col);
      const m = this.marginals.get(inp.id) as Marginal;
      const corr = groupOf.get(inp.id) ?? null;
      const sampler = samplerOf.get(inp.id);
      let sampling: SamplingReport;
      if (corr === 'gaussian-copula') {
        const g = this.groups.find((x) => x.ids.includes(inp.id));
        sampling = { method: 'gaussian-copula', scores: g?.copula?.scoreMethod };
      } else sampling = sampler ? sampler.report() : { method: 'constant' };
      return {
        id: inp.id,
        label: inp.label,
        unit: inp.unit,
        distribution: inp.spec.type,
        sampling,
        correlated: corr,
        mean: w.mean,
        sd: Math.sqrt(w.variance),
        analyticMean: Number.isFinite(m.mean) ? m.mean : null,
        analyticSd: Number.isFinite(m.variance) ? Math.sqrt(m.variance) : null,
      };
    });

    const correlation = this.groups.map((g) =>
      achievedCorrelation(
        g.ids,
        g.ids.map((id) => this.columns.get(id) as Float64Array),
        g.matrix,
        g.method === 'gaussian-copula' ? 'copula' : 'iman-conover',
        RANK_TRIAL_LIMIT,
        rankCache,
      ),
    );

    let stack: StackResult | null = null;
    let cost: CostResult | null = null;
    if (model.template === 'linear-stack') {
      const analytic = evaluateStack(model);
      const gap = outputs[0];
      const byId = new Map<string, DriverItem>(gap.drivers.items.map((d) => [d.id, d]));
      stack = {
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
    }
    if (model.template === 'cost-range') {
      const analytic = evaluateCost(model);
      const total = outputs[0];
      const sorted = sortedById.get('total') as Float64Array;
      const [at, p10, p50, p80, p90] = percentileEstimates(sorted, [model.confidence, 0.1, 0.5, 0.8, 0.9]);
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
        sumMostLikelyRank: fractionAtOrBelow(sorted, analytic.sumMostLikely),
        baseEstimateRank: fractionAtOrBelow(sorted, analytic.baseEstimate),
      };
    }

    let samples: RunResult['samples'] = null;
    const sel = opts.samples ?? 'none';
    if (sel !== 'none') {
      samples = { outputs: {}, inputs: {} };
      for (const o of this.plan.outputs) samples.outputs[o.id] = this.columns.get(o.id) as Float64Array;
      if (sel === 'all') {
        for (const i of this.plan.inputs) samples.inputs[i.id] = this.columns.get(i.id) as Float64Array;
        for (const d of this.plan.derived) samples.inputs[d.id] = this.columns.get(d.id) as Float64Array;
      }
    }

    const s = model.settings;
    return {
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
        dialValues: this.dialValues,
      },
      inputs,
      correlation,
      outputs,
      stack,
      cost,
      warnings: this.warnings,
      samples,
      timing: { samplingMs: 0, statisticsMs: 0, totalMs: 0 },
    };
  }
}

/** Run a model synchronously (server, tests). Throws ModelValidationError or SamplingError. */
export function runModelSync(model: unknown, options: RunOptions = {}): RunResult {
  const sim = new Simulation(model, options);
  sim.step(sim.total);
  return sim.finish();
}

/** Let queued messages (cancel, a newer run) through between steps. */
function yieldToEventLoop(): Promise<void> {
  if (typeof MessageChannel !== 'undefined') {
    return new Promise((resolve) => {
      const ch = new MessageChannel();
      ch.port1.onmessage = () => {
        ch.port1.close();
        resolve();
      };
      ch.port2.postMessage(null);
    });
  }
  return new Promise((resolve) => setTimeout(resolve, 0));
}

/**
 * Run a model in steps, yielding to the event loop between them, reporting progress and
 * honouring an AbortSignal. Gives exactly the numbers runModelSync gives.
 */
export async function runModel(model: unknown, options: AsyncRunOptions = {}): Promise<RunResult> {
  const { onProgress, signal } = options;
  const interval = options.progressIntervalMs ?? 50;
  const t0 = now();
  if (signal?.aborted) throw new RunCancelledError();
  const sim = new Simulation(model, options);
  let chunk = options.chunkSize ?? 1024;
  const adaptive = options.chunkSize === undefined;
  let lastProgress = -Infinity;
  const report = (runPhase: Progress['runPhase']) => onProgress?.({ runPhase, done: sim.done, total: sim.total, elapsedMs: now() - t0 });
  report('sampling');
  lastProgress = now();
  while (sim.done < sim.total) {
    const s0 = now();
    const ran = sim.step(chunk);
    const dt = now() - s0;
    if (adaptive && ran > 0) {
      // Aim for steps of about 15 ms so progress and cancellation stay responsive.
      const perTrial = Math.max(dt, 0.05) / ran;
      chunk = Math.max(256, Math.min(262_144, Math.round(15 / perTrial)));
    }
    const t = now();
    if (t - lastProgress >= interval) {
      report('sampling');
      lastProgress = t;
    }
    await yieldToEventLoop();
    if (signal?.aborted) throw new RunCancelledError();
  }
  report('statistics');
  await yieldToEventLoop();
  if (signal?.aborted) throw new RunCancelledError();
  const result = sim.finish();
  report('done');
  return result;
}
