/**
 * The engine's WebAssembly SIMD kernels (kernels.wat, compiled into kernels-wasm.ts by
 * `npm run build:wasm`). Each kernel has a JavaScript twin that gives the same bits; the
 * twin runs when WebAssembly is missing or refuses the module (an older engine without
 * SIMD, a Content-Security-Policy without 'wasm-unsafe-eval'), so a result never depends
 * on which one ran.
 *
 * One instance per thread, compiled synchronously on first use (the module is under 1 KB,
 * so no thread needs to wait for it). Its memory is scratch space: a caller takes views
 * with workspace(), which may grow the memory (old views then go stale), fills them, calls
 * the kernel and reads the results before anything else asks for the workspace.
 */
import { KERNELS_WASM_BASE64 } from './kernels-wasm';

export interface Kernels {
  /** acc[t] = a + sum_g coef[g] z_g[t] for t < count (see kernels.wat); all pointers are byte addresses. */
  affine(acc: number, a: number, coef: number, off: number, terms: number, count: number): void;
  readonly memory: WebAssembly.Memory;
}

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
    return { affine: e.affine, memory: e.memory };
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
}

/** The kernels' memory, at least `bytes` long (grown when needed: earlier views are then stale). */
export function workspace(k: Kernels, bytes: number): ArrayBuffer {
  const have = k.memory.buffer.byteLength;
  if (have < bytes) k.memory.grow(Math.ceil((bytes - have) / 65536));
  return k.memory.buffer;
}
