/**
 * Column samplers: each fills a Float64Array segment with one input's draws from that
 * input's own stream, so the column does not depend on any other input.
 */
import { fillInverse, type Marginal, type RejectionEnvelope } from './distributions';
import { SamplingError } from './errors';
import { createNormalGenerator, type NormalGenerator, type NormalMethod } from './normal-gen';
import { Stream } from './rng';
import * as special from './special';

// Bound once (see det-math): hot loops call these per sample.
const { normalQuantilePQ } = special;

export type Design = 'monte-carlo' | 'latin-hypercube';

export type SamplingMethod =
  | 'constant'
  | 'inverse-cdf'
  | 'box-muller'
  | 'ziggurat'
  | 'rejection'
  | 'gaussian-copula'
  | 'iman-conover';

export interface SamplingReport {
  method: SamplingMethod;
  /** Gaussian copula: how the independent normal scores were drawn. */
  scores?: SamplingMethod;
  /** Rejection sampling only. */
  attempts?: number;
  accepted?: number;
  acceptanceRate?: number;
  expectedAcceptance?: number;
}

export interface ColumnSampler {
  readonly method: SamplingMethod;
  fill(out: Float64Array, start: number, count: number): void;
  report(): SamplingReport;
}

/** A source of uniforms in (0, 1) for inverse-CDF sampling. */
export interface UniformSource {
  fill(out: Float64Array, start: number, count: number): void;
}

/** Plain Monte Carlo uniforms straight from the stream. */
export class StreamUniforms implements UniformSource {
  constructor(private readonly stream: Stream) {}
  fill(out: Float64Array, start: number, count: number): void {
    this.stream.fillUniform(out, start, count);
  }
}

/**
 * Latin hypercube (McKay, Beckman & Conover 1979): trial k of n falls in stratum perm[k],
 * u_k = (perm[k] + v_k) / n, with perm a uniformly random permutation (Fisher-Yates from a
 * separate sub-stream) and v_k uniform in (0, 1). Every stratum [j/n, (j+1)/n) gets exactly
 * one trial per input.
 */
export class LatinHypercubeUniforms implements UniformSource {
  private readonly perm: Uint32Array;
  private next = 0;
  constructor(
    private readonly n: number,
    permStream: Stream,
    private readonly jitter: Stream,
  ) {
    const perm = new Uint32Array(n);
    for (let i = 0; i < n; i++) perm[i] = i;
    for (let i = n - 1; i > 0; i--) {
      const j = permStream.nextBelow(i + 1);
      const t = perm[i];
      perm[i] = perm[j];
      perm[j] = t;
    }
    this.perm = perm;
  }
  fill(out: Float64Array, start: number, count: number): void {
    const inv = 1 / this.n;
    for (let k = 0; k < count; k++) {
      out[start + k] = (this.perm[this.next++] + this.jitter.uniform()) * inv;
    }
  }
}

/** A source of standard normal scores (for normals, lognormals and the copula). */
export interface ScoreSource {
  readonly method: SamplingMethod;
  fill(out: Float64Array, start: number, count: number): void;
}

class GeneratorScores implements ScoreSource {
  readonly method: SamplingMethod;
  constructor(private readonly gen: NormalGenerator) {
    this.method = gen.method;
  }
  fill(out: Float64Array, start: number, count: number): void {
    this.gen.fill(out, start, count);
  }
}

/** Normal scores by inverse CDF of (stratified) uniforms. */
class InverseScores implements ScoreSource {
  readonly method = 'inverse-cdf' as const;
  constructor(private readonly uniforms: UniformSource) {}
  fill(out: Float64Array, start: number, count: number): void {
    this.uniforms.fill(out, start, count);
    for (let k = start; k < start + count; k++) {
      const u = out[k];
      out[k] = normalQuantilePQ(u, 1 - u);
    }
  }
}

export interface SamplerContext {
  seed: string | number;
  design: Design;
  normalMethod: NormalMethod;
  /** Trials this sampler fills: the chunk's length inside a run (the Latin hypercube's n). */
  trials: number;
  /** Chunk index inside a run: part of every stream key (absent for stand-alone samplers). */
  chunk?: number;
}

/** The uniform source of one input: its main stream, stratified under Latin hypercube. */
export function uniformSourceFor(ctx: SamplerContext, streamId: string): UniformSource {
  const main = Stream.forInput(ctx.seed, streamId, '', ctx.chunk);
  if (ctx.design === 'latin-hypercube') {
    // Strata per chunk: each chunk is a Latin hypercube of its own trials (n = the chunk's
    // length, permutation from a chunk-keyed stream), so a chunk never depends on another.
    return new LatinHypercubeUniforms(ctx.trials, Stream.forInput(ctx.seed, streamId, 'lhs-permutation', ctx.chunk), main);
  }
  return new StreamUniforms(main);
}

