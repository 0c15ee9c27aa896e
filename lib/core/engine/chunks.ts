/**
 * Chunked runs: the unit of work that threads share.
 *
 * A run of n trials is cut into chunks of CHUNK_SIZE trials (the last one shorter), a size
 * that never depends on how many threads run it. Every random stream used for chunk k is
 * keyed by (run seed, input id, purpose, k), so chunk k of an input is the same whichever
 * thread draws it and whatever ran before, and moving one input leaves every other input's
 * draws unchanged (common random numbers). How each method keeps this:
 *  - independent inputs: the sampler for chunk k reads its chunk-keyed stream only;
 *  - Latin hypercube: strata per chunk (each chunk is a Latin hypercube of its own m
 *    trials: permutation and jitter from chunk-keyed streams);
 *  - Gaussian copula groups: each member's scores for chunk k come from its chunk-keyed
 *    stream and the product S z acts trial by trial, so a chunk needs no other chunk;
 *  - Iman-Conover: the rank reordering is done per chunk, with the score permutations
 *    drawn from chunk-keyed streams.
 * Partial results are merged in chunk order, always: columns are concatenated and moments
 * combined by the pairwise update of Chan, Golub & LeVeque (1979); percentiles, histogram,
 * ECDF and drivers are computed from the merged columns. Hence 1, 2 or N workers, in a
 * browser or in Node, give bit-identical results.
 *
 * API for pools: prepareRun() (prepare-run.ts) once per run on each thread, runChunks() for a list of chunk
 * indices (on any thread), mergeChunks() on the thread that gathers the parts.
 */
import { imanConover } from './correlation';
import { CopulaGroupSampler } from './correlation';
import { setDials, type ModelCheck } from './set-dials';
import { createMarginal, type Marginal } from './distributions';
import { ModelValidationError } from './errors';
import { compileFormula, type FormulaNode } from './formula';
import { compilePlan, type Plan } from './compile';
import { linalgPart } from './optional-parts';
import { createColumnSampler, type SamplerContext } from './samplers';
import type { StochosModel } from './schema';
import { DRIVER_TRIAL_LIMIT, RANK_TRIAL_LIMIT } from './summary';
import { twoPassMoments } from './stats';

/** Trials per chunk: fixed, so the split never depends on the number of threads. */
export const CHUNK_SIZE = 16_384;

/** Number of chunks of a run of `trials` trials. */
export function chunkCount(trials: number): number {
  return Math.ceil(trials / CHUNK_SIZE);
}

/** First trial and length of chunk k. */
export function chunkRange(trials: number, k: number): { start: number; count: number } {
  const start = k * CHUNK_SIZE;
  return { start, count: Math.max(0, Math.min(CHUNK_SIZE, trials - start)) };
}

// ---- Moments ------------------------------------------------------------------------------

/** Count, mean and sum of squared deviations (M2) of a set of values. */
export interface Moments {
  n: number;
  mean: number;
  m2: number;
}

export const EMPTY_MOMENTS: Moments = { n: 0, mean: 0, m2: 0 };

/** Moments of one chunk by the corrected two-pass formula. */
export function momentsOf(values: Float64Array): Moments {
  return values.length === 0 ? { ...EMPTY_MOMENTS } : twoPassMoments(values);
}

/**
 * Pairwise combination of the moments of two disjoint sets (Chan, Golub & LeVeque 1979,
 * "Updating formulae and a pairwise algorithm for computing sample variances", Stanford
 * STAN-CS-79-773): with delta = mean_b - mean_a, n = n_a + n_b,
 * mean = mean_a + delta n_b / n and M2 = M2_a + M2_b + delta^2 n_a n_b / n.
 */
export function mergeMoments(a: Moments, b: Moments): Moments {
  if (a.n === 0) return { ...b };
  if (b.n === 0) return { ...a };
  const n = a.n + b.n;
  const delta = b.mean - a.mean;
  return { n, mean: a.mean + (delta * b.n) / n, m2: a.m2 + b.m2 + (delta * delta * a.n * b.n) / n };
}

// ---- Preparing a run ----------------------------------------------------------------------

interface SingleUnit {
  kind: 'single';
  id: string;
  streamId: string;
  marginal: Marginal;
  signature: string;
}

