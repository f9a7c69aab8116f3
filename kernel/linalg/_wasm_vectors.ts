/**
 * Matrices in WebAssembly memory, for the Householder QR's long loops
 * (`vectors.wat`: a dot product, a reflector's application, a scaling and a
 * swap, two doubles a step).
 *
 * ```
 *  wasmMatrix(entries, spare) ──▶ Float64Array over a memory of its own, kernels bound to it
 *  _householder.ts: both operands in one such memory and long enough? ──yes──▶ the kernel
 *                                                                     └─no──▶ the JavaScript loop
 * ```
 *
 * The kernels give the JavaScript loops' results bit for bit (see the .wat's
 * notes), so where an array lives changes nothing but speed: on the
 * million-row design of the benchmark a reflector's application takes about
 * a fifth of the loop's time. An array here is an ordinary Float64Array to
 * every other reader. Each matrix has a memory of its own (freed with the
 * array), sized once, never grown; where WebAssembly or the memory cannot be
 * had, `wasmMatrix` gives a plain array. `spare` doubles after the matrix
 * hold a vector the QR's callers work on beside it (`apply_qt.ts`).
 *
 * @module
 */
import { VECTORS_WASM } from "./_vectors_bytes.ts";

/** The kernels of one memory; addresses in bytes, lengths in elements. */
export interface VectorKernels {
  dot(x: number, y: number, len: number): number;
  reflect(v: number, tau: number, c: number, len: number): void;
  scale(a: number, len: number, f: number): void;
  swap(a: number, b: number, len: number): void;
  /** The spare vector after the matrix (empty when none was asked for). */
  spare: Float64Array;
}

/** Fewest elements for which an operation goes to the kernels (a call costs about a loop of that). */
export const WASM_FROM = 1024;

/** Matrices of fewer entries stay plain arrays (a memory of their own is not worth it). */
const MATRIX_FROM = 1 << 16;

/** The largest memory asked for: 4 GiB is WebAssembly's limit; leave room. */
const MAX_BYTES = 2 ** 31;

/** For tests: false keeps every matrix a plain array. */
export const vectorsForTests = { wasm: true };

let module: WebAssembly.Module | null | undefined;
const kernels = new WeakMap<ArrayBufferLike, VectorKernels>();

function compiled(): WebAssembly.Module | null {
  if (module === undefined) {
    try {
      module = new WebAssembly.Module(Uint8Array.from(atob(VECTORS_WASM), (c) => c.charCodeAt(0)));
    } catch {
      module = null;
    }
  }
  return module;
}

/**
 * A zeroed array of `entries` doubles in a WebAssembly memory of its own, with
 * its kernels (or a plain array where that cannot be had, or is too small to
 * be worth it).
 *
 * @param entries The matrix's entries.
 * @param spare Doubles after it for a working vector ({@link VectorKernels.spare}).
 * @returns The array.
 */
export function wasmMatrix(entries: number, spare = 0): Float64Array {
  const bytes = 8 * (entries + spare);
  const mod = vectorsForTests.wasm && entries >= MATRIX_FROM && bytes <= MAX_BYTES
    ? compiled()
    : null;
  if (mod === null) return new Float64Array(entries);
  try {
    const memory = new WebAssembly.Memory({ initial: Math.ceil(bytes / 65536) });
    const e = new WebAssembly.Instance(mod, { env: { memory } }).exports;
    const a = new Float64Array(memory.buffer, 0, entries);
    kernels.set(memory.buffer, {
      dot: e.dot as VectorKernels["dot"],
      reflect: e.reflect as VectorKernels["reflect"],
      scale: e.scale as VectorKernels["scale"],
      swap: e.swap as VectorKernels["swap"],
      spare: new Float64Array(memory.buffer, 8 * entries, spare),
    });
    return a;
  } catch {
    return new Float64Array(entries);
  }
}

/**
 * The kernels of the memory an array lives in, if it is one of {@link wasmMatrix}'s.
 *
 * @param a Any array.
 * @returns Its memory's kernels, or undefined.
 */
export function kernelsOf(a: Float64Array): VectorKernels | undefined {
  return kernels.get(a.buffer);
}
