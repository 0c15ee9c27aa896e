import { describe, expect, it } from 'vitest';
import stdExp from '@stdlib/math-base-special-exp';
import stdLn from '@stdlib/math-base-special-ln';
import { cosSin2Pi, exp, lastSin2Pi, ln } from '@/lib/core/engine/det-math';

// Random doubles over the whole bit range, from a fixed linear congruential sequence.
function* doubles(n: number): Generator<number> {
  const f = new Float64Array(1);
  const u = new Uint32Array(f.buffer);
  let s = 987654321;
  const next = () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0);
  for (let i = 0; i < n; i++) {
    u[0] = next();
    u[1] = next();
    yield f[0];
  }
}

describe('deterministic ln and exp (msun e_log.c / e_exp.c)', () => {
  it('ln equals @stdlib\'s port of the same code bit for bit', () => {
    let mismatches = 0;
    for (const x of doubles(400_000)) if (!Object.is(ln(x), stdLn(x))) mismatches++;
    for (let i = 1; i < 200_000; i++) if (!Object.is(ln(i / 20_000), stdLn(i / 20_000))) mismatches++;
    for (const x of [0, -0, 1, -1, Infinity, -Infinity, NaN, 5e-324, 2.2250738585072014e-308, 1 + 2 ** -52, 1 - 2 ** -53, 1e300]) {
      if (!Object.is(ln(x), stdLn(x))) mismatches++;
    }
    expect(mismatches).toBe(0);
  });

  it('exp equals @stdlib\'s port wherever the result is a normal number', () => {
    // Below about -708 the result is subnormal; the two ports round those differently and
    // the engine never needs them.
    let mismatches = 0;
    for (let i = 0; i < 400_000; i++) {
      const x = -708 + (i / 400_000) * 1417;
      if (!Object.is(exp(x), stdExp(x))) mismatches++;
    }
    for (const x of doubles(400_000)) if (x > -708 && !Object.is(exp(x), stdExp(x))) mismatches++;
    for (const x of [0, -0, 1e-300, -1e-300, 709.78, 710, Infinity, -Infinity, NaN]) if (!Object.is(exp(x), stdExp(x))) mismatches++;
    expect(mismatches).toBe(0);
  });

  it('agree with the engine\'s Math.log / Math.exp to within one unit in the last place', () => {
    for (let i = 1; i < 10_000; i++) {
      const x = i / 97;
      expect(Math.abs(ln(x) - Math.log(x))).toBeLessThanOrEqual(Math.abs(Math.log(x)) * 2.3e-16 + 1e-300);
      expect(Math.abs(exp(x / 10) - Math.exp(x / 10))).toBeLessThanOrEqual(Math.exp(x / 10) * 2.3e-16);
    }
  });
});

describe('cos and sin of 2 pi u (Box-Muller angles)', () => {
  it('are accurate to a few units in the last place and exact at the quarter turns', () => {
    let worst = 0;
    for (let i = 0; i < 100_000; i++) {
      const u = i / 100_000;
      const c = cosSin2Pi(u);
      const s = lastSin2Pi();
      worst = Math.max(worst, Math.abs(c - Math.cos(2 * Math.PI * u)), Math.abs(s - Math.sin(2 * Math.PI * u)));
    }
    expect(worst).toBeLessThan(1e-15);
    expect([cosSin2Pi(0), lastSin2Pi()]).toEqual([1, 0]);
    expect([cosSin2Pi(0.25), lastSin2Pi()]).toEqual([-0, 1]);
    expect([cosSin2Pi(0.5), lastSin2Pi()]).toEqual([-1, -0]);
  });
});
