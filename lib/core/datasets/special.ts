/**
 * Special functions the fits need beyond lib/core/engine/special: digamma, trigamma and the regularised
 * lower incomplete gamma function.
 */
import { regGammaPQ } from '@/lib/core/engine/gamma';

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

/** P(a, x) = γ(a, x) / Γ(a), from the engine's gamma law (series and continued fraction, Numerical Recipes §6.2). */
export function regLowerGamma(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x)) return NaN;
  return regGammaPQ(a, x)[0];
}
