/**
 * Correlated inputs.
 *
 * Gaussian copula: each member draws independent standard normal scores Z from its own
 * stream; the scores are correlated by X = S Z with S = V D^1/2 V^T the symmetric square
 * root of the correlation matrix R = V D V^T (ml-matrix eigendecomposition); each member
 * then maps its score through its marginal: a normal input as mu + sigma z (so the
 * covariance is diag(sigma) R diag(sigma)), a lognormal as exp(mu + sigma z), anything
 * else through its inverse CDF at Phi(z). Decomposing R rather than the covariance keeps
 * every other input's column unchanged when a dial moves one input's mean or spread.
 *
 * Iman & Conover (1982, Commun. Statist. Simul. Comput. 11(3):311-334): members are
 * sampled independently, then each column is reordered to follow the ranks of van der
 * Waerden scores correlated to the target; marginals are untouched (only reordered).
 * Here the matrix holds rank (Spearman) correlations; under the copula it holds the
 * correlations of the normal scores (the Pearson correlation for normal inputs).
 */
import { fillInverse, type Marginal } from './distributions';
import { linalgPart } from './optional-parts';
import { Stream } from './rng';
import type { SamplerContext, SamplingMethod, ScoreSource } from './samplers';
import { scoreSourceFor } from './samplers';
import { argsort, sortedCopy } from './sort';
import * as special from './special';
import { correlationMatrix, pearson, RankCache } from './stats';
import * as detMath from './det-math';
import * as wasm from './wasm-kernels';
import type { Kernels } from './wasm-kernels';

// Bound once (see det-math): hot loops call these per sample.
const { normalCdfPair, normalCdfPairUpper, normalQuantilePQ } = special;

// Bound once: module interop in some runtimes turns each imported call into a getter call.
const { asin, exp, sin } = detMath;
const { LAYOUT, wasmKernels, workspace } = wasm;

/** Trials per block: a multiple of 8, as the wasm kernel computes eight trials per pass. */
const BLOCK = 1024;
const BLOCK_BYTES = BLOCK * 8;

interface CopulaRow {
  /** Constant term and the nonzero coefficients of the member's score in the z_j. */
  a: number;
  js: Int32Array;
  cs: Float64Array;
  /** First coefficient of this row in the sampler's flat tables. */
  first: number;
  mode: 'normal' | 'lognormal' | 'inverse';
  marginal: Marginal;
}

/**
 * The product X = a + S z runs in the wasm SIMD kernel (kernels.wat) when the thread has
 * it, else in the JavaScript loop of fillJs; both do the same operations in the same order
 * per trial (tests/unit/engine/wasm-kernels.test.ts), so results never depend on which ran.
 */
export class CopulaGroupSampler {
  private readonly rows: CopulaRow[];
  private readonly scores: ScoreSource[];
  /** The JavaScript path's score blocks and accumulator (made on first use: the wasm path has its own in the kernels' memory). */
  private z: Float64Array[] | null = null;
  private acc: Float64Array | null = null;
  private readonly q = new Float64Array(BLOCK);
  /** Every row's coefficients, and the byte address of each one's score block in the kernels' memory. */
  private readonly coefTable: Float64Array;
  private readonly offTable: Int32Array;

  /** root: the symmetric square root of matrix when the caller has it (one decomposition per run, not per chunk). */
  constructor(marginals: Marginal[], matrix: number[][], ctx: SamplerContext, streamIds: string[], root: number[][] = linalgPart().symmetricSqrt(matrix)) {
    // A normal member's value is mu + sigma (S z), so sigma folds into its row of S.
    let first = 0;
    this.rows = marginals.map((m, i) => {
      const aff = m.affine;
      const scale = aff ? aff.b : 1;
      const js: number[] = [];
      const cs: number[] = [];
      root[i].forEach((v, j) => {
        if (v !== 0) {
          js.push(j);
          cs.push(scale * v);
        }
      });
      const row: CopulaRow = { a: aff ? aff.a : 0, js: Int32Array.from(js), cs: Float64Array.from(cs), first, mode: aff ? (aff.log ? 'lognormal' : 'normal') : 'inverse', marginal: m };
      first += js.length;
      return row;
    });
    this.coefTable = new Float64Array(first);
    this.offTable = new Int32Array(first);
    for (const row of this.rows) {
      this.coefTable.set(row.cs, row.first);
      // Layout of the kernels' memory (fillWasm): the accumulator block, then score block j.
      row.js.forEach((j, g) => (this.offTable[row.first + g] = LAYOUT.scratch + (1 + j) * BLOCK_BYTES));
    }
    this.scores = streamIds.map((id) => scoreSourceFor(ctx, id));
  }