/** Standard normal scores for one input (generator under Monte Carlo, inverse CDF under LHS). */
export function scoreSourceFor(ctx: SamplerContext, streamId: string): ScoreSource {
  if (ctx.design === 'latin-hypercube') return new InverseScores(uniformSourceFor(ctx, streamId));
  return new GeneratorScores(createNormalGenerator(ctx.normalMethod, Stream.forInput(ctx.seed, streamId, '', ctx.chunk)));
}

// ---------------------------------------------------------------------------------------

class ConstantSampler implements ColumnSampler {
  readonly method = 'constant' as const;
  constructor(private readonly value: number) {}
  fill(out: Float64Array, start: number, count: number): void {
    out.fill(this.value, start, start + count);
  }
  report(): SamplingReport {
    return { method: this.method };
  }
}

class InverseCdfSampler implements ColumnSampler {
  readonly method = 'inverse-cdf' as const;
  constructor(
    private readonly marginal: Marginal,
    private readonly uniforms: UniformSource,
  ) {}
  fill(out: Float64Array, start: number, count: number): void {
    this.uniforms.fill(out, start, count);
    fillInverse(this.marginal, out, null, out, start, count);
  }
  report(): SamplingReport {
    return { method: this.method };
  }
}

class ScoreSampler implements ColumnSampler {
  readonly method: SamplingMethod;
  constructor(
    private readonly fromZ: (z: number) => number,
    private readonly scores: ScoreSource,
  ) {
    this.method = scores.method;
  }
  fill(out: Float64Array, start: number, count: number): void {
    this.scores.fill(out, start, count);
    const f = this.fromZ;
    for (let k = start; k < start + count; k++) out[k] = f(out[k]);
  }
  report(): SamplingReport {
    return { method: this.method };
  }
}

/** "1 in 1,000" style text for an acceptance rate. */
function oneIn(rate: number): string {
  if (!(rate > 0)) return 'none of the';
  return `1 in ${Math.round(1 / rate).toLocaleString('en-US')}`;
}

/** Cells of the squeeze table used to skip most density evaluations. */
const SQUEEZE_CELLS = 256;

/** Smallest acceptance rate a box envelope may have before a run is refused. */
export const MIN_ACCEPTANCE = 1e-3;
/** Attempts for a single draw after which the sampler gives up. */
export const MAX_ATTEMPTS_PER_DRAW = 1_000_000;
/** Attempts after which the observed acceptance rate is checked against MIN_ACCEPTANCE. */
export const ACCEPTANCE_CHECK_AFTER = 10_000;

/**
 * Rejection sampling under a box envelope (von Neumann 1951): x uniform on [a, b], keep it
 * when u M < f(x). The acceptance rate is 1 / (M (b - a)) for a normalised f; it is
 * counted and reported. Guards: a box lower than the density is an error (the samples
 * would be silently biased), and a run whose acceptance collapses stops with a message.
 */
export class RejectionSampler implements ColumnSampler {
  readonly method = 'rejection' as const;
  attempts = 0;
  accepted = 0;
  /** Per-cell lower and upper bounds of the density (squeeze), or null. */
  private readonly lower: Float64Array | null = null;
  private readonly upper: Float64Array | null = null;

  constructor(
    private readonly env: RejectionEnvelope,
    private readonly stream: Stream,
    private readonly label: string | null = null,
  ) {
    if (!(env.expectedAcceptance >= MIN_ACCEPTANCE) || !(env.M > 0) || !(env.b > env.a)) {
      throw new SamplingError(
        'acceptance-too-low',
        `${this.who()}the box envelope would accept only ${oneIn(env.expectedAcceptance)} candidates ` +
          `(the minimum is ${oneIn(MIN_ACCEPTANCE)}): the density is too concentrated for box rejection sampling.`,
        label,
      );
    }
    if (env.turningPoints) {
      // Between turning points the density is monotone, so on each cell its extremes are at
      // the cell's ends or at a turning point inside it. Bounds are widened by a relative
      // 1e-9 so rounding can never make a squeeze decision differ from evaluating f.
      const cells = SQUEEZE_CELLS;
      const lo = new Float64Array(cells);
      const hi = new Float64Array(cells);
      const span = env.b - env.a;
      const turns = env.turningPoints.filter((t) => t > env.a && t < env.b).sort((x, y) => x - y);
      let ti = 0;
      let fPrev = env.density(env.a);
      for (let c = 0; c < cells; c++) {
        // Cell edges computed as candidates are (a + w v, rounding is monotone), so every
        // candidate with v in [c/cells, (c+1)/cells) lies between them.
        const x0 = env.a + span * (c / cells);
        const x1 = env.a + span * ((c + 1) / cells);
        const f1 = env.density(x1);
        let mn = Math.min(fPrev, f1);
        let mx = Math.max(fPrev, f1);
        while (ti < turns.length && turns[ti] < x1) {
          if (turns[ti] > x0) {
            const ft = env.density(turns[ti]);
            mn = Math.min(mn, ft);
            mx = Math.max(mx, ft);
          }
          ti++;
        }
        lo[c] = mn * (1 - 1e-9);
        hi[c] = mx * (1 + 1e-9);
        fPrev = f1;
      }
      this.lower = lo;
      this.upper = hi;
    }
  }

