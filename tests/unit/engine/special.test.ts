import { describe, expect, it } from 'vitest';
import { jStat } from 'jstat';
import { erfc, gamma, lgamma, normalCdf, normalQuantile, normalQuantilePQ, normalSf, regIncBeta } from '@/lib/core/engine/special';
import { normalPpmOutside } from '@/lib/core/engine/stats';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('normal quantile (AS 241)', () => {
  // Double-precision values from /work/shared/reference/check-values.md; the rounded table
  // values are NIST/SEMATECH e-Handbook §1.3.6.7.1 and Abramowitz & Stegun Table 26.1 (restated).
  const cases: [number, number][] = [
    [0.8, 0.8416212335729143],
    [0.9, 1.2815515655446004],
    [0.95, 1.6448536269514722],
    [0.975, 1.959963984540054],
    [0.99, 2.3263478740408408],
    [0.995, 2.5758293035489004],
    [0.999, 3.090232306167813],
  ];
  it.each(cases)('z(%s)', (p, z) => {
    expect(rel(normalQuantile(p), z)).toBeLessThan(1e-14);
    expect(rel(-normalQuantile(1 - p), z)).toBeLessThan(1e-12);
  });
  it('agrees with the rounded NIST table', () => {
    expect(normalQuantile(0.95).toFixed(3)).toBe('1.645'); // NIST e-Handbook §1.3.6.7.1
    expect(normalQuantile(0.975).toFixed(3)).toBe('1.960');
  });
  it('is exact at 1/2, infinite at 0 and 1, and uses the complement for tiny upper tails', () => {
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    // Upper tail 9.865876450376946e-10 is the tail at 6 (check-values, computed).
    expect(rel(normalQuantilePQ(1 - 9.865876450376946e-10, 9.865876450376946e-10), 6)).toBeLessThan(1e-13);
  });
  it('inverts Phi across the range', () => {
    for (let z = -8; z <= 8; z += 0.37) {
      const p = normalCdf(z);
      const q = normalSf(z);
      expect(Math.abs(normalQuantilePQ(p, q) - z)).toBeLessThan(1e-12 * Math.max(1, Math.abs(z)));
    }
  });
});

describe('Phi and its complement (Cody)', () => {
  it('matches the NIST table and double-precision values', () => {
    // check-values.md: Phi(1), Phi(2), Phi(3) (restated; NIST e-Handbook §1.3.6.7.1 gives 0.5 + 0.34134 etc.)
    expect(rel(normalCdf(1), 0.8413447460685429)).toBeLessThan(1e-15);
    expect(rel(normalCdf(2), 0.9772498680518208)).toBeLessThan(1e-15);
    expect(rel(normalCdf(3), 0.9986501019683699)).toBeLessThan(1e-15);
    expect((normalCdf(1) - 0.5).toFixed(5)).toBe('0.34134');
    expect((normalCdf(2) - 0.5).toFixed(5)).toBe('0.47725');
    expect((normalCdf(3) - 0.5).toFixed(5)).toBe('0.49865');
  });
  it('computes ppm-level upper tails directly', () => {
    // check-values.md, computed: upper tail at 4.5 and at 6.
    expect(rel(normalSf(4.5), 3.3976731247300535e-6)).toBeLessThan(1e-13);
    expect(rel(normalSf(6), 9.865876450376946e-10)).toBeLessThan(1e-13);
    expect(rel(normalCdf(-6), 9.865876450376946e-10)).toBeLessThan(1e-13);
  });
  it('is symmetric and exact at 0', () => {
    expect(normalCdf(0)).toBe(0.5);
    for (const z of [0.3, 0.7, 1.9, 4, 7.5, 12]) expect(normalCdf(-z)).toBe(normalSf(z));
  });
  it('gives the two-sided ppm outside ±k sigma', () => {
    // check-values.md: erfc(k / sqrt 2) in ppm, computed; rounded figures restated from the NIST
    // e-Handbook ch. 6 and Montgomery's table of Cp and process fallout.
    const table: [number, string][] = [
      [1, '317310.5'],
      [2, '45500.26'],
      [3, '2699.796'],
      [4, '63.342'],
      [4.5, '6.795'],
      [5, '0.5733'],
      [6, '0.001973'],
    ];
    for (const [k, text] of table) {
      const decimals = text.split('.')[1].length;
      // Agrees with the published figure to the digits it gives.
      expect(normalPpmOutside(0, 1, -k, k).toFixed(decimals)).toBe(text);
      expect((erfc(k / Math.SQRT2) * 1e6).toFixed(decimals)).toBe(text);
    }
    // Full precision, computed with Python's math.erfc (C library erfc): k = 3 and k = 6.
    expect(rel(normalPpmOutside(0, 1, -3, 3), 2699.796063260191)).toBeLessThan(1e-13);
    expect(rel(normalPpmOutside(0, 1, -6, 6), 0.0019731752900754023)).toBeLessThan(1e-12);
  });
  it('is far better than A&S 7.1.26 (error up to 1.5e-7) in the tails', () => {
    // A low-accuracy erf would get the tail at 4.5 wrong by several percent.
    expect(Math.abs(normalSf(4.5) - 3.3976731247300535e-6)).toBeLessThan(1e-18);
  });
});

describe('gamma and incomplete beta', () => {
  it('lgamma and gamma at known points', () => {
    expect(rel(gamma(5), 24)).toBeLessThan(1e-13);
    expect(rel(gamma(0.5), Math.sqrt(Math.PI))).toBeLessThan(1e-13);
    // Weibull k = 2: Gamma(1.5) = 0.8862269255 (check-values.md: NIST §1.3.6.6.8 mean, restated).
    expect(rel(gamma(1.5), 0.8862269254527580)).toBeLessThan(1e-13);
    expect(rel(lgamma(100), jStat.gammaln(100))).toBeLessThan(1e-12);
  });
  it('regularised incomplete beta has the closed forms for integer shapes', () => {
    for (let x = 0.03; x < 1; x += 0.09) {
      expect(Math.abs(regIncBeta(x, 1, 5) - (1 - (1 - x) ** 5))).toBeLessThan(1e-14);
      expect(Math.abs(regIncBeta(x, 4, 1) - x ** 4)).toBeLessThan(1e-14);
      expect(Math.abs(regIncBeta(x, 2, 2) - (3 * x * x - 2 * x ** 3))).toBeLessThan(1e-14);
    }
  });
  it('regularised incomplete beta matches high-precision values', () => {
    // Computed with mpmath 1.3.0 betainc(regularized=True) at 30 digits.
    const cases: [number, number, number, number][] = [
      [1.4, 4.6, 0.36, 0.79166078840008459594],
      [4.2, 1.8, 0.64, 0.33795630720812653775],
      [2.2, 3.8, 0.9, 0.9991234648672215555],
      [1, 5, 0.15, 0.55629468749999998551],
    ];
    for (const [a, b, x, v] of cases) expect(rel(regIncBeta(x, a, b), v)).toBeLessThan(1e-13);
  });
  it('regularised incomplete beta agrees with jstat (to jstat\'s own accuracy, about 1e-8)', () => {
    for (const [a, b] of [
      [1, 5],
      [3, 3],
      [1.4, 4.6],
      [4.2, 1.8],
      [5, 1],
    ]) {
      for (let x = 0.01; x < 1; x += 0.07) {
        expect(Math.abs(regIncBeta(x, a, b) - jStat.ibeta(x, a, b))).toBeLessThan(1e-7);
      }
    }
    expect(regIncBeta(0, 2, 3)).toBe(0);
    expect(regIncBeta(1, 2, 3)).toBe(1);
  });
});
