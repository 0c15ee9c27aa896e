/**
 * Seeded uniform streams.
 *
 * Algorithm: Brent's xorgens "xor4096" as shipped by seedrandom 3.0.5. Chosen by
 * measurement on the target machines (Node 20, 2 cores): xor4096 int32 about 210 M/s,
 * tychei about 118 M/s, alea about 91 M/s, arc4 (seedrandom's default) about 15 M/s.
 * It is also the one with a 4096-bit state, so the many sub-streams of a run (one per
 * input) cannot realistically overlap.
 *
 * seedrandom seeds the generator (its string mixing and warm-up); the engine then steps
 * the same recurrence itself over typed arrays, because one closure call per draw is
 * the dominant cost of a run. tests/unit/engine/rng.test.ts checks that the sequence is
 * bit-for-bit the one seedrandom's own prng.int32() yields.
 */
import xor4096 from 'seedrandom/lib/xor4096';
import * as wasm from './wasm-kernels';
import type { Kernels } from './wasm-kernels';

// Bound once: module interop in some runtimes turns each imported name into a getter call.
const { heldDraws, LAYOUT, wasmKernels } = wasm;

export const RNG_NAME = 'xor4096 (seedrandom 3.0.5), one sub-stream per input and chunk';

const TWO_M32 = 2.3283064365386963e-10; // 2^-32

/** Uniform in the open interval (0, 1) from a 32-bit integer: (k + 1/2) / 2^32. */
export function uniformOpen(int32: number): number {
  return ((int32 >>> 0) + 0.5) * TWO_M32;
}

/** Uniform in (0, 1] from a 32-bit integer: (k + 1) / 2^32. Never 0, so ln(u) is finite. */
export function uniformOpenClosed(int32: number): number {
  return ((int32 >>> 0) + 1) * TWO_M32;
}

/**
 * Sub-stream key: run seed, the input's stable id, a purpose tag and, inside a run, the
 * chunk index (a run is cut into fixed-size chunks; see chunks.ts), so any thread can
 * produce chunk k of any input without drawing the chunks before it.
 */
export function streamKey(seed: string | number, id: string, purpose = '', chunk?: number): string {
  const base = `stochos/1|${String(seed)}|${id}|${purpose}`;
  return chunk === undefined ? base : `${base}|chunk ${chunk}`;
}

/**
 * Fill out with the next xor4096 outputs (seedrandom's next(), step for step). A plain
 * function over locals: as a method the same loop ran at half the speed.
 */
function xorgenFill(X: Int32Array, out: Int32Array, st: { i: number; w: number }): void {
  let i = st.i;
  let w = st.w;
  const n = out.length;
  for (let k = 0; k < n; k++) {
    w = (w + 0x61c88647) | 0;
    const i1 = (i + 1) & 127;
    let v = X[(i + 34) & 127] | 0;
    let t = X[i1] | 0;
    v ^= v << 13;
    t ^= t << 17;
    v ^= v >>> 15;
    t ^= t >>> 12;
    v ^= t;
    X[i1] = v;
    out[k] = (v + (w ^ (w >>> 16))) | 0;
    i = i1;
  }
  st.i = i;
  st.w = w;
}

const WEYL = 0x61c88647;

/** Views of the kernels' xor4096 regions, remade when the memory grows (a new buffer). */
let rngViews: { buffer: ArrayBuffer; state: Int32Array; out: Int32Array } | null = null;

/**
 * The same refill by the wasm SIMD kernel (kernels.wat, xorgen): the ring is laid out in
 * time order, stepped, and taken back in time order, which is the ring with position 127.
 */
function xorgenKernel(k: Kernels, X: Int32Array, buf: Int32Array, st: { i: number; w: number }): void {
  const mem = k.memory.buffer;
  if (!rngViews || rngViews.buffer !== mem) {
    rngViews = { buffer: mem, state: new Int32Array(mem, LAYOUT.rngState, 128 + buf.length), out: new Int32Array(mem, LAYOUT.rngOut, buf.length) };
  }
  const { state, out } = rngViews;
  const i = st.i;
  state.set(X.subarray(i + 1), 0);
  state.set(X.subarray(0, i + 1), 127 - i);
  k.xorgen(LAYOUT.rngState, LAYOUT.rngOut, buf.length, st.w);
  X.set(state.subarray(buf.length, buf.length + 128));
  st.i = 127;
  st.w = (st.w + Math.imul(buf.length, WEYL)) | 0;
  buf.set(out);
}

export class Stream {
  private readonly X: Int32Array;
  /** Generator position and Weyl state (read and written by xorgenFill). */
  i: number;
  w: number;
  /**
   * Buffered integers. Read directly only by inner loops that keep the order of the draws
   * (the ziggurat): read buf[pos], advance pos, call refill() when pos reaches buf.length.
   */
  readonly buf: Int32Array;
  pos: number;
  /** Number of refills so far (tells the ziggurat kernel whether the kernels' copy of buf is current). */
  stamp = 0;

  constructor(key: string) {
    const st = xor4096(key, { state: true }).state();
    this.X = Int32Array.from(st.X);
    this.i = st.i;
    this.w = st.w;
    this.buf = new Int32Array(1024);
    this.pos = this.buf.length;
  }

  static forInput(seed: string | number, id: string, purpose = '', chunk?: number): Stream {
    return new Stream(streamKey(seed, id, purpose, chunk));
  }

  /** Refill the buffer: the xor4096 recurrence, exactly as seedrandom's next() (in the wasm kernel when there is one). */
  refill(): void {
    const k = wasmKernels();
    this.stamp++;
    if (k) {
      xorgenKernel(k, this.X, this.buf, this);
      // The kernels' output region now holds this buffer.
      heldDraws.owner = this;
      heldDraws.stamp = this.stamp;
    } else xorgenFill(this.X, this.buf, this);
    this.pos = 0;
  }

  /** Next signed 32-bit integer (identical to seedrandom's xor4096 prng.int32()). */
  nextInt32(): number {
    if (this.pos === this.buf.length) this.refill();
    return this.buf[this.pos++];
  }

  /** Uniform in (0, 1). */
  uniform(): number {
    if (this.pos === this.buf.length) this.refill();
    return ((this.buf[this.pos++] >>> 0) + 0.5) * TWO_M32;
  }

  /** Uniform in (0, 1]. */
  uniformOpenClosed(): number {
    if (this.pos === this.buf.length) this.refill();
    return ((this.buf[this.pos++] >>> 0) + 1) * TWO_M32;
  }

  /** Fill out[start .. start+count) with uniforms in (0, 1). */
  fillUniform(out: Float64Array, start: number, count: number): void {
    const end = start + count;
    let k = start;
    while (k < end) {
      if (this.pos === this.buf.length) this.refill();
      const buf = this.buf;
      const take = Math.min(end - k, buf.length - this.pos);
      let p = this.pos;
      for (let j = 0; j < take; j++) out[k + j] = ((buf[p++] >>> 0) + 0.5) * TWO_M32;
      this.pos = p;
      k += take;
    }
  }

  /** Integer in [0, n) without modulo bias (rejection of the short top range). */
  nextBelow(n: number): number {
    if (n <= 1) return 0;
    const limit = 4294967296 - (4294967296 % n);
    for (;;) {
      const x = this.nextInt32() >>> 0;
      if (x < limit) return x % n;
    }
  }

}