  get scoreMethod(): SamplingMethod {
    return this.scores[0]?.method ?? 'box-muller';
  }

  /**
   * Fill each member's column over [start, start + count); a null column is skipped (its
   * scores are still drawn, so the other members get exactly the values they would).
   */
  fill(columns: (Float64Array | null)[], start: number, count: number): void {
    const k = wasmKernels();
    if (k) this.fillWasm(k, columns, start, count);
    else this.fillJs(columns, start, count);
  }

  private fillWasm(k: Kernels, columns: (Float64Array | null)[], start: number, count: number): void {
    // Workspace: accumulator, one score block per member, coefficients (f64), their blocks' addresses (i32).
    const members = this.rows.length;
    const terms = this.coefTable.length;
    const at = LAYOUT.scratch;
    const coefAt = at + (1 + members) * BLOCK_BYTES;
    const offAt = coefAt + 8 * terms;
    const buf = workspace(k, offAt + 4 * terms - at);
    const acc = new Float64Array(buf, at, BLOCK);
    const Z = this.rows.map((_, j) => new Float64Array(buf, at + (1 + j) * BLOCK_BYTES, BLOCK));
    new Float64Array(buf, coefAt, terms).set(this.coefTable);
    new Int32Array(buf, offAt, terms).set(this.offTable);
    const qb = this.q;
    for (let s = 0; s < count; s += BLOCK) {
      const c = Math.min(BLOCK, count - s);
      const base = start + s;
      for (let j = 0; j < members; j++) this.scores[j].fill(Z[j], 0, c);
      for (let i = 0; i < this.rows.length; i++) {
        const out = columns[i];
        if (!out) continue;
        const row = this.rows[i];
        k.affine(at, row.a, coefAt + 8 * row.first, offAt + 4 * row.first, row.js.length, c);
        this.finish(row, acc, qb, out, base, c);
      }
    }
  }

  /** The same product in JavaScript (no WebAssembly on this thread). */
  private fillJs(columns: (Float64Array | null)[], start: number, count: number): void {
    const accBuf = (this.acc ??= new Float64Array(BLOCK));
    const qb = this.q;
    const Z = (this.z ??= this.rows.map(() => new Float64Array(BLOCK)));
    for (let s = 0; s < count; s += BLOCK) {
      const c = Math.min(BLOCK, count - s);
      const base = start + s;
      for (let j = 0; j < Z.length; j++) this.scores[j].fill(Z[j], 0, c);
      for (let i = 0; i < this.rows.length; i++) {
        const row = this.rows[i];
        const { js, cs } = row;
        // Normal members accumulate straight into their column; the others into a buffer.
        const out = columns[i];
        if (!out) continue;
        const direct = row.mode === 'normal';
        const acc = direct ? out.subarray(base, base + c) : accBuf;
        acc.fill(row.a, 0, c);
        // Sum of coefficient * score, four scores per pass, in a fixed order (kernels.wat does the same).
        let g = 0;
        for (; g + 3 < js.length; g += 4) {
          const z0 = Z[js[g]];
          const z1 = Z[js[g + 1]];
          const z2 = Z[js[g + 2]];
          const z3 = Z[js[g + 3]];
          const c0 = cs[g];
          const c1 = cs[g + 1];
          const c2 = cs[g + 2];
          const c3 = cs[g + 3];
          for (let t = 0; t < c; t++) acc[t] += c0 * z0[t] + c1 * z1[t] + c2 * z2[t] + c3 * z3[t];
        }
        for (; g < js.length; g++) {
          const z0 = Z[js[g]];
          const c0 = cs[g];
          for (let t = 0; t < c; t++) acc[t] += c0 * z0[t];
        }
        if (!direct) this.finish(row, acc, qb, out, base, c);
      }
    }
  }

