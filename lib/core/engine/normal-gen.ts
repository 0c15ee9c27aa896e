/**
 * Standard normal generators over a seeded Stream.
 *
 * Box-Muller (Box & Muller 1958, Ann. Math. Statist. 29(2):610-611): u1 in (0, 1], so
 * ln(u1) is finite; both variates of each pair are used; the spare of an odd count is
 * kept only inside this generator object, which belongs to one run (a new run builds new
 * generators, so nothing survives a reseed).
 *
 * Ziggurat (Marsaglia & Tsang 2000, J. Stat. Softw. 5(8)) with 256 layers. One 32-bit
 * draw gives the layer (low 8 bits), the sign (bit 8) and the position (top 23 bits), so
 * the layer index and the position use disjoint bits (the weakness of the original
 * RNOR noted by Doornik 2005). The tail uses Marsaglia's (1964) method.
 */
import { Stream, uniformOpenClosed } from './rng';
import { normalSf } from './special';
import * as detMath from './det-math';
import * as wasm from './wasm-kernels';
import type { Kernels } from './wasm-kernels';

// Bound once: module interop in some runtimes turns each imported call into a getter call.
const { cosSin2Pi, exp, lastSin2Pi, ln } = detMath;
const { heldDraws, LAYOUT, wasmKernels } = wasm;

export type NormalMethod = 'box-muller' | 'ziggurat';

export interface NormalGenerator {
  readonly method: NormalMethod;
  /** Fill out[start .. start+count) with standard normal variates. */
  fill(out: Float64Array, start: number, count: number): void;
}

/** The Box-Muller transform of one pair: r cos(2 pi u2), r sin(2 pi u2), r = sqrt(-2 ln u1); u1 in (0, 1]. */
export function boxMuller(u1: number, u2: number): [number, number] {
  const r = Math.sqrt(-2 * ln(u1));
  const c = cosSin2Pi(u2);
  return [r * c, r * lastSin2Pi()];
}

export class BoxMullerGenerator implements NormalGenerator {
  readonly method = 'box-muller' as const;
  private spare = 0;
  private hasSpare = false;
  constructor(private readonly stream: Stream) {}

  fill(out: Float64Array, start: number, count: number): void {
    let k = start;
    const end = start + count;
    if (k < end && this.hasSpare) {
      out[k++] = this.spare;
      this.hasSpare = false;
    }
    const s = this.stream;
    while (k + 1 < end) {
      const u1 = s.uniformOpenClosed();
      const u2 = s.uniform();
      const r = Math.sqrt(-2 * ln(u1));
      out[k++] = r * cosSin2Pi(u2);
      out[k++] = r * lastSin2Pi();
    }
    if (k < end) {
      const u1 = s.uniformOpenClosed();
      const u2 = s.uniform();
      const r = Math.sqrt(-2 * ln(u1));
      out[k++] = r * cosSin2Pi(u2);
      this.spare = r * lastSin2Pi();
      this.hasSpare = true;
    }
  }
}

// ---- Ziggurat tables (computed once; pure arithmetic, identical on every engine) ----
const ZN = 256;
const ZR = 3.6541528853610088; // rightmost layer edge for 256 layers (Marsaglia & Tsang 2000)
const f = (x: number) => exp(-0.5 * x * x);
/** Area of each layer under exp(-x^2/2): the base strip r f(r) plus the tail beyond r. */
const ZV = ZR * f(ZR) + Math.sqrt(Math.PI / 2) * 2 * normalSf(ZR);
const ZX = new Float64Array(ZN + 1);
const ZF = new Float64Array(ZN + 1);
const ZW = new Float64Array(ZN); // x[i] / 2^23
const ZK = new Uint32Array(ZN); // acceptance threshold on the 23-bit position
(() => {
  ZX[0] = ZV / f(ZR);
  ZX[1] = ZR;
  for (let i = 1; i < ZN - 1; i++) ZX[i + 1] = Math.sqrt(-2 * ln(ZV / ZX[i] + f(ZX[i])));
  ZX[ZN] = 0;
  for (let i = 0; i <= ZN; i++) ZF[i] = f(ZX[i]);
  const scale = 8388608; // 2^23
  for (let i = 0; i < ZN; i++) {
    ZW[i] = ZX[i] / scale;
    ZK[i] = Math.floor((ZX[i + 1] / ZX[i]) * scale);
  }
})();

