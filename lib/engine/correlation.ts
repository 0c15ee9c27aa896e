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
import type { Marginal } from './distributions';
import { checkCorrelation, inverseSqrt, nearestCorrelation, symmetricSqrt } from './linalg';
import { Stream } from './rng';
import type { SamplerContext, SamplingMethod, ScoreSource } from './samplers';
import { scoreSourceFor } from './samplers';
import { argsort, averageRanks, sortedCopy } from './sort';
import { normalCdfPair, normalCdfPairUpper, normalQuantilePQ } from './special';
import { pearson } from './stats';
import { asin, sin } from './det-math';

const BLOCK = 4096;

export class CopulaGroupSampler {
  private readonly S: Float64Array;
  private readonly k: number;
  private readonly scores: ScoreSource[];
  private readonly z: Float64Array[];

  constructor(
    private readonly marginals: Marginal[],
    matrix: number[][],
    ctx: SamplerContext,
    streamIds: string[],
  ) {
    const k = marginals.length;
    this.k = k;
    const root = symmetricSqrt(matrix);
    this.S = new Float64Array(k * k);
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) this.S[i * k + j] = root[i][j];
    this.scores = streamIds.map((id) => scoreSourceFor(ctx, id));
    this.z = marginals.map(() => new Float64Array(BLOCK));
  }

  get scoreMethod(): SamplingMethod {
    return this.scores[0]?.method ?? 'box-muller';
  }

  /** Fill each member's column over [start, start + count). */
  fill(columns: Float64Array[], start: number, count: number): void {
    const k = this.k;
    const S = this.S;
    for (let s = 0; s < count; s += BLOCK) {
      const c = Math.min(BLOCK, count - s);
      for (let j = 0; j < k; j++) this.scores[j].fill(this.z[j], 0, c);
      for (let i = 0; i < k; i++) {
        const out = columns[i];
        const base = start + s;
        // Correlated score: sum_j S[i][j] z_j, summed in a fixed order.
        const z0 = this.z[0];
        const s0 = S[i * k];
        for (let t = 0; t < c; t++) out[base + t] = s0 * z0[t];
        for (let j = 1; j < k; j++) {
          const sij = S[i * k + j];
          if (sij === 0) continue;
          const zj = this.z[j];
          for (let t = 0; t < c; t++) out[base + t] += sij * zj[t];
        }
        const m = this.marginals[i];
        const fz = m.fromZ;
        if (fz) {
          for (let t = 0; t < c; t++) out[base + t] = fz(out[base + t]);
        } else {
          for (let t = 0; t < c; t++) {
            const p = normalCdfPair(out[base + t]);
            const q = normalCdfPairUpper();
            out[base + t] = m.inv(p, q);
          }
        }
      }
    }
  }
}

/**
 * Reorder the columns in place (Iman & Conover 1982) so their rank correlation follows
 * the target matrix. Each member's random score permutation comes from its own stream.
 */
export function imanConover(columns: Float64Array[], target: number[][], seed: string | number, streamIds: string[]): void {
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
    const st = Stream.forInput(seed, id, 'iman-conover');
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
): AchievedCorrelation {
  const n = Math.min(columns[0]?.length ?? 0, maxTrials);
  const cols = columns.map((c) => c.subarray(0, n));
  const ranks = cols.map((c) => averageRanks(c));
  const k = cols.length;
  const pm: number[][] = cols.map((_, i) => cols.map((__, j) => (i === j ? 1 : 0)));
  const sm: number[][] = cols.map((_, i) => cols.map((__, j) => (i === j ? 1 : 0)));
  for (let i = 0; i < k; i++)
    for (let j = i + 1; j < k; j++) {
      const p = pearson(cols[i], cols[j]);
      const s = pearson(ranks[i], ranks[j]);
      pm[i][j] = pm[j][i] = Number.isFinite(p) ? p : 0;
      sm[i][j] = sm[j][i] = Number.isFinite(s) ? s : 0;
    }
  return {
    ids,
    target,
    pearson: pm,
    spearman: sm,
    expectedSpearman: method === 'copula' ? target.map((row) => row.map((r) => (6 / Math.PI) * asin(r / 2))) : target.map((row) => row.slice()),
    trials: n,
  };
}
