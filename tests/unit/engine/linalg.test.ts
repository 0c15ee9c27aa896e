import { describe, expect, it } from 'vitest';
import { canonicalEigen, checkCorrelation, nearestCorrelation, spectralFunction, symmetricEigen, symmetricSqrt } from '@/lib/core/engine/linalg';

const matMul = (a: number[][], b: number[][]) => a.map((row) => b[0].map((_, j) => row.reduce((s, v, k) => s + v * b[k][j], 0)));

describe('eigendecomposition', () => {
  it('2 by 2: [[1, rho], [rho, 1]] has eigenvalues 1 +/- rho and vectors (1, +/-1)/sqrt 2', () => {
    // check-values.md: two-by-two check.
    for (const rho of [0.3, 0.8, -0.6]) {
      const { values, vectors } = symmetricEigen([
        [1, rho],
        [rho, 1],
      ]);
      const hi = 1 + Math.abs(rho);
      expect(values[0]).toBeCloseTo(hi, 14);
      expect(values[1]).toBeCloseTo(1 - Math.abs(rho), 14);
      const s = Math.SQRT1_2;
      const plus = [s, s];
      const minus = [s, -s];
      const first = rho > 0 ? plus : minus;
      const second = rho > 0 ? minus : plus;
      first.forEach((v, i) => expect(vectors[0][i]).toBeCloseTo(v, 14));
      second.forEach((v, i) => expect(vectors[1][i]).toBeCloseTo(v, 14));
    }
  });

  it('results do not depend on the order or sign of the eigenpairs an implementation returns', () => {
    const R = [
      [1, 0.5, 0.2],
      [0.5, 1, 0.4],
      [0.2, 0.4, 1],
    ];
    const ref = symmetricEigen(R);
    // Scramble: reverse the order and flip signs.
    const values = [...ref.values].reverse();
    const vectors = [...ref.vectors].reverse().map((v, k) => (k % 2 === 0 ? v.map((x) => -x) : v));
    const again = canonicalEigen(values, vectors);
    expect(again).toEqual(ref);
    const sqrtA = spectralFunction(ref, Math.sqrt);
    const sqrtB = spectralFunction(again, Math.sqrt);
    expect(sqrtB).toEqual(sqrtA); // bit for bit
  });

  it('the symmetric square root squares back to the matrix and follows a permutation of the inputs', () => {
    const R = [
      [1, 0.6, 0.36, 0.216],
      [0.6, 1, 0.6, 0.36],
      [0.36, 0.6, 1, 0.6],
      [0.216, 0.36, 0.6, 1],
    ];
    const S = symmetricSqrt(R);
    const back = matMul(S, S);
    R.forEach((row, i) => row.forEach((v, j) => expect(back[i][j]).toBeCloseTo(v, 13)));
    const perm = [2, 0, 3, 1];
    const Rp = perm.map((i) => perm.map((j) => R[i][j]));
    const Sp = symmetricSqrt(Rp);
    perm.forEach((i, a) => perm.forEach((j, b) => expect(Sp[a][b]).toBeCloseTo(S[i][j], 13)));
  });
});

describe('checkCorrelation', () => {
  it('accepts a valid matrix and reports its eigenvalues', () => {
    const r = checkCorrelation([
      [1, 0.3],
      [0.3, 1],
    ]);
    expect(r.ok).toBe(true);
    expect(r.eigenvalues?.[0]).toBeCloseTo(1.3, 14);
  });
  it('names each structural problem with its position', () => {
    const r = checkCorrelation([
      [1, 0.2, 1.5],
      [0.3, 0.9, 0],
      [1.5, 0, 1],
    ]);
    expect(r.ok).toBe(false);
    expect(r.issues).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: [0, 2], message: expect.stringMatching(/between -1 and 1/) }),
        expect.objectContaining({ path: [1, 1], message: expect.stringMatching(/diagonal must be 1/) }),
      ]),
    );
    const asym = checkCorrelation([
      [1, 0.2],
      [0.3, 1],
    ]);
    expect(asym.issues[0].message).toMatch(/symmetric/);
    expect(checkCorrelation([[1, 0.2], [0.2]]).issues[0].message).toMatch(/2 by 2/);
  });
  it('refuses a matrix that is not positive semi-definite and names its smallest eigenvalue', () => {
    // Higham 2002's example: eigenvalues -0.4142, 1, 2.4142 (check-values.md, restated).
    const r = checkCorrelation([
      [1, 1, 0],
      [1, 1, 1],
      [0, 1, 1],
    ]);
    expect(r.ok).toBe(false);
    expect(r.smallestEigenvalue).toBeCloseTo(1 - Math.SQRT2, 12);
    expect(r.issues[0].message).toContain('smallest eigenvalue is -0.414214');
  });
});

describe('nearest correlation matrix (Higham 2002)', () => {
  it('repairs Higham\'s example to the published off-diagonals', () => {
    const r = nearestCorrelation([
      [1, 1, 0],
      [1, 1, 1],
      [0, 1, 1],
    ]);
    // Higham 2002, IMA J. Numer. Anal. 22(3): 0.7607 and 0.1573 (restated); 0.76068985 and 0.15729811 computed.
    expect(r.converged).toBe(true);
    expect(r.matrix[0][1]).toBeCloseTo(0.7607, 4);
    expect(r.matrix[1][2]).toBeCloseTo(0.7607, 4);
    expect(r.matrix[0][2]).toBeCloseTo(0.1573, 4);
    expect(Math.abs(r.matrix[0][1] - 0.76068985)).toBeLessThan(1e-7);
    expect(Math.abs(r.matrix[0][2] - 0.15729811)).toBeLessThan(1e-7);
    expect(checkCorrelation(r.matrix).ok).toBe(true);
    expect(r.matrix.map((row, i) => row[i])).toEqual([1, 1, 1]);
  });
  it('leaves a valid correlation matrix unchanged', () => {
    const R = [
      [1, 0.4, 0.1],
      [0.4, 1, 0.2],
      [0.1, 0.2, 1],
    ];
    const r = nearestCorrelation(R);
    R.forEach((row, i) => row.forEach((v, j) => expect(r.matrix[i][j]).toBeCloseTo(v, 10)));
  });
});
