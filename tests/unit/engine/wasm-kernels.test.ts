import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { CopulaGroupSampler } from '@/lib/core/engine/correlation';
import { createMarginal, type DistributionSpec } from '@/lib/core/engine/distributions';
import { Stream } from '@/lib/core/engine/rng';
import type { SamplerContext } from '@/lib/core/engine/samplers';
import { twoPassMoments } from '@/lib/core/engine/stats';
import { setWasmKernels, wasmKernels } from '@/lib/core/engine/wasm-kernels';
import { buildKernels, KERNELS_TS } from '@/lib/dev/build-wasm';

afterEach(() => setWasmKernels(true));

/** Same bits (Object.is per element would also tell -0 from +0; comparing the bytes does that and NaN payloads too). */
function sameBits(a: Float64Array, b: Float64Array): boolean {
  return a.length === b.length && Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
}

describe('WebAssembly kernels', () => {
  it('the committed bytes are kernels.wat compiled (run `npm run build:wasm` after editing it)', async () => {
    expect(readFileSync(KERNELS_TS, 'utf8')).toBe(await buildKernels());
  });

  it('instantiate in Node (SIMD available), so the tests below compare two different paths', () => {
    const k = wasmKernels();
    expect(k).not.toBeNull();
    setWasmKernels(false);
    expect(wasmKernels()).toBeNull();
  });
});

describe('Gaussian copula product: wasm kernel = JavaScript loop, bit for bit', () => {
  const specs: DistributionSpec[] = [
    { type: 'normal', mean: 10, sd: 2 },
    { type: 'lognormal', mu: 0.5, sigma: 0.3 },
    { type: 'triangular', min: 0, mode: 3, max: 10 },
    { type: 'normal', mean: -4, sd: 0.1 },
    { type: 'uniform', min: -1, max: 1 },
    { type: 'lognormal', mu: -1, sigma: 1.2 },
  ];

  /** A random root (arbitrary coefficients, some exactly zero so rows have gaps) from a seeded stream. */
  function randomRoot(k: number, st: Stream): number[][] {
    return Array.from({ length: k }, (_, i) =>
      Array.from({ length: k }, (__, j) => {
        if (i !== j && st.uniform() < 0.2) return 0;
        return (st.uniform() - 0.5) * (j === i ? 3 : 1.5) * 10 ** Math.floor(st.uniform() * 4 - 2);
      }),
    );
  }

  function run(k: number, root: number[][], ctx: SamplerContext, cuts: number[], wasm: boolean, skip: number): Float64Array[] {
    setWasmKernels(wasm);
    const marginals = Array.from({ length: k }, (_, i) => createMarginal(specs[i % specs.length]));
    const ids = Array.from({ length: k }, (_, i) => `m${i}`);
    const s = new CopulaGroupSampler(marginals, root, ctx, ids, root);
    const total = cuts[cuts.length - 1];
    // One member's column skipped: its scores are still drawn.
    const cols = ids.map((_, i) => (i === skip ? null : new Float64Array(total)));
    let from = 0;
    for (const to of cuts) {
      s.fill(cols, from, to - from);
      from = to;
    }
    return cols.filter((c) => c !== null);
  }

  // Group sizes around the kernel's steps of four coefficients; counts around its eight trials per pass and the 1024-trial blocks.
  const cases: [number, number[]][] = [
    [1, [1, 9]],
    [2, [7]],
    [3, [1023, 1025, 2049]],
    [4, [8, 1000]],
    [5, [3000]],
    [6, [513, 1536]],
    [7, [2500]],
    [9, [17, 1031]],
    [10, [1024, 4096]],
    [13, [777]],
  ];
  for (const normalMethod of ['ziggurat', 'box-muller'] as const) {
    for (const [k, cuts] of cases) {
      it(`${k} member${k > 1 ? 's' : ''}, ${normalMethod}, fills ending at ${cuts.join(', ')}`, () => {
        const st = Stream.forInput('wasm-kernel-test', `root-${k}`);
        const root = randomRoot(k, st);
        const ctx: SamplerContext = { seed: `kernel-${k}`, design: 'monte-carlo', normalMethod, trials: cuts[cuts.length - 1], chunk: 3 };
        const skip = k > 2 ? k - 2 : -1;
        const viaWasm = run(k, root, ctx, cuts, true, skip);
        const viaJs = run(k, root, ctx, cuts, false, skip);
        expect(viaWasm.length).toBe(viaJs.length);
        viaWasm.forEach((col, i) => expect(sameBits(col, viaJs[i]), `member column ${i}`).toBe(true));
        // Not a vacuous comparison: the columns hold draws.
        expect(viaWasm[0].some((x) => x !== 0)).toBe(true);
      });
    }
  }

  it('the same under Latin hypercube scores (inverse-CDF normal scores)', () => {
    const k = 5;
    const root = randomRoot(k, Stream.forInput('wasm-kernel-test', 'lhs'));
    const ctx: SamplerContext = { seed: 'kernel-lhs', design: 'latin-hypercube', normalMethod: 'ziggurat', trials: 2000, chunk: 0 };
    const a = run(k, root, ctx, [2000], true, -1);
    const b = run(k, root, ctx, [2000], false, -1);
    a.forEach((col, i) => expect(sameBits(col, b[i])).toBe(true));
  });
});

describe('two-pass moments: wasm kernels (sum, deviations) = JavaScript, bit for bit', () => {
  const st = Stream.forInput('wasm-kernel-test', 'moments');
  // Lengths around the kernels' eight values per pass, the chunk size and the largest column they take.
  for (const n of [64, 65, 71, 1001, 16_384, 16_389, 65_536]) {
    it(`${n} values, six data sets`, () => {
      for (let set = 0; set < 6; set++) {
        const offset = set * 10 ** Math.floor(st.uniform() * 8);
        const x = Float64Array.from({ length: n }, (_, i) => offset + (st.uniform() - 0.5) * (i % 3 === 0 ? 1e-3 : 10) * 10 ** set);
        setWasmKernels(true);
        const viaWasm = twoPassMoments(x);
        setWasmKernels(false);
        const viaJs = twoPassMoments(x);
        expect(Object.is(viaWasm.mean, viaJs.mean) && Object.is(viaWasm.m2, viaJs.m2), `${JSON.stringify(viaWasm)} vs ${JSON.stringify(viaJs)}`).toBe(true);
        expect(viaWasm.n).toBe(n);
      }
      const x = Float64Array.from({ length: n }, () => 1e6 + st.uniform());
      const viaJs = twoPassMoments(x);
      // And the mean is right: against a compensated (Neumaier) sum.
      let s = 0;
      let comp = 0;
      for (const v of x) {
        const t = s + v;
        comp += Math.abs(s) >= Math.abs(v) ? s - t + v : v - t + s;
        s = t;
      }
      const mean = (s + comp) / n;
      expect(Math.abs(viaJs.mean - mean) / mean).toBeLessThan(1e-14);
    });
  }
});