  /** Map the member's scores in acc[0, c) through its marginal into out[base, base + c). */
  private finish(row: CopulaRow, acc: Float64Array, qb: Float64Array, out: Float64Array, base: number, c: number): void {
    if (row.mode === 'normal') {
      out.set(acc.subarray(0, c), base);
    } else if (row.mode === 'lognormal') {
      for (let t = 0; t < c; t++) out[base + t] = exp(acc[t]);
    } else {
      for (let t = 0; t < c; t++) {
        acc[t] = normalCdfPair(acc[t]);
        qb[t] = normalCdfPairUpper();
      }
      fillInverse(row.marginal, acc, qb, acc, 0, c);
      out.set(acc.subarray(0, c), base);
    }
  }
}

/**
 * Reorder the columns in place (Iman & Conover 1982) so their rank correlation follows
 * the target matrix. Each member's random score permutation comes from its own stream.
 * Inside a run this is applied per chunk: the columns are the chunk's trials and the
 * permutation streams are keyed by the chunk index, so the reordering of chunk k is the
 * same whichever thread runs it (and needs no other chunk).
 */
export function imanConover(columns: Float64Array[], target: number[][], seed: string | number, streamIds: string[], chunk?: number): void {
  const k = columns.length;
  const n = columns[0]?.length ?? 0;
  if (k < 2 || n < 3) return;
  // van der Waerden scores Phi^-1(i / (n + 1)).
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = (i + 1) / (n + 1);
    a[i] = normalQuantilePQ(p, 1 - p);
  }
  const R: Float64Array[] = streamIds.map((id) => {
    const st = Stream.forInput(seed, id, 'iman-conover', chunk);
    const r = Float64Array.from(a);
    for (let i = n - 1; i > 0; i--) {
      const j = st.nextBelow(i + 1);
      const t = r[i];
      r[i] = r[j];
      r[j] = t;
    }
    return r;
  });
  // The target is a rank (Spearman) correlation; normal scores need the Pearson
  // correlation 2 sin(pi rho_S / 6) to give it (bivariate normal: rho_S = (6/pi) asin(rho/2)).
  const { checkCorrelation, inverseSqrt, nearestCorrelation, symmetricSqrt } = linalgPart();
  let scoreTarget = target.map((row, i) => row.map((r, j) => (i === j ? 1 : 2 * sin((Math.PI * r) / 6))));
  if (!checkCorrelation(scoreTarget).positiveSemiDefinite) scoreTarget = nearestCorrelation(scoreTarget).matrix;
  // T = correlation of the score columns; M = P T^-1/2 maps them to correlation P P^T.
  const T = R.map((ri, i) => R.map((rj, j) => (i === j ? 1 : pearson(ri, rj))));
  const P = symmetricSqrt(scoreTarget);
  const Qinv = inverseSqrt(T);
  const M = P.map((row) => Qinv[0].map((_, j) => row.reduce((s, v, l) => s + v * Qinv[l][j], 0)));
  for (let i = 0; i < k; i++) {
    const star = new Float64Array(n);
    for (let l = 0; l < k; l++) {
      const w = M[i][l];
      if (w === 0) continue;
      const rl = R[l];
      for (let t = 0; t < n; t++) star[t] += w * rl[t];
    }
    const order = argsort(star);
    const sorted = sortedCopy(columns[i]);
    const col = columns[i];
    for (let r = 0; r < n; r++) col[order[r]] = sorted[r];
  }
}

export interface AchievedCorrelation {
  ids: string[];
  target: number[][];
  pearson: number[][];
  spearman: number[][];
  /**
   * The rank correlation the method aims at: Gaussian copula (6/pi) asin(rho/2) of the
   * normal-score correlation rho; Iman-Conover the target itself (a rank correlation).
   */
  expectedSpearman: number[][];
  trials: number;
}

/** Pearson and Spearman correlation among columns (first maxTrials trials). */
export function achievedCorrelation(
  ids: string[],
  columns: Float64Array[],
  target: number[][],
  method: 'copula' | 'iman-conover',
  maxTrials: number,
  cache: RankCache = new RankCache(),
): AchievedCorrelation {
  const n = Math.min(columns[0]?.length ?? 0, maxTrials);
  const cols = columns.map((c) => c.subarray(0, n));
  return {
    ids,
    target,
    pearson: correlationMatrix(cols),
    spearman: correlationMatrix(columns.map((c) => cache.ranks(c, n))),
    expectedSpearman: method === 'copula' ? target.map((row) => row.map((r) => (6 / Math.PI) * asin(r / 2))) : target.map((row) => row.slice()),
    trials: n,
  };
}
