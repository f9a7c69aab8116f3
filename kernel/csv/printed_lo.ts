/**
 * The decimal corrections of doubles taken as printed decimals, a block at a
 * time in WebAssembly (`printed_lo.wat`): for each value v, lo such that
 * v + lo is the shortest decimal of at most 15 significant digits that rounds
 * to v, or 0 where there is none (integers, values needing more digits). The
 * method and its proof are cells/fit/_printed_lo.ts's, whose JavaScript
 * `correction` this computes the same bits as (the same IEEE operations in
 * the same order, no fused multiply-add), about four times as fast; that file
 * reads with it where it can and falls back to its own loop.
 *
 * @module
 */
import { PRINTED_LO_WASM } from "./_printed_lo_bytes.ts";
import { POW10 } from "./decimal_parser.ts";

/** Values a call to the module takes (its memory's room for them and their corrections). */
const BLOCK = 8192;
const IN = 2048, OUT = IN + 8 * BLOCK;

interface Module {
  corrections: (input: number, out: number, n: number) => number;
  f64: Float64Array;
}

let instance: Module | null | undefined;

/** For tests: false makes {@link wasmCorrections} decline (the caller's own loop reads). */
export const printedForTests = { wasm: true };

function module(): Module | null {
  if (instance !== undefined) return instance;
  try {
    const bytes = Uint8Array.from(atob(PRINTED_LO_WASM), (c) => c.charCodeAt(0));
    const { exports } = new WebAssembly.Instance(new WebAssembly.Module(bytes), {});
    const memory = exports.memory as WebAssembly.Memory;
    const f64 = new Float64Array(memory.buffer), i32 = new Int32Array(memory.buffer);
    f64.set(POW10, 0);
    // Per binade [2^e, 2^(e+1)), e = −30 … 52, at byte 512: the decades' doubles at or below
    // 2^e, and the one inside it (see printed_lo.wat's $decade).
    const decades = Array.from({ length: 23 }, (_, i) => Number(`1e${i - 8}`));
    for (let e = -30; e <= 52; e++) {
      const at = 512 + 16 * (e + 30), low = 2 ** e;
      const count = decades.filter((d) => d <= low).length;
      i32[at / 4] = count;
      f64[at / 8 + 1] = count < 23 && decades[count] < 2 * low ? decades[count] : Infinity;
    }
    instance = { corrections: exports.corrections as Module["corrections"], f64 };
  } catch {
    instance = null;
  }
  return instance;
}

/**
 * Writes the corrections of `hi[start, start + len)` into `out[0, len)`.
 *
 * @param hi The doubles.
 * @param start First value.
 * @param len How many.
 * @param out Room for `len` corrections.
 * @returns How many corrections are not 0, or −1 when WebAssembly cannot be
 *   had (nothing written: compute them another way).
 */
export function wasmCorrections(
  hi: Float64Array,
  start: number,
  len: number,
  out: Float64Array,
): number {
  const m = printedForTests.wasm ? module() : null;
  if (m === null) return -1;
  let some = 0;
  for (let at = 0; at < len; at += BLOCK) {
    const n = Math.min(BLOCK, len - at);
    m.f64.set(hi.subarray(start + at, start + at + n), IN / 8);
    some += m.corrections(IN, OUT, n);
    out.set(m.f64.subarray(OUT / 8, OUT / 8 + n), at);
  }
  return some;
}
