/**
 * The gamma law (shape k, scale θ): regularised incomplete gamma functions and their
 * inverse, so gamma inputs are sampled by the inverse CDF like every other law (which keeps
 * Latin hypercube and the Gaussian copula working).
 *
 * - P(a, x) and Q(a, x) = 1 − P: the series for x < a + 1, otherwise the continued
 *   fraction for Q by the modified Lentz method (Press, Teukolsky, Vetterling & Flannery,
 *   Numerical Recipes, 3rd ed., 2007, §6.2). Each is computed directly on its own side,
 *   never as 1 − the other, so both tails keep their digits.
 * - Inverse: the starting guess and Halley's iteration of Numerical Recipes §6.2.1
 *   ("invgammp"), iterating on P or on Q, whichever is smaller.
 * - Very large shapes (a > LARGE_SHAPE, a nearly normal law): the cube-root normal
 *   approximation of Wilson & Hilferty (1931), Proc. Natl. Acad. Sci. 17(12):684–688, used
 *   both ways; the series would need thousands of terms per draw there.
 *
 * Elementary functions come from det-math so a browser and a server give the same bits.
 */
import * as detMath from './det-math';
import { lgamma, normalCdfPair, normalCdfPairUpper, normalQuantilePQ } from './special';

const { exp, ln } = detMath;

/** Above this shape the Wilson–Hilferty approximation is used (its CDF error is then below about 1e-7). */
export const LARGE_SHAPE = 2e4;

const EPS = 1e-15;
const MAX_TERMS = 20_000;

/** [P(a, x), Q(a, x)] for a > 0, x ≥ 0. */
export function regGammaPQ(a: number, x: number): [number, number] {
  if (!(x > 0)) return [0, 1];
  if (x === Infinity) return [1, 0];
  if (a > LARGE_SHAPE) {
    const v = 1 / (9 * a);
    const z = (Math.cbrt(x / a) - (1 - v)) / Math.sqrt(v);
    const p = normalCdfPair(z);
    return [p, normalCdfPairUpper()];
  }
  const lead = a * ln(x) - x - lgamma(a);
  if (x < a + 1) {
    let ap = a;
    let del = 1 / a;
    let sum = del;
    for (let n = 0; n < MAX_TERMS; n++) {
      ap += 1;
      del *= x / ap;
      sum += del;
      if (Math.abs(del) < Math.abs(sum) * EPS) break;
    }
    const p = Math.min(1, sum * exp(lead));
    return [p, 1 - p];
  }
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_TERMS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  const q = Math.min(1, exp(lead) * h);
  return [1 - q, q];
}

/** Density of the standard gamma (scale 1) at x. */
function standardDensity(a: number, x: number, lgA: number): number {
  if (!(x > 0)) return 0;
  return exp((a - 1) * ln(x) - x - lgA);
}

/**
 * x with P(a, x) = p (complement q = 1 − p), for the standard gamma (scale 1). Halley's
 * method on the smaller of the two tails, safeguarded to stay positive.
 */
export function standardGammaInverse(a: number, p: number, q: number): number {
  if (!(p > 0)) return 0;
  if (!(q > 0)) return Infinity;
  if (a > LARGE_SHAPE) {
    const v = 1 / (9 * a);
    const z = normalQuantilePQ(p, q);
    const t = 1 - v + z * Math.sqrt(v);
    return t > 0 ? a * t * t * t : 0;
  }
  const lgA = lgamma(a);
  const a1 = a - 1;
  let x: number;
  // Starting guess (Numerical Recipes §6.2.1).
  if (a > 1) {
    const pp = p < 0.5 ? p : q;
    const t = Math.sqrt(-2 * ln(pp));
    let z = (2.30753 + t * 0.27061) / (1 + t * (0.99229 + t * 0.04481)) - t;
    if (p < 0.5) z = -z;
    x = Math.max(1e-3, a * (1 - 1 / (9 * a) - z / (3 * Math.sqrt(a))) ** 3);
  } else {
    const t = 1 - a * (0.253 + a * 0.12);
    x = p < t ? exp(ln(p / t) / a) : 1 - ln(1 - (p - t) / (1 - t));
  }
  const useUpper = q < p;
  const afac = a > 1 ? exp(a1 * (ln(a1) - 1) - lgA) : 0;
  const lna1 = a > 1 ? ln(a1) : 0;
  for (let j = 0; j < 100; j++) {
    if (!(x > 0)) return 0;
    const [P, Q] = regGammaPQ(a, x);
    // err = F(x) − target on the side we iterate; the density is dF/dx (and −dQ/dx).
    const err = useUpper ? q - Q : P - p;
    const dens = a > 1 ? afac * exp(-(x - a1) + a1 * (ln(x) - lna1)) : standardDensity(a, x, lgA);
    if (dens === 0) break;
    const t = err / dens;
    const u = t * (a1 / x - 1);
    const step = t / (1 - 0.5 * Math.min(1, Math.max(-1, u)));
    let next = x - step;
    if (!(next > 0)) next = 0.5 * x;
    const done = Math.abs(next - x) < 1e-13 * next || Math.abs(err) < 1e-300;
    x = next;
    if (done) break;
  }
  return x;
}

/** Mean kθ and variance kθ² (Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 1, ch. 17). */
export function gammaMoments(shape: number, scale: number): { mean: number; variance: number } {
  return { mean: shape * scale, variance: shape * scale * scale };
}
