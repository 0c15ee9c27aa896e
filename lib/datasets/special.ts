/**
 * Special functions the fits need beyond lib/engine/special: digamma, trigamma and the regularised
 * lower incomplete gamma function.
 */
import { lgamma, normalCdf } from '@/lib/engine/special';

/** Above this shape the series and continued fraction need too many terms; Wilson–Hilferty is accurate to O(1/a). */
const LARGE_SHAPE = 1e7;

/** ψ(x) for x > 0: recurrence up to x ≥ 10, then the asymptotic series (Abramowitz & Stegun 6.3.18). */
export function digamma(x: number): number {
  if (!(x > 0)) return NaN;
  let r = 0;
  while (x < 10) {
    r -= 1 / x;
    x += 1;
  }
  const f = 1 / (x * x);
  return r + Math.log(x) - 0.5 / x - f * (1 / 12 - f * (1 / 120 - f * (1 / 252 - f * (1 / 240 - f / 132))));
}

/**
 * ln x − ψ(x) without cancellation: for large x both terms are nearly equal and the difference, about 1/(2x),
 * would lose most of its digits (the gamma shape equation needs it for narrow data).
 */
export function logMinusDigamma(x: number): number {
  if (x < 10) return Math.log(x) - digamma(x);
  const f = 1 / (x * x);
  return 0.5 / x + f * (1 / 12 - f * (1 / 120 - f * (1 / 252 - f * (1 / 240 - f / 132))));
}

/** ψ'(x) for x > 0: recurrence up to x ≥ 10, then the asymptotic series (Abramowitz & Stegun 6.4.12). */
export function trigamma(x: number): number {
  if (!(x > 0)) return NaN;
  let r = 0;
  while (x < 10) {
    r += 1 / (x * x);
    x += 1;
  }
  const f = 1 / (x * x);
  return r + 1 / x + f / 2 + (f / x) * (1 / 6 - f * (1 / 30 - f * (1 / 42 - f * (1 / 30 - (5 * f) / 66))));
}

/**
 * P(a, x) = γ(a, x) / Γ(a): the series for x < a + 1, otherwise the continued fraction for Q by the modified
 * Lentz method (Press et al., Numerical Recipes, 3rd ed., §6.2).
 */
export function regLowerGamma(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x)) return NaN;
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  if (a > LARGE_SHAPE) {
    // Wilson & Hilferty (1931): (x/a)^(1/3) is nearly normal with mean 1 − 1/(9a) and variance 1/(9a).
    const v = 1 / (9 * a);
    return normalCdf((Math.cbrt(x / a) - (1 - v)) / Math.sqrt(v));
  }
  const lead = a * Math.log(x) - x - lgamma(a);
  if (x < a + 1) {
    let ap = a;
    let del = 1 / a;
    let sum = del;
    for (let n = 0; n < 60000; n++) {
      ap += 1;
      del *= x / ap;
      sum += del;
      if (Math.abs(del) < Math.abs(sum) * 1e-16) break;
    }
    return Math.min(1, sum * Math.exp(lead));
  }
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 60000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) break;
  }
  return Math.max(0, 1 - Math.exp(lead) * h);
}
