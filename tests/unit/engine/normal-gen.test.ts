import { describe, expect, it } from 'vitest';
import { jStat } from 'jstat';
import { boxMuller, BoxMullerGenerator, ZIGGURAT, ZigguratGenerator } from '@/lib/core/engine/normal-gen';
import xor4096 from 'seedrandom/lib/xor4096';
import { exp, ln } from '@/lib/core/engine/det-math';
import { Stream, streamKey, uniformOpen, uniformOpenClosed } from '@/lib/core/engine/rng';
import { normalSf } from '@/lib/core/engine/special';
import { setWasmKernels } from '@/lib/core/engine/wasm-kernels';
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

/**
 * The ziggurat drawn one variate at a time, straight from seedrandom's own xor4096 int32(),
 * as written before any speed-up: the engine's buffered (and WebAssembly) paths must give
 * this exact sequence. Counts the draws that took the wedge and the tail.
 */
function referenceZiggurat(key: string, n: number): { values: Float64Array; wedge: number; tail: number } {
  const prng = xor4096(key);
  const { x: X, r: R } = ZIGGURAT;
  const scale = 8388608;
  const f = (t: number) => exp(-0.5 * t * t);
  let wedge = 0;
  let tail = 0;
  const layer = (u: number) => {
    const i = u & 255;
    const j = u >>> 9;
    const xv = j * (X[i] / scale);
    return { i, x: u & 256 ? -xv : xv, fast: j < Math.floor((X[i + 1] / X[i]) * scale) };
  };
  const draw = () => {
    let { i, x, fast } = layer(prng.int32());
    if (fast) return x;
    for (;;) {
      if (i === 0) {
        tail++;
        let xt: number;
        let yt: number;
        do {
          xt = -ln(uniformOpenClosed(prng.int32())) / R;
          yt = -ln(uniformOpenClosed(prng.int32()));
        } while (yt + yt < xt * xt);
        return x < 0 ? -(R + xt) : R + xt;
      }
      wedge++;
      const ax = Math.abs(x);
      const y = f(X[i]) + uniformOpen(prng.int32()) * (f(X[i + 1]) - f(X[i]));
      if (y < exp(-0.5 * ax * ax)) return x;
      ({ i, x, fast } = layer(prng.int32()));
      if (fast) return x;
    }
  };
  const values = new Float64Array(n);
  for (let k = 0; k < n; k++) values[k] = draw();
  return { values, wedge, tail };
}

describe('ziggurat (Marsaglia & Tsang 2000)', () => {
  it.each([
    ['the wasm kernel', [true]],
    ['JavaScript', [false]],
    ['both, alternating between fills', [true, false, false, true]],
  ] as const)('draws exactly the sequence of the one-at-a-time ziggurat over seedrandom xor4096 (%s), in any fill sizes', (_, kernels) => {
    const n = 300_000;
    const ref = referenceZiggurat(streamKey('zig', 'pin'), n);
    // Both slow paths are exercised (about 1 % of draws leave the fast path).
    expect(ref.wedge).toBeGreaterThan(100);
    expect(ref.tail).toBeGreaterThan(10);
    const out = new Float64Array(n);
    const gen = new ZigguratGenerator(Stream.forInput('zig', 'pin'));
    let k = 0;
    try {
      [1, 7, 1023, 1024, 1025, 4096, 100_000, n].forEach((size, i) => {
        setWasmKernels(kernels[i % kernels.length]);
        const c = Math.min(size, n - k);
        gen.fill(out, k, c);
        k += c;
      });
    } finally {
      setWasmKernels(true);
    }
    expect(k).toBe(n);
    let same = 0;
    for (let i = 0; i < n; i++) if (Object.is(out[i], ref.values[i])) same++;
    expect(same).toBe(n);
  });

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
