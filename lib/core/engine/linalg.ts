/**
 * Correlation matrices: validation, positive semi-definiteness by eigendecomposition
 * (ml-matrix), the symmetric square root used to correlate normal scores, and the nearest
 * correlation matrix by alternating projections (Higham 2002, IMA J. Numer. Anal.
 * 22(3):329-343).
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import type { ModelIssue } from './errors';
import { provideLinalg } from './optional-parts';

/** Eigenvalues below -PSD_TOLERANCE make a matrix "not positive semi-definite". */
export const PSD_TOLERANCE = 1e-10;

export interface EigenPairs {
  /** Eigenvalues, descending. */
  values: number[];
  /** vectors[k] is the unit eigenvector of values[k], sign fixed (see canonicalEigen). */
  vectors: number[][];
}

/**
 * Eigendecomposition with a canonical order and sign, so nothing downstream depends on
 * the order or sign an implementation happens to return: eigenvalues descending (ties by
 * the vectors' components), each vector's largest-magnitude component positive (the first
 * such component on ties).
 */
export function canonicalEigen(values: number[], vectors: number[][]): EigenPairs {
  const n = values.length;
  const fixed = vectors.map((v) => {
    let best = 0;
    for (let i = 1; i < v.length; i++) if (Math.abs(v[i]) > Math.abs(v[best]) + 1e-12) best = i;
    return v[best] < 0 ? v.map((x) => -x) : v.slice();
  });
  const order = Array.from({ length: n }, (_, k) => k).sort((i, j) => {
    if (values[i] !== values[j]) return values[j] - values[i];
    const a = fixed[i];
    const b = fixed[j];
    for (let t = 0; t < a.length; t++) if (a[t] !== b[t]) return b[t] - a[t];
    return i - j;
  });
  return { values: order.map((k) => values[k]), vectors: order.map((k) => fixed[k]) };
}

/** Symmetric eigendecomposition (ml-matrix), in canonical form. */
export function symmetricEigen(matrix: number[][]): EigenPairs {
  const n = matrix.length;
  if (n === 0) return { values: [], vectors: [] };
  const e = new EigenvalueDecomposition(new Matrix(matrix), { assumeSymmetric: true });
  const V = e.eigenvectorMatrix;
  const values = e.realEigenvalues.slice();
  const vectors: number[][] = [];
  for (let k = 0; k < n; k++) {
    const v: number[] = [];
    for (let i = 0; i < n; i++) v.push(V.get(i, k));
    vectors.push(v);
  }
  return canonicalEigen(values, vectors);
}

/** V f(D) V^T from canonical eigenpairs, summed in a fixed order. */
export function spectralFunction(pairs: EigenPairs, f: (lambda: number) => number): number[][] {
  const n = pairs.values.length;
  const out = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let k = 0; k < n; k++) {
    const fl = f(pairs.values[k]);
    if (fl === 0) continue;
    const v = pairs.vectors[k];
    for (let i = 0; i < n; i++) {
      const vi = v[i] * fl;
      for (let j = 0; j < n; j++) out[i][j] += vi * v[j];
    }
  }
  return out;
}

/**
 * Symmetric square root S = V D^1/2 V^T of a positive semi-definite matrix (negative
 * eigenvalues within tolerance are treated as 0). S S^T = V D V^T, so X = S Z has the
 * matrix as its covariance. Unlike V D^1/2 alone, S does not change when an eigenvector's
 * sign flips or when equal eigenvalues' vectors rotate.
 */
export function symmetricSqrt(matrix: number[][]): number[][] {
  return spectralFunction(symmetricEigen(matrix), (l) => (l > 0 ? Math.sqrt(l) : 0));
}

/** Inverse symmetric square root of a positive definite matrix. */
export function inverseSqrt(matrix: number[][]): number[][] {
  return spectralFunction(symmetricEigen(matrix), (l) => (l > 0 ? 1 / Math.sqrt(l) : 0));
}

export interface CorrelationCheck {
  ok: boolean;
  /** Structural problems (shape, symmetry, diagonal, range) with [row, column] paths. */
  issues: ModelIssue[];
  /** Eigenvalues (descending) when the structure is valid. */
  eigenvalues: number[] | null;
  smallestEigenvalue: number | null;
  positiveSemiDefinite: boolean;
}

/**
 * Check a correlation matrix: square, finite, symmetric, unit diagonal, entries in [-1, 1],
 * and positive semi-definite (smallest eigenvalue >= -PSD_TOLERANCE).
 */
