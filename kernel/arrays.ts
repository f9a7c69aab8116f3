/**
 * Copies between typed and plain arrays, written as plain loops.
 *
 * Why not `Array.from(typed)`, `Float64Array.from(index, fn)` or
 * `typed.map(fn)`: in Deno 2.9 (V8) on 10,000 values they take 0.5–1.1 ms
 * where these loops take 0.05–0.13 ms (measured on this project's machine
 * kind; see DEVELOPERS.md, "Speed"), and a live update of a 10,000-row
 * analysis makes dozens of such copies.
 *
 * @module
 */

/**
 * A plain array with the same numbers (for JSON results).
 *
 * @param a Any array-like of numbers.
 * @returns A new `number[]`.
 * @example
 * ```ts
 * import { plainArray } from "./arrays.ts";
 * if (plainArray(new Float64Array([1, 2])).join() !== "1,2") throw new Error("copy");
 * ```
 */
export function plainArray(a: ArrayLike<number>): number[] {
  const out = new Array<number>(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  return out;
}

/**
 * The values at the given positions, as a Float64Array.
 *
 * @param values The values.
 * @param at Positions into `values`, in the order wanted.
 * @returns `values[at[k]]` for each k.
 * @example
 * ```ts
 * import { gather } from "./arrays.ts";
 * if (gather([5, 6, 7], [2, 0]).join() !== "7,5") throw new Error("gather");
 * ```
 */
export function gather(values: ArrayLike<number>, at: ArrayLike<number>): Float64Array {
  const out = new Float64Array(at.length);
  for (let k = 0; k < at.length; k++) out[k] = values[at[k]];
  return out;
}

/**
 * The integers at the given positions, as an Int32Array (row numbers).
 *
 * @param values The values.
 * @param at Positions into `values`, in the order wanted.
 * @returns `values[at[k]]` for each k.
 * @example
 * ```ts
 * import { gatherInt } from "./arrays.ts";
 * if (gatherInt([5, 6, 7], [1]).join() !== "6") throw new Error("gather");
 * ```
 */
export function gatherInt(values: ArrayLike<number>, at: ArrayLike<number>): Int32Array {
  const out = new Int32Array(at.length);
  for (let k = 0; k < at.length; k++) out[k] = values[at[k]];
  return out;
}

/**
 * The value with every typed array in it turned into a plain array (JSON
 * writes a typed array as an object of indexes). Returns `v` itself, not a
 * copy, when it holds none: only a scan, no allocation.
 *
 * @param v Plain data (objects, arrays, numbers, strings, booleans, null), possibly with typed arrays.
 * @returns Plain data.
 * @example
 * ```ts
 * import { plainDeep } from "./arrays.ts";
 * const a = { x: [1, 2] };
 * if (plainDeep(a) !== a) throw new Error("no copy needed");
 * const b = plainDeep({ y: new Float64Array([3]) }) as { y: number[] };
 * if (!Array.isArray(b.y)) throw new Error("converted");
 * ```
 */
export function plainDeep(v: unknown): unknown {
  return hasTyped(v) ? convert(v) : v;
}

function hasTyped(v: unknown): boolean {
  if (v === null || typeof v !== "object") return false;
  if (ArrayBuffer.isView(v)) return true;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const x = v[i];
      if (x !== null && typeof x === "object" && hasTyped(x)) return true;
    }
    return false;
  }
  for (const k in v) if (hasTyped((v as Record<string, unknown>)[k])) return true;
  return false;
}

function convert(v: unknown): unknown {
  if (v === null || typeof v !== "object") return v;
  if (ArrayBuffer.isView(v)) return plainArray(v as unknown as ArrayLike<number>);
  if (Array.isArray(v)) return v.map(convert);
  const out: Record<string, unknown> = {};
  for (const k in v) out[k] = convert((v as Record<string, unknown>)[k]);
  return out;
}

/** Per-row fields at least this long leave a summary as Float64Array (`rowValues`). */
export const ROWS_TYPED_FROM = 4096;

/**
 * A per-row array of `n` doubles (zeros) for a kind's output: in shared memory
 * when it is long enough to leave a summary as a Float64Array, so that
 * {@link rowValues} hands it over as it is (the main thread reads the same
 * memory; outputs are never written once made) instead of copying it into new
 * memory, which cost a million-row `--json` run about 10 ms an array.
 *
 * @param n Rows.
 * @returns The array.
 * @example
 * ```ts
 * import { rowArray } from "./arrays.ts";
 * if (!(rowArray(5000).buffer instanceof SharedArrayBuffer)) throw new Error("shared");
 * if (rowArray(3).buffer instanceof SharedArrayBuffer) throw new Error("short: plain");
 * ```
 */
export function rowArray(n: number): Float64Array {
  return n >= ROWS_TYPED_FROM
    ? new Float64Array(new SharedArrayBuffer(8 * n))
    : new Float64Array(n);
}

/** Whether `a` is a whole shared array of {@link rowArray}'s kind (handed over as it is). */
function sharedWhole(a: ArrayLike<number>): a is Float64Array {
  return a instanceof Float64Array && a.buffer instanceof SharedArrayBuffer &&
    a.byteOffset === 0 && a.byteLength === a.buffer.byteLength;
}

/** Float64Arrays made by {@link rowValues}: owned by the summary alone, so they may be moved. */
const MOVABLE = new WeakSet<object>();

/**
 * A per-row field of a complete summary: a plain array when short, else a new
 * Float64Array (NaN where JSON has null) that the compute worker moves to the
 * main thread without a copy (kernel/worker/protocol.ts, `packRows`). Every
 * reader of complete summaries takes typed arrays (the RUN-JSON writer, page
 * copies through {@link plainDeep}, inline values): a million-row `--json` run
 * built plain arrays only to turn them back into typed ones, about 1 s.
 *
 * @param a The values (NaN: none).
 * @param nullable Whether a short array shows NaN as null (JSON's none).
 * @returns The field's value (typed as the plain array JSON will read).
 * @example
 * ```ts
 * import { isMovable, rowValues } from "./arrays.ts";
 * const short = rowValues(new Float64Array([1, NaN]), true);
 * if (!Array.isArray(short) || short[1] !== null) throw new Error("plain, null");
 * const long = rowValues(new Float64Array(5000));
 * if (!(long instanceof Float64Array) || !isMovable(long)) throw new Error("typed, movable");
 * ```
 */
export function rowValues(a: ArrayLike<number>, nullable = false): number[] {
  if (a.length < ROWS_TYPED_FROM) {
    if (!nullable) return plainArray(a);
    const out = new Array<number>(a.length);
    for (let i = 0; i < a.length; i++) out[i] = Number.isNaN(a[i]) ? null as never : a[i];
    return out;
  }
  if (sharedWhole(a)) return a as unknown as number[]; // shared, not copied (rowArray)
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  MOVABLE.add(out);
  return out as unknown as number[];
}

/**
 * Whether `v` is a Float64Array from {@link rowValues}.
 *
 * @param v Any value.
 * @returns True when nothing else holds it.
 */
export function isMovable(v: unknown): v is Float64Array {
  return v instanceof Float64Array && MOVABLE.has(v);
}
