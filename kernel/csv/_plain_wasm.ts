/**
 * The fast lane in WebAssembly: plain records read by `plain_lane.wat`
 * (assembled into `_plain_lane_bytes.ts`), block by block, with the
 * JavaScript lane (`plainLoop`) reading each record the module leaves.
 *
 * ```
 *  file bytes ──copy a block (≤ 1 MB, whole records)──▶ module memory
 *     rows(…) ──▶ f64 columns of the block in module memory ──copy──▶ the pass's columns
 *     a record the module leaves ──▶ plainLoop reads that one record (or stops: the scanner's)
 * ```
 *
 * The module takes a subset of what `plainLoop` takes (see the .wat's notes)
 * and computes every number it takes with the same IEEE operation, so a read
 * gives the same values, counts and stopping place as `plainLoop` alone,
 * about twice as fast: one 64-bit load covers eight digits where the
 * JavaScript lane handles a byte at a time. Used where no decimal corrections
 * are kept (the module computes none), for at most {@link WASM_MAX_COLUMNS}
 * columns and runs of at least `laneForTests.wasmFrom` bytes (a small read
 * is not worth a block copy); anywhere WebAssembly cannot be had, `plainLoop`
 * reads alone. `makeWasmLane` and `wasmLoop` refer to nothing outside
 * themselves, so the CSV helper thread is given their source (`_halves.ts`).
 *
 * @module
 */
import { PLAIN_LANE_WASM } from "./_plain_lane_bytes.ts";
import type { Lane, plainLoop } from "./_plain_rows.ts";
import { POW10 } from "./decimal_parser.ts";

/** Columns the module has room for (its per-column tables). */
export const WASM_MAX_COLUMNS = 4096;

/** An instance of the lane's module. */
export interface WasmLane {
  /** The module's `rows` (see plain_lane.wat). */
  rows: (
    p: number,
    end: number,
    ncols: number,
    maxRows: number,
    out: number,
    stride: number,
    delim: number,
    point: number,
  ) => number;
  /** Its global `stop`. */
  stop: WebAssembly.Global;
  /** Its memory, as bytes. */
  u8: Uint8Array;
  /** Its missing-value counts per column. */
  miss: Int32Array;
  /** Records it has read (for tests). */
  taken: number;
}

/**
 * For tests: `wasm` false reads with the JavaScript lane alone; `wasmFrom`
 * is the fewest bytes a read must span to go through the module.
 */
export const laneForTests = { wasm: true, wasmFrom: 1 << 16 };

/**
 * Instantiates the lane's module and writes its tables of powers of ten.
 *
 * @param base64 The module's bytes, base64.
 * @param pow10 10^0 … 10^22 as doubles.
 * @returns The instance, or null where WebAssembly cannot be had.
 */
export function makeWasmLane(base64: string, pow10: Float64Array): WasmLane | null {
  try {
    const text = atob(base64);
    const bytes = new Uint8Array(text.length);
    for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
    const { exports } = new WebAssembly.Instance(new WebAssembly.Module(bytes), {});
    const memory = exports.memory as WebAssembly.Memory;
    new Float64Array(memory.buffer, 0, 23).set(pow10);
    const p10 = new Uint32Array(memory.buffer, 256, 18); // i64 10^0 … 10^8, little-endian halves
    for (let k = 0, v = 1; k <= 8; k++, v *= 10) p10[2 * k] = v;
    return {
      rows: exports.rows as WasmLane["rows"],
      stop: exports.stop as WebAssembly.Global,
      u8: new Uint8Array(memory.buffer),
      miss: new Int32Array(memory.buffer, 1024, 4096),
      taken: 0,
    };
  } catch {
    return null;
  }
}

/**
 * Reads plain records as `plainLoop` does (same arguments, result and
 * `lane.pos`), through the module where it can (see the module notes); `js`
 * is `plainLoop`, passed in so that a helper thread given this function's
 * source can pass its own.
 */
export function wasmLoop(
  w: WasmLane,
  lane: Lane,
  start: number,
  row: number,
  limit: number,
  values: readonly (Float64Array | null)[],
  los: readonly (Float64Array | null)[],
  js: typeof plainLoop,
): number {
  // The module's memory: input block at IN (room after it for loads past a record's end),
  // the block's columns at OUT, `stride` rows each.
  const IN = 65536, IN_BYTES = 1 << 20, OUT = IN + IN_BYTES + 64, OUT_BYTES = 2 << 20;
  const b = lane.bytes, n = values.length, u8 = w.u8, miss = w.miss;
  for (let c = 0; c < n; c++) u8[17408 + c] = values[c] === null ? 1 : 0;
  const stride = Math.floor(OUT_BYTES / (8 * n));
  let pos = start, r = row;
  while (r < limit && pos < lane.end) {
    const cap = Math.min(lane.end, pos + IN_BYTES);
    const e = cap === lane.end ? cap : b.lastIndexOf(0x0a, cap - 1) + 1;
    if (e > pos) {
      u8.set(b.subarray(pos, e), IN);
      miss.fill(0, 0, n);
      const max = Math.min(limit - r, stride);
      const got = w.rows(IN, IN + (e - pos), n, max, OUT, stride, lane.delim, lane.point);
      if (got > 0) {
        for (let c = 0; c < n; c++) {
          const v = values[c];
          if (v === null) continue;
          v.set(new Float64Array(u8.buffer, OUT + 8 * c * stride, got), r);
          lane.missed[c] += miss[c];
        }
      }
      r += got;
      w.taken += got;
      pos += (w.stop.value as number) - IN;
      if (got === max || pos === e) continue; // rows enough, or the block read whole: go on
    }
    // A record the module leaves (or one longer than a block): the JavaScript lane's.
    const next = js(lane, pos, r, Math.min(limit, r + 1), values, los);
    pos = lane.pos;
    if (next === r) break; // not plain: the general scanner's
    r = next;
  }
  lane.pos = pos;
  return r;
}

let instance: WasmLane | null | undefined;

/** Records this thread's module has read so far (for tests). */
export function wasmTaken(): number {
  return instance?.taken ?? 0;
}

/**
 * `js` (`plainLoop`: passed in, as `_plain_rows.ts` imports this module),
 * through the module where it applies (see the module notes).
 *
 * @returns The next row; `lane.pos` is where it starts.
 */
export function laneRows(
  lane: Lane,
  start: number,
  row: number,
  limit: number,
  values: readonly (Float64Array | null)[],
  los: readonly (Float64Array | null)[],
  js: typeof plainLoop,
): number {
  if (useWasm(lane.end - start, values.length, los)) {
    instance ??= makeWasmLane(PLAIN_LANE_WASM, POW10);
    if (instance !== null) return wasmLoop(instance, lane, start, row, limit, values, los, js);
  }
  return js(lane, start, row, limit, values, los);
}

/**
 * Whether a read of `span` bytes into `ncols` columns goes through the module.
 *
 * @param span Bytes the read may cover.
 * @param ncols Fields per record.
 * @param los The decimal corrections' columns (the module keeps none).
 * @returns True to use the module.
 */
export function useWasm(
  span: number,
  ncols: number,
  los: readonly (Float64Array | null)[],
): boolean {
  return laneForTests.wasm && span >= laneForTests.wasmFrom && ncols <= WASM_MAX_COLUMNS &&
    los.every((l) => l === null);
}