interface GroupUnit {
  kind: 'copula' | 'iman-conover';
  ids: string[];
  streamIds: string[];
  marginals: Marginal[];
  matrix: number[][];
  root: number[][] | null;
  /** Per member: what its column depends on (copula) or the whole group (Iman-Conover). */
  signatures: string[];
}

type SampleUnit = SingleUnit | GroupUnit;

export interface RunSettings {
  seed: string | number;
  trials: number;
  design: StochosModel['settings']['design'];
  normalMethod: StochosModel['settings']['normalMethod'];
  correlationMethod: StochosModel['settings']['correlationMethod'];
}

/** A validated model with its dials applied, compiled for sampling (cheap; built on every thread). */
export interface PreparedRun {
  model: StochosModel;
  dialValues: Record<string, number>;
  plan: Plan;
  settings: RunSettings;
  marginals: Map<string, Marginal>;
  units: SampleUnit[];
  /** What each sampled input's and derived column's values depend on (for caches). */
  signatures: Record<string, string>;
  /** Warnings known before sampling. */
  warnings: string[];
  chunkCount: number;
}

function withOverrides(model: unknown, seed: string | number | null | undefined, trials: number | null | undefined): unknown {
  if ((seed === undefined || seed === null) && (trials === undefined || trials === null)) return model;
  if (!model || typeof model !== 'object') return model;
  const m = model as { settings?: unknown };
  const settings = m.settings && typeof m.settings === 'object' ? (m.settings as Record<string, unknown>) : {};
  return { ...m, settings: { ...settings, ...(seed !== undefined && seed !== null ? { seed } : {}), ...(trials !== undefined && trials !== null ? { trials } : {}) } };
}

function namesIn(node: FormulaNode, out: Set<string>): Set<string> {
  switch (node.kind) {
    case 'num':
      break;
    case 'name':
      out.add(node.name);
      break;
    case 'neg':
    case 'not':
      namesIn(node.arg, out);
      break;
    case 'bin':
      namesIn(node.left, out);
      namesIn(node.right, out);
      break;
    case 'cond':
      namesIn(node.test, out);
      namesIn(node.then, out);
      namesIn(node.else, out);
      break;
    case 'call':
      for (const a of node.args) namesIn(a, out);
      break;
    case 'lin':
      for (const t of node.terms) out.add(t.name);
      break;
  }
  return out;
}

/**
 * Check the model with `check` (the schema's validateModel; prepare-run.ts), apply the dial
 * values and compile the plan. `seed` and `trials`, when given, replace the model's settings
 * (null or undefined keep them). With check null the model is taken as the server checked
 * it (a published version, in the embed, whose page then needs no schema): the dial values
 * are still range-checked and every law is still built, so a bad value still throws; the
 * caller then runs the schema for the message (worker-client.ts).
 */