export function checkCorrelation(matrix: number[][]): CorrelationCheck {
  const issues: ModelIssue[] = [];
  const n = Array.isArray(matrix) ? matrix.length : 0;
  if (!Array.isArray(matrix) || n === 0) {
    issues.push({ path: [], message: 'The correlation matrix is empty.' });
  } else {
    for (let i = 0; i < n; i++) {
      const row = matrix[i];
      if (!Array.isArray(row) || row.length !== n) {
        issues.push({ path: [i], message: `Row ${i + 1} has ${Array.isArray(row) ? row.length : 0} entries; the matrix must be ${n} by ${n}.` });
        continue;
      }
      for (let j = 0; j < n; j++) {
        const v = row[j];
        if (typeof v !== 'number' || !Number.isFinite(v)) {
          issues.push({ path: [i, j], message: 'Each correlation must be a finite number.' });
        } else if (i === j && Math.abs(v - 1) > 1e-12) {
          issues.push({ path: [i, j], message: `The diagonal must be 1 (found ${v}).` });
        } else if (v < -1 || v > 1) {
          issues.push({ path: [i, j], message: `Correlations lie between -1 and 1 (found ${v}).` });
        }
      }
    }
    if (issues.length === 0) {
      for (let i = 0; i < n; i++) {
        for (let j = i + 1; j < n; j++) {
          if (Math.abs(matrix[i][j] - matrix[j][i]) > 1e-12) {
            issues.push({
              path: [j, i],
              message: `The matrix must be symmetric: entry (${i + 1}, ${j + 1}) is ${matrix[i][j]} but (${j + 1}, ${i + 1}) is ${matrix[j][i]}.`,
            });
          }
        }
      }
    }
  }
  if (issues.length > 0) {
    return { ok: false, issues, eigenvalues: null, smallestEigenvalue: null, positiveSemiDefinite: false };
  }
  const { values } = symmetricEigen(matrix);
  const smallest = values[values.length - 1];
  const psd = smallest >= -PSD_TOLERANCE;
  if (!psd) {
    issues.push({
      path: [],
      message:
        `The correlation matrix is not positive semi-definite: its smallest eigenvalue is ${smallest.toPrecision(6)}. ` +
        'These correlations cannot all hold at once; accept the nearest valid correlation matrix or revise the entries.',
    });
  }
  return { ok: psd, issues, eigenvalues: values, smallestEigenvalue: smallest, positiveSemiDefinite: psd };
}

export interface NearestCorrelationResult {
  matrix: number[][];
  iterations: number;
  converged: boolean;
  smallestEigenvalue: number;
  /** Frobenius distance from the input. */
  distance: number;
}

function frobenius(a: number[][], b: number[][]): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) for (let j = 0; j < a.length; j++) s += (a[i][j] - b[i][j]) ** 2;
  return Math.sqrt(s);
}

/**
 * Nearest correlation matrix in the Frobenius norm (Higham 2002, Algorithm 3.3:
 * alternating projections with Dykstra's correction, unit weights). The result is
 * symmetrised, given a unit diagonal, and nudged so that its smallest eigenvalue is not
 * below a small positive floor, so it always passes checkCorrelation.
 */
export function nearestCorrelation(matrix: number[][], options: { tolerance?: number; maxIterations?: number } = {}): NearestCorrelationResult {
  const tol = options.tolerance ?? 1e-12;
  const maxIt = options.maxIterations ?? 10_000;
  const n = matrix.length;
  const A = matrix.map((row, i) => row.map((v, j) => (i === j ? 1 : (v + matrix[j][i]) / 2)));
  let Y = A.map((r) => r.slice());
  let dS = A.map((r) => r.map(() => 0));
  let X = Y;
  let it = 0;
  let converged = false;
  for (; it < maxIt; it++) {
    const R = Y.map((row, i) => row.map((v, j) => v - dS[i][j]));
    X = spectralFunction(symmetricEigen(R), (l) => (l > 0 ? l : 0));
    dS = X.map((row, i) => row.map((v, j) => v - R[i][j]));
    const Ynew = X.map((row, i) => row.map((v, j) => (i === j ? 1 : v)));
    const change = frobenius(Ynew, Y) / Math.max(1, Math.sqrt(n));
    Y = Ynew;
    if (change < tol) {
      converged = true;
      it++;
      break;
    }
  }
  // Final clean-up: symmetric, unit diagonal, smallest eigenvalue lifted to a floor.
  const floor = 1e-12;
  let out = Y.map((row, i) => row.map((v, j) => (i === j ? 1 : (v + Y[j][i]) / 2)));
  let pairs = symmetricEigen(out);
  if (pairs.values[n - 1] < floor) {
    const lifted = spectralFunction(pairs, (l) => Math.max(l, floor));
    const d = lifted.map((row, i) => Math.sqrt(row[i]));
    out = lifted.map((row, i) => row.map((v, j) => (i === j ? 1 : Math.max(-1, Math.min(1, v / (d[i] * d[j]))))));
    out = out.map((row, i) => row.map((v, j) => (i === j ? 1 : (v + out[j][i]) / 2)));
    pairs = symmetricEigen(out);
  }
  return {
    matrix: out,
    iterations: it,
    converged,
    smallestEigenvalue: pairs.values[n - 1],
    distance: frobenius(out, A),
  };
}

// Run code reaches these through optional-parts.ts (the embed loads this module only for correlated models).
provideLinalg({ checkCorrelation, symmetricSqrt, inverseSqrt, nearestCorrelation });