  private who(): string {
    return this.label ? `Input '${this.label}': ` : '';
  }

  fill(out: Float64Array, start: number, count: number): void {
    const { a, b, M, density } = this.env;
    const w = b - a;
    const s = this.stream;
    const limit = M * (1 + 1e-9);
    const lower = this.lower;
    const upper = this.upper;
    const cellScale = SQUEEZE_CELLS;
    let attempts = this.attempts;
    for (let k = start; k < start + count; k++) {
      let tries = 0;
      for (;;) {
        const v = s.uniform();
        const x = a + w * v;
        const u = s.uniform();
        attempts++;
        tries++;
        const uM = u * M;
        if (lower !== null && upper !== null) {
          const c = Math.min(cellScale - 1, Math.floor(v * cellScale));
          if (uM < lower[c]) {
            out[k] = x;
            break;
          }
          if (uM >= upper[c]) {
            if (tries >= MAX_ATTEMPTS_PER_DRAW) {
              this.attempts = attempts;
              throw this.collapse();
            }
            continue;
          }
        }
        const fx = density(x);
        if (fx > limit) {
          throw new SamplingError(
            'envelope-too-low',
            `${this.who()}the density reaches ${fx.toPrecision(6)} at x = ${x.toPrecision(6)}, above the box height ` +
              `${M.toPrecision(6)}; rejection sampling under this box would be biased.`,
            this.label,
          );
        }
        if (uM < fx) {
          out[k] = x;
          break;
        }
        if (tries >= MAX_ATTEMPTS_PER_DRAW) {
          this.attempts = attempts;
          throw this.collapse();
        }
      }
    }
    this.attempts = attempts;
    this.accepted += count;
    if (this.attempts >= ACCEPTANCE_CHECK_AFTER && this.accepted / this.attempts < MIN_ACCEPTANCE) {
      throw this.collapse();
    }
  }

  private collapse(): SamplingError {
    const rate = this.attempts > 0 ? this.accepted / this.attempts : 0;
    return new SamplingError(
      'acceptance-collapsed',
      `${this.who()}rejection sampling stopped: ${this.accepted} of ${this.attempts} candidates accepted ` +
        `(${oneIn(rate)}; the box should accept ${oneIn(this.env.expectedAcceptance)}).`,
      this.label,
    );
  }

  report(): SamplingReport {
    return {
      method: this.method,
      attempts: this.attempts,
      accepted: this.accepted,
      acceptanceRate: this.attempts > 0 ? this.accepted / this.attempts : 0,
      expectedAcceptance: this.env.expectedAcceptance,
    };
  }
}

/** The method createColumnSampler picks, without building the sampler (for reports). */
export function samplingMethodOf(marginal: Marginal, ctx: Pick<SamplerContext, 'design' | 'normalMethod'>): SamplingMethod {
  if (marginal.natural === 'constant') return 'constant';
  if (ctx.design === 'monte-carlo') {
    if (marginal.fromZ && (marginal.natural === 'normal' || marginal.natural === 'lognormal')) return ctx.normalMethod;
    if (marginal.natural === 'rejection' && marginal.envelope) return 'rejection';
  }
  return 'inverse-cdf';
}

/**
 * The independent sampler of one input. Plain Monte Carlo uses the marginal's natural
 * method (normal generator, rejection, inverse CDF); Latin hypercube uses the inverse CDF
 * of stratified uniforms for every law so the strata survive.
 */
export function createColumnSampler(marginal: Marginal, ctx: SamplerContext, streamId: string, label: string | null = null): ColumnSampler {
  if (marginal.natural === 'constant') return new ConstantSampler(marginal.mean);
  if (ctx.design === 'monte-carlo') {
    if (marginal.fromZ && (marginal.natural === 'normal' || marginal.natural === 'lognormal')) {
      return new ScoreSampler(marginal.fromZ, scoreSourceFor(ctx, streamId));
    }
    if (marginal.natural === 'rejection' && marginal.envelope) {
      return new RejectionSampler(marginal.envelope, Stream.forInput(ctx.seed, streamId, '', ctx.chunk), label);
    }
  }
  return new InverseCdfSampler(marginal, uniformSourceFor(ctx, streamId));
}