export function prepareRunWith(check: ModelCheck, model: unknown, dialValues?: Record<string, number>, seed?: string | number | null, trials?: number | null): PreparedRun {
  const given = withOverrides(model, seed, trials);
  let valid: StochosModel;
  if (check) {
    const checked = check(given);
    if (!checked.ok) throw new ModelValidationError(checked.issues);
    valid = checked.model;
  } else valid = given as StochosModel;
  const applied = setDials(valid, dialValues ?? {}, check);
  const m = applied.model;
  const s = m.settings;
  const settings: RunSettings = { seed: s.seed, trials: s.trials, design: s.design, normalMethod: s.normalMethod, correlationMethod: s.correlationMethod };
  const plan = compilePlan(m, applied.variables);
  const marginals = new Map<string, Marginal>();
  for (const inp of plan.inputs) marginals.set(inp.id, createMarginal(inp.spec));
  const streamOf = (id: string) => plan.inputs.find((i) => i.id === id)?.streamId ?? id;
  const specOf = (id: string) => plan.inputs.find((i) => i.id === id)?.spec;
  const base = [settings.seed, settings.trials, settings.design, settings.normalMethod];
  const warnings: string[] = [];
  const units: SampleUnit[] = [];
  const signatures: Record<string, string> = {};
  const grouped = new Set<string>();
  const method = settings.correlationMethod === 'iman-conover' ? 'iman-conover' : 'copula';
  for (const g of plan.groups) {
    if (!check && !linalgPart().checkCorrelation(g.matrix).positiveSemiDefinite) throw new Error('The correlation matrix is not valid with these dial values.');
    g.ids.forEach((id) => grouped.add(id));
    const streamIds = g.ids.map(streamOf);
    const ms = g.ids.map((id) => marginals.get(id) as Marginal);
    let sigs: string[];
    if (method === 'copula') {
      // A member's column depends on its own law, the matrix and every member's stream.
      sigs = g.ids.map((id, i) => JSON.stringify([...base, 'copula', streamIds, g.matrix, i, specOf(id)]));
      const rej = g.ids.filter((id) => (marginals.get(id) as Marginal).natural === 'rejection');
      if (rej.length) warnings.push(`Correlated input${rej.length > 1 ? 's' : ''} ${rej.join(', ')} ${rej.length > 1 ? 'are' : 'is'} sampled through the inverse CDF (Gaussian copula), not by rejection.`);
    } else {
      const all = JSON.stringify([...base, 'iman-conover', streamIds, g.matrix, g.ids.map(specOf)]);
      // Members are reordered together: each depends on the whole group (the index tells them apart).
      sigs = g.ids.map((_, i) => `${all}#${i}`);
    }
    g.ids.forEach((id, i) => (signatures[id] = sigs[i]));
    units.push({ kind: method, ids: g.ids, streamIds, marginals: ms, matrix: g.matrix, root: method === 'copula' ? linalgPart().symmetricSqrt(g.matrix) : null, signatures: sigs });
  }
  for (const inp of plan.inputs) {
    if (grouped.has(inp.id)) continue;
    const signature = JSON.stringify([...base, 'single', inp.streamId, inp.spec]);
    signatures[inp.id] = signature;
    units.push({ kind: 'single', id: inp.id, streamId: inp.streamId, marginal: marginals.get(inp.id) as Marginal, signature });
  }
  for (const d of plan.derived) {
    signatures[d.id] = JSON.stringify(['derived', d.ast, [...namesIn(d.ast, new Set())].sort().map((n) => signatures[n] ?? n)]);
  }
  if (settings.design === 'latin-hypercube') warnings.push('Latin hypercube design: every input is sampled by the inverse CDF of stratified uniforms.');
  return { model: m, dialValues: applied.values, plan, settings, marginals, units, signatures, warnings, chunkCount: chunkCount(settings.trials) };
}

// ---- Running chunks -----------------------------------------------------------------------

export interface OutputChunkStats extends Moments {
  nan: number;
  positiveInfinity: number;
  negativeInfinity: number;
}

/** The results of one chunk. */
export interface ChunkPart {
  index: number;
  start: number;
  count: number;
  /** Output columns over the chunk's trials. */
  outputs: Record<string, Float64Array>;
  /** Sampled input and derived columns, for chunks inside the requested window only. */
  inputs: Record<string, Float64Array>;
  /** Moments of each output's finite values, with the counts of the others. */
  outputMoments: Record<string, OutputChunkStats>;
  /** Moments of each sampled input. */
  inputMoments: Record<string, Moments>;
  /** Rejection sampling counts of the inputs sampled that way. */
  rejection: Record<string, { attempts: number; accepted: number }>;
  /** Wall-clock sampling time (not part of the reproducible result). */
  ms: number;
}

export interface ChunkOptions {
  /**
   * Return input and derived columns of the chunks that start before this trial: at least
   * inputWindow(prep, samples) for the merge (runChunks defaults to that for no samples).
   */
  inputWindow?: number;
  /** Input and derived columns not to return: the gathering thread keeps them from an earlier run (ColumnStore). */
  skipInputs?: readonly string[];
}

interface CacheEntry {
  columns: Float64Array[];
  rejection: ({ attempts: number; accepted: number } | null)[];
  used: number;
}

/** Values (trials x sampled columns) above which a runner does not keep columns between runs. */
export const CACHE_LIMIT_VALUES = 8_000_000;

const now = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/** Most spare columns a runner keeps (CHUNK_SIZE values each). */
const SPARE_COLUMNS = 64;

/** Moments of input columns, computed once per column (cached columns are reused across runs). */
const momentsByColumn = new WeakMap<Float64Array, Moments>();

/**
 * Runs chunks on one thread. With `cache`, it keeps each input's chunk columns between
 * runs keyed by what they depend on, so after a dial move only the moved inputs are
 * sampled again (the others' draws are the same by construction); the output columns are
 * recomputed from the columns in full, so a cached run equals a fresh one bit for bit.
 */