/** Views of the kernels' ziggurat regions (tables copied in once per memory), remade when the memory grows. */
let zigRegions: { buffer: ArrayBuffer; ints: Int32Array; out: Float64Array } | null = null;
let zigTablesIn: WebAssembly.Memory | null = null;
function zigViews(k: Kernels): { buffer: ArrayBuffer; ints: Int32Array; out: Float64Array } {
  const mem = k.memory.buffer;
  if (zigTablesIn !== k.memory) {
    new Float64Array(mem, LAYOUT.zigW, ZN).set(ZW);
    new Uint32Array(mem, LAYOUT.zigK, ZN).set(ZK);
    zigTablesIn = k.memory;
  }
  if (!zigRegions || zigRegions.buffer !== mem) zigRegions = { buffer: mem, ints: new Int32Array(mem, LAYOUT.rngOut, 1024), out: new Float64Array(mem, LAYOUT.zigOut, 1024) };
  return zigRegions;
}

/** Ziggurat layer edges, exported for tests. */
export const ZIGGURAT = { layers: ZN, r: ZR, v: ZV, x: ZX };

export class ZigguratGenerator implements NormalGenerator {
  readonly method = 'ziggurat' as const;
  constructor(private readonly stream: Stream) {}

  private slow(i: number, x: number): number {
    const s = this.stream;
    for (;;) {
      if (i === 0) {
        // Tail beyond r (Marsaglia 1964).
        let xt: number;
        let yt: number;
        do {
          xt = -ln(uniformOpenClosed(s.nextInt32())) / ZR;
          yt = -ln(uniformOpenClosed(s.nextInt32()));
        } while (yt + yt < xt * xt);
        return x < 0 ? -(ZR + xt) : ZR + xt;
      }
      // Wedge between layers i and i + 1.
      const ax = Math.abs(x);
      const y = ZF[i] + s.uniform() * (ZF[i + 1] - ZF[i]);
      if (y < exp(-0.5 * ax * ax)) return x;
      const u = s.nextInt32();
      i = u & 255;
      const j = u >>> 9;
      const xv = j * ZW[i];
      x = u & 256 ? -xv : xv;
      if (j < ZK[i]) return x;
    }
  }

  fill(out: Float64Array, start: number, count: number): void {
    const kern = wasmKernels();
    if (kern) this.fillWasm(kern, out, start, count);
    else this.fillJs(out, start, count);
  }

  /**
   * The fast path in the wasm kernel (zigguratFast), straight into `out` when it lives in the
   * kernels' memory (the copula's score blocks); each draw it does not accept goes through
   * slow() here, which reads the following draws from the stream as fillJs does.
   */
  private fillWasm(kern: Kernels, out: Float64Array, start: number, count: number): void {
    const v = zigViews(kern);
    const s = this.stream;
    const inPlace = out.buffer === v.buffer;
    const end = start + count;
    let k = start;
    while (k < end) {
      if (s.pos === s.buf.length) s.refill();
      if (heldDraws.owner !== s || heldDraws.stamp !== s.stamp) {
        v.ints.set(s.buf);
        heldDraws.owner = s;
        heldDraws.stamp = s.stamp;
      }
      const pos = s.pos;
      const take = Math.min(end - k, s.buf.length - pos);
      const m = kern.zigguratFast(LAYOUT.rngOut + 4 * pos, take, inPlace ? out.byteOffset + 8 * k : LAYOUT.zigOut, LAYOUT.zigW, LAYOUT.zigK);
      if (!inPlace) {
        const z = v.out;
        for (let t = 0; t < m; t++) out[k + t] = z[t];
      }
      k += m;
      s.pos = pos + m;
      if (m < take) {
        const u = s.buf[s.pos++];
        const i = u & 255;
        out[k++] = this.slow(i, (u >>> 9) * ZW[i] * (1 - ((u >>> 7) & 2)));
      }
    }
  }

  private fillJs(out: Float64Array, start: number, count: number): void {
    const s = this.stream;
    const end = start + count;
    let k = start;
    while (k < end) {
      if (s.pos === s.buf.length) s.refill();
      const buf = s.buf;
      let pos = s.pos;
      // A run over the buffered integers without per-draw bounds checks on the buffer.
      const stop = Math.min(end, k + (buf.length - pos));
      for (; k < stop; k++) {
        const u = buf[pos++];
        const i = u & 255;
        const j = u >>> 9;
        // Times +1 or -1 from bit 8: exactly u & 256 ? -xv : xv, without a branch that fails half the time.
        const x = j * ZW[i] * (1 - ((u >>> 7) & 2));
        if (j < ZK[i]) {
          out[k] = x;
        } else {
          // The slow path draws from the same stream, in order; then start a new run.
          s.pos = pos;
          out[k] = this.slow(i, x);
          k++;
          pos = s.pos;
          break;
        }
      }
      s.pos = pos;
    }
  }
}

export function createNormalGenerator(method: NormalMethod, stream: Stream): NormalGenerator {
  return method === 'ziggurat' ? new ZigguratGenerator(stream) : new BoxMullerGenerator(stream);
}
