/**
 * The engine's WebAssembly SIMD kernels (kernels.wat, compiled into kernels-wasm.ts by
 * `npm run build:wasm`). Each kernel has a JavaScript twin that gives the same bits; the
 * twin runs when WebAssembly is missing or refuses the module (an older engine without
 * SIMD, a Content-Security-Policy without 'wasm-unsafe-eval'), so a result never depends
 * on which one ran.
 *
 * One instance per thread, compiled synchronously on first use (the module is about 1.2 KB,
 * so no thread needs to wait for it). Its memory is scratch space: a caller takes views
 * with workspace(), which may grow the memory (old views then go stale), fills them, calls
 * the kernel and reads the results before anything else asks for the workspace.
 */
import { KERNELS_WASM_BASE64 } from './kernels-wasm';

export interface Kernels {
  /** acc[t] = a + sum_g coef[g] z_g[t] for t < count (see kernels.wat); all pointers are byte addresses. */
  affine(acc: number, a: number, coef: number, off: number, terms: number, count: number): void;
  /** n steps of xor4096 from the time-ordered state at `state` (128 + n i32) into out (n i32); n a multiple of 8. */
  xorgen(state: number, out: number, n: number, w: number): void;
  /** The ziggurat's fast path over n draws at ints; returns how many were accepted before the first that was not. */
  zigguratFast(ints: number, n: number, out: number, tw: number, tk: number): number;
  /** The sum of n values at x, in the order of kernels.wat. */
  sum(x: number, n: number): number;
  /** Sum of (x - mean)^2 over n values at x; stores the sum of (x - mean) at out. */
  deviations(x: number, n: number, mean: number, out: number): number;
  readonly memory: WebAssembly.Memory;
}

/**
 * Fixed regions at the start of the kernels' memory (inside its first 64 KiB page, so they
 * exist from the start and growing never moves them); the workspace for the copula's blocks
 * starts at SCRATCH.
 */
export const LAYOUT = {
  /** xor4096 state in time order, then the n new values: i32[128 + 1024]. */
  rngState: 0,
  /** The xor4096 outputs of the last refill: i32[1024]. */
  rngOut: 4608,
  /** Ziggurat tables: x_i / 2^23 (f64[256]) and the acceptance thresholds (u32[256]). */
  zigW: 8704,
  zigK: 10752,
  /** Ziggurat output for a destination outside this memory: f64[1024]. */
  zigOut: 12288,
  scratch: 20480,
} as const;

/**
 * Which stream's buffered draws rngOut holds (the stream and its refill count), so the
 * ziggurat kernel reads them in place instead of copying them in again.
 */
export const heldDraws: { owner: object | null; stamp: number } = { owner: null, stamp: -1 };

let kernels: Kernels | null | undefined;
let enabled = true;

function decode(b64: string): Uint8Array<ArrayBuffer> {
  const bin = atob(b64);
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  return bytes;
}

function instantiate(): Kernels | null {
  try {
    if (typeof WebAssembly !== 'object' || typeof atob !== 'function') return null;
    const instance = new WebAssembly.Instance(new WebAssembly.Module(decode(KERNELS_WASM_BASE64)), {});
    const e = instance.exports as unknown as Kernels;
    return { affine: e.affine, xorgen: e.xorgen, zigguratFast: e.zigguratFast, sum: e.sum, deviations: e.deviations, memory: e.memory };
  } catch {
    return null;
  }
}

/** The kernels, or null when this thread runs the JavaScript twins. */
export function wasmKernels(): Kernels | null {
  if (!enabled) return null;
  if (kernels === undefined) kernels = instantiate();
  return kernels;
}

/** Turn the kernels off (or on again), so tests can compare both paths in one process. */
export function setWasmKernels(on: boolean): void {
  enabled = on;
  heldDraws.owner = null;
}

/** The kernels' memory, with at least `bytes` from LAYOUT.scratch on (grown when needed: earlier views are then stale). */
export function workspace(k: Kernels, bytes: number): ArrayBuffer {
  bytes += LAYOUT.scratch;
  const have = k.memory.buffer.byteLength;
  if (have < bytes) k.memory.grow(Math.ceil((bytes - have) / 65536));
  return k.memory.buffer;
}