export class ChunkRunner {
  private readonly cache = new Map<string, CacheEntry>();
  private generation = 0;
  /**
   * Full-chunk columns no part refers to (inputs and derived columns of chunks outside the input
   * window, when nothing is cached), reused for the next chunks instead of allocating (and later
   * collecting) a new one per input and chunk. Every sampler and formula writes all of a column.
   */
  private readonly spare: Float64Array[] = [];
  constructor(private readonly options: { cache?: boolean } = {}) {}

  /** Start a new run: columns unused in the last three runs are dropped. */
  beginRun(): void {
    this.generation++;
    // Keep a few runs back: a quick drag cancels runs before they reach every chunk.
    for (const [k, e] of this.cache) if (e.used < this.generation - 3) this.cache.delete(k);
  }

  clear(): void {
    this.cache.clear();
  }

  private caching(prep: PreparedRun): boolean {
    return !!this.options.cache && prep.settings.trials * prep.plan.inputs.length <= CACHE_LIMIT_VALUES;
  }

  run(prep: PreparedRun, chunkIndices: number[], options: ChunkOptions = {}): ChunkPart[] {
    return chunkIndices.map((k) => this.runOne(prep, k, options));
  }

  private lookup(key: string): CacheEntry | undefined {
    const e = this.cache.get(key);
    if (e) e.used = this.generation;
    return e;
  }

  runOne(prep: PreparedRun, k: number, options: ChunkOptions = {}): ChunkPart {
    const t0 = now();
    const { settings, plan } = prep;
    if (!Number.isInteger(k) || k < 0 || k >= prep.chunkCount) throw new Error(`Chunk ${k} does not exist: the run has ${prep.chunkCount} chunks of ${CHUNK_SIZE} trials.`);
    const { start, count } = chunkRange(settings.trials, k);
    const ctx: SamplerContext = { seed: settings.seed, design: settings.design, normalMethod: settings.normalMethod, trials: count, chunk: k };
    const useCache = this.caching(prep);
    const spare = this.spare;
    const column = (n: number) => (!useCache && n === CHUNK_SIZE && spare.length ? (spare.pop() as Float64Array) : new Float64Array(n));
    const cols = new Map<string, Float64Array>();
    const rejection: ChunkPart['rejection'] = {};
    const keyOf = (sig: string) => `${k}|${count}|${sig}`;

    for (const u of prep.units) {
      if (u.kind === 'single') {
        const key = keyOf(u.signature);
        let e = useCache ? this.lookup(key) : undefined;
        if (!e) {
          const sampler = createColumnSampler(u.marginal, ctx, u.streamId, u.id);
          const col = column(count);
          sampler.fill(col, 0, count);
          const rep = sampler.report();
          e = { columns: [col], rejection: [rep.method === 'rejection' ? { attempts: rep.attempts ?? 0, accepted: rep.accepted ?? 0 } : null], used: this.generation };
          if (useCache) this.cache.set(key, e);
        }
        cols.set(u.id, e.columns[0]);
        if (e.rejection[0]) rejection[u.id] = e.rejection[0];
      } else if (u.kind === 'copula') {
        const hits = u.signatures.map((sig) => (useCache ? this.lookup(keyOf(sig)) : undefined));
        if (hits.some((h) => !h)) {
          // Fill only the members whose law changed; the others keep their cached columns.
          const fresh = hits.map((h) => (h ? null : column(count)));
          new CopulaGroupSampler(u.marginals, u.matrix, ctx, u.streamIds, u.root ?? undefined).fill(fresh, 0, count);
          fresh.forEach((col, i) => {
            if (!col) return;
            const e: CacheEntry = { columns: [col], rejection: [null], used: this.generation };
            hits[i] = e;
            if (useCache) this.cache.set(keyOf(u.signatures[i]), e);
          });
        }
        u.ids.forEach((id, i) => cols.set(id, (hits[i] as CacheEntry).columns[0]));
      } else {
        const key = keyOf(u.signatures[0]);
        let e = useCache ? this.lookup(key) : undefined;
        if (!e) {
          const reps: CacheEntry['rejection'] = [];
          const columns = u.ids.map((id, i) => {
            const sampler = createColumnSampler(u.marginals[i], ctx, u.streamIds[i], id);
            const col = column(count);
            sampler.fill(col, 0, count);
            const rep = sampler.report();
            reps.push(rep.method === 'rejection' ? { attempts: rep.attempts ?? 0, accepted: rep.accepted ?? 0 } : null);
            return col;
          });
          imanConover(columns, u.matrix, settings.seed, u.streamIds, k);
          e = { columns, rejection: reps, used: this.generation };
          if (useCache) this.cache.set(key, e);
        }
        u.ids.forEach((id, i) => {
          cols.set(id, (e as CacheEntry).columns[i]);
          const r = (e as CacheEntry).rejection[i];
          if (r) rejection[id] = r;
        });
      }
    }

    const env = {
      column: (name: string) => cols.get(name) ?? null,
      scalar: (name: string) => (Object.prototype.hasOwnProperty.call(plan.scalars, name) ? plan.scalars[name] : null),
    };
    for (const d of plan.derived) {
      const col = column(count);
      compileFormula(d.ast, env).evaluate(col, 0, count);
      cols.set(d.id, col);
    }
    const outputs: Record<string, Float64Array> = {};
    const outputMoments: Record<string, OutputChunkStats> = {};
    for (const o of plan.outputs) {
      const col = new Float64Array(count);
      compileFormula(o.ast, env).evaluate(col, 0, count);
      cols.set(o.id, col);
      outputs[o.id] = col;
      outputMoments[o.id] = finiteMoments(col);
    }
    const inputMoments: Record<string, Moments> = {};
    for (const inp of plan.inputs) {
      const col = cols.get(inp.id) as Float64Array;
      let m = momentsByColumn.get(col);
      if (!m) momentsByColumn.set(col, (m = momentsOf(col)));
      inputMoments[inp.id] = m;
    }
    const inputs: Record<string, Float64Array> = {};
    if (start < (options.inputWindow ?? 0)) {
      const skip = new Set(options.skipInputs ?? []);
      for (const inp of plan.inputs) if (!skip.has(inp.id)) inputs[inp.id] = cols.get(inp.id) as Float64Array;
      for (const d of plan.derived) if (!skip.has(d.id)) inputs[d.id] = cols.get(d.id) as Float64Array;
    } else if (!useCache && count === CHUNK_SIZE) {
      // No part holds these columns and no cache keeps them: the next chunks may reuse them.
      const kept = new Set(Object.values(outputs));
      for (const id of [...plan.inputs.map((i) => i.id), ...plan.derived.map((d) => d.id)]) {
        const col = cols.get(id) as Float64Array;
        if (kept.has(col) || spare.length >= SPARE_COLUMNS) continue;
        kept.add(col);
        // Its moments were cached by identity; the column will hold other values.
        momentsByColumn.delete(col);
        spare.push(col);
      }
    }
    return { index: k, start, count, outputs, inputs, outputMoments, inputMoments, rejection, ms: now() - t0 };
  }
}

