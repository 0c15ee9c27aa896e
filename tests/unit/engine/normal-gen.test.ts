import { describe, expect, it } from 'vitest';
import { jStat } from 'jstat';
import { boxMuller, BoxMullerGenerator, ZIGGURAT, ZigguratGenerator } from '@/lib/core/engine/normal-gen';
import { Stream, uniformOpen, uniformOpenClosed } from '@/lib/core/engine/rng';
import { normalSf } from '@/lib/core/engine/special';
import { ksCritical001, ksStatistic, mean, variance } from '@/tests/support/engine-helpers';

describe('Box-Muller (Box & Muller 1958)', () => {
  it('stays finite at the extreme uniforms the stream can give (u1 in (0, 1])', () => {
    // Smallest u1: integer 0 maps to 2^-32, never to 0.
    const [a, b] = boxMuller(uniformOpenClosed(0), uniformOpen(0));
    expect(Number.isFinite(a) && Number.isFinite(b)).toBe(true);
    expect(Math.hypot(a, b)).toBeCloseTo(Math.sqrt(64 * Math.LN2), 12);
    // Largest u1 = 1: radius 0, both variates 0.
    expect(boxMuller(uniformOpenClosed(-1), uniformOpen(-1)).map(Math.abs)).toEqual([0, 0]);
    // The pitfall this guards against: u1 = 0 would give an infinite radius.
    expect(Number.isFinite(boxMuller(0, 0.3)[0])).toBe(false);
  });

  it('uses both variates of each pair, in order', () => {
    const gen = new BoxMullerGenerator(Stream.forInput('bm', 'x'));
    const out = new Float64Array(6);
    gen.fill(out, 0, 6);
    const s = Stream.forInput('bm', 'x');
    for (let k = 0; k < 6; k += 2) {
      const [z0, z1] = boxMuller(s.uniformOpenClosed(), s.uniform());
      expect(out[k]).toBe(z0);
      expect(out[k + 1]).toBe(z1);
    }
  });

  it('keeps an odd spare only within its own run: a new generator starts the sequence afresh', () => {
    const a = new BoxMullerGenerator(Stream.forInput('bm', 'odd'));
    const first = new Float64Array(3);
    a.fill(first, 0, 3); // leaves a spare inside a
    const b = new BoxMullerGenerator(Stream.forInput('bm', 'odd'));
    const again = new Float64Array(3);
    b.fill(again, 0, 3);
    expect(Array.from(again)).toEqual(Array.from(first));
    // And the spare continues a's own sequence: odd chunks equal one even chunk.
    const rest = new Float64Array(3);
    a.fill(rest, 0, 3);
    const whole = new Float64Array(6);
    new BoxMullerGenerator(Stream.forInput('bm', 'odd')).fill(whole, 0, 6);
    expect([...first, ...rest]).toEqual(Array.from(whole));
  });

  it('passes KS against Phi (n = 200,000, alpha = 0.001)', () => {
    const n = 200_000;
    const out = new Float64Array(n);
    new BoxMullerGenerator(Stream.forInput('bm', 'ks')).fill(out, 0, n);
    expect(ksStatistic(out, (x) => jStat.normal.cdf(x, 0, 1))).toBeLessThan(ksCritical001(n));
  });
});

describe('ziggurat (Marsaglia & Tsang 2000)', () => {
  it('builds 256 layers of equal area that close at the top', () => {
    const { x, v, r, layers } = ZIGGURAT;
    expect(x[1]).toBe(r);
    expect(x[layers]).toBe(0);
    // The last layer's area matches v: x[N-1] (1 - f(x[N-1])) = v to 1e-9.
    const top = x[layers - 1] * (1 - Math.exp(-0.5 * x[layers - 1] ** 2));
    expect(Math.abs(top - v) / v).toBeLessThan(1e-8);
  });

  it('passes KS against Phi and has the right tail fractions (n = 1,000,000)', () => {
    const n = 1_000_000;
    const out = new Float64Array(n);
    const gen = new ZigguratGenerator(Stream.forInput('zig', 'ks'));
    gen.fill(out, 0, 400_000);
    gen.fill(out, 400_000, n - 400_000);
    expect(ksStatistic(out.subarray(0, 200_000), (x) => jStat.normal.cdf(x, 0, 1))).toBeLessThan(ksCritical001(200_000));
    expect(Math.abs(mean(out))).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(variance(out) - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    // Tails, including beyond the base strip r (the tail algorithm), within 5 binomial SEs.
    for (const t of [2, 3, ZIGGURAT.r, 4]) {
      let c = 0;
      for (let i = 0; i < n; i++) if (Math.abs(out[i]) > t) c++;
      const p = 2 * normalSf(t);
      expect(Math.abs(c / n - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
    }
  });
});
