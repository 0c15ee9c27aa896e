import { describe, expect, it } from 'vitest';
import xor4096 from 'seedrandom/lib/xor4096';
import { Stream, streamKey, uniformOpen, uniformOpenClosed } from '@/lib/core/engine/rng';
import { setWasmKernels, wasmKernels } from '@/lib/core/engine/wasm-kernels';

describe('seeded streams', () => {
  it('steps exactly the xor4096 sequence seedrandom itself yields', () => {
    for (const key of ['a', streamKey(42, 'flow'), streamKey('demo seed', 'x#occurs', 'lhs-permutation')]) {
      const ref = xor4096(key);
      const s = new Stream(key);
      for (let i = 0; i < 5000; i++) expect(s.nextInt32()).toBe(ref.int32());
    }
  });

  it('the wasm SIMD refill and the JavaScript refill give that sequence, even alternating between refills', () => {
    expect(wasmKernels()).not.toBeNull();
    const key = streamKey('alternate', 'x');
    const ref = xor4096(key);
    const s = new Stream(key);
    try {
      // 7 refills of 1024: JavaScript, kernel, kernel, JavaScript, ... so each starts from the other's state.
      for (let r = 0; r < 7; r++) {
        setWasmKernels(r % 3 !== 0);
        for (let i = 0; i < 1024; i++) expect(s.nextInt32()).toBe(ref.int32());
      }
    } finally {
      setWasmKernels(true);
    }
  });

  it('gives the same numbers for the same key and different numbers for another input id', () => {
    const a = Stream.forInput('s', 'alpha');
    const b = Stream.forInput('s', 'alpha');
    const c = Stream.forInput('s', 'beta');
    const xa = Array.from({ length: 64 }, () => a.uniform());
    const xb = Array.from({ length: 64 }, () => b.uniform());
    const xc = Array.from({ length: 64 }, () => c.uniform());
    expect(xa).toEqual(xb);
    expect(xa).not.toEqual(xc);
  });

  it('maps 32-bit integers into (0,1) and (0,1] without ever reaching 0', () => {
    expect(uniformOpen(0)).toBeGreaterThan(0);
    expect(uniformOpen(-1)).toBeLessThan(1);
    expect(uniformOpenClosed(0)).toBeGreaterThan(0);
    expect(uniformOpenClosed(-1)).toBe(1);
    expect(Math.log(uniformOpenClosed(0))).toBeCloseTo(-32 * Math.LN2, 12);
  });

  it('bulk fill equals one-by-one draws', () => {
    const a = Stream.forInput(7, 'q');
    const b = Stream.forInput(7, 'q');
    const out = new Float64Array(3000);
    a.fillUniform(out, 0, 1234);
    a.fillUniform(out, 1234, 1766);
    for (let i = 0; i < 3000; i++) expect(out[i]).toBe(b.uniform());
  });

  it('draws integers below n without bias (chi-square over 6 cells)', () => {
    const s = Stream.forInput(1, 'die');
    const counts = new Array(6).fill(0);
    const n = 60_000;
    for (let i = 0; i < n; i++) counts[s.nextBelow(6)]++;
    const e = n / 6;
    const chi2 = counts.reduce((acc, c) => acc + (c - e) ** 2 / e, 0);
    // Chi-square 5 d.f. upper 0.1 % point is 20.515 (Hines & Montgomery 1980, App. Table III; restated).
    expect(chi2).toBeLessThan(20.515);
  });
});