/** Moments of the finite values of an output chunk and the counts of the others. */
function finiteMoments(col: Float64Array): OutputChunkStats {
  // A finite mean means every value is finite (a NaN or an infinity would carry into the sum), which is the
  // common case: then the counting pass below would find nothing and compute these same moments.
  const all = momentsOf(col);
  if (all.mean - all.mean === 0) return { ...all, nan: 0, positiveInfinity: 0, negativeInfinity: 0 };
  let nan = 0;
  let pinf = 0;
  let ninf = 0;
  const n = col.length;
  for (let k = 0; k < n; k++) {
    const x = col[k];
    if (x - x !== 0) {
      if (x !== x) nan++;
      else if (x > 0) pinf++;
      else ninf++;
    }
  }
  let m: Moments;
  if (nan + pinf + ninf === 0) m = momentsOf(col);
  else {
    const valid = new Float64Array(n - nan - pinf - ninf);
    let j = 0;
    for (let k = 0; k < n; k++) if (col[k] - col[k] === 0) valid[j++] = col[k];
    m = momentsOf(valid);
  }
  return { ...m, nan, positiveInfinity: pinf, negativeInfinity: ninf };
}

/**
 * Trials of input columns a merge needs: the drivers' window, the achieved correlations'
 * window, or every trial when the input samples are asked for.
 */
export function inputWindow(prep: PreparedRun, samples: 'none' | 'outputs' | 'all' = 'none'): number {
  if (samples === 'all') return prep.settings.trials;
  return Math.min(prep.settings.trials, prep.plan.groups.length ? Math.max(DRIVER_TRIAL_LIMIT, RANK_TRIAL_LIMIT) : DRIVER_TRIAL_LIMIT);
}
