/**
 * A large file's records read in two halves at once: the second half by a
 * helper thread running the fast lane (`plainLoop` of `_plain_rows.ts`),
 * while this thread reads the first half as usual. The line feeds that size
 * the columns and number the helper's rows are counted on both sides of the
 * cut at once too.
 *
 * ```
 *  bytes:  header │ first half ··········· │ second half ··········· │
 *                 dataStart                 mid (after a line feed)
 *  1. count:  this thread: F = line feeds in [dataStart, mid)
 *             helper:      G = line feeds in [mid, end)        (at the same time)
 *     then columns for F + G + 1 records (recordBound's figure, in half the time)
 *  2. read:   this thread: readRows(dataStart → mid, rows 0 … F−1)
 *             helper:      plainLoop(mid →, rows F …) into the same shared
 *                          columns, stopping at the first record that is not plain
 *  then:   first half ended exactly at mid on row F?  yes ─▶ take the helper's rows, read on
 *                                                     no  ─▶ stop the helper, read on from
 *                                                            where this thread stopped
 * ```
 *
 * The helper is a worker with no permissions made from source text (a
 * worker without permissions cannot load modules from files), used for one
 * read and then closed (an idle thread never collects its garbage, so a kept
 * helper held the last file's memory). It is given two jobs in turn: the
 * count, then (once this thread has made the columns) the rows, or a word
 * to close when the file is read in one thread after all. Inside the compute worker it is not
 * started there: a worker started from a worker took about a second to begin
 * here (from the main thread, about 35 ms), longer than the read it was to
 * share. The main thread starts it when it hands over a large file and gives
 * the compute worker a port to it ({@link halvesHelperWorker},
 * {@link useHalvesHelper}; kernel/worker/client.ts). `plainLoop`,
 * `MissingMarkers` and `productError` given as their own source, so it runs
 * the same code. Its rows are taken only when the first half had exactly as
 * many records as line feeds (no blank line, no quoted line break, no lone
 * CR): otherwise its row numbers would be off, and this thread reads the
 * rest itself, as a one-thread read would. A helper that has not begun its
 * count when this thread has finished its own is not waited for: this
 * thread counts the second half too. Long numbers, quotes, stray
 * values: the helper stops there and this thread reads on from that record.
 * The two threads meet through a small shared status array (Atomics), so the
 * reader stays synchronous.
 *
 * @module
 */
import { productError } from "../dd.ts";
import { MissingMarkers } from "./_fields.ts";
import type { NumberPass } from "./_passes.ts";
import { plainLoop } from "./_plain_rows.ts";
import { PLAIN_LANE_WASM } from "./_plain_lane_bytes.ts";
import { makeWasmLane, useWasm, wasmLoop } from "./_plain_wasm.ts";
import { POW10 } from "./decimal_parser.ts";
import { countLineFeeds, LFS } from "./line_feeds.ts";
import { type Place, readRows } from "./_read_rows.ts";
import type { ResolvedOptions } from "./_options.ts";

/** Files from this size are read in halves (smaller ones take less than a helper's start). */
export const HALVES_FROM = 32 << 20;

// The status array: [state, row reached, byte reached, rows done so far, line feeds counted,
// missing per column …].
const STATE = 0, ROW = 1, POS = 2, DONE = 3, FEEDS = 4, MISSED = 5;
// Its states: 0 posted, 1 working, 2 finished, 3 asked to stop, 4 stopped, 5 failed, 6 taken
// back before it began, 7 counted (waiting for the rows) (the helper, run from its source text,
// writes them as numbers).
const POSTED = 0, WORKING = 1, FINISHED = 2, STOP = 3, FAILED = 5, TAKEN_BACK = 6, COUNTED = 7;
/** How long a helper may go without finishing a block of rows before it is given up. */
const STALL_MS = 10_000;

/** The helper's first job: count the line feeds in `bytes[start, end)`. */
interface CountJob {
  op: "count";
  bytes: Uint8Array;
  status: SharedArrayBuffer;
  start: number;
  end: number;
}

/** The helper's second job: read plain records into the shared columns. */
interface ReadJob {
  op: "read";
  bytes: Uint8Array;
  values: (Float64Array | null)[];
  status: SharedArrayBuffer;
  start: number;
  row: number;
  limit: number;
  end: number;
  delim: number;
  point: number;
  markers: readonly string[];
  /** Whether to read through the WebAssembly lane (`_plain_wasm.ts`). */
  wasm: boolean;
}

/** What the helper is posted: a job, or a word to close (no rows for it after all). */
type HelperMessage = CountJob | ReadJob | { op: "close" };

/** The helper thread's message loop (run there from its source text; see the module notes). */
function helperMain(): void {
  // Its jobs, posted to the thread or through a port given first; then the thread closes.
  const take = (m: HelperMessage) => {
    if (m.op === "count") count(m);
    else if (m.op === "read") job(m);
    else self.close();
  };
  self.onmessage = (e: MessageEvent<HelperMessage | { port: MessagePort }>) => {
    if ("port" in e.data) e.data.port.onmessage = (j: MessageEvent<HelperMessage>) => take(j.data);
    else take(e.data);
  };
  const count = (m: CountJob) => {
    const st = new Int32Array(m.status);
    if (Atomics.compareExchange(st, 0, 0, 1) !== 0) return self.close(); // taken back before it began
    let ok = false;
    try {
      st[4] = countLineFeeds(m.bytes, m.start, m.end);
      ok = true;
    } finally {
      Atomics.store(st, 0, ok ? 7 : 5);
      Atomics.notify(st, 0);
      if (!ok) self.close();
    }
  };
  const job = (m: ReadJob) => {
    const st = new Int32Array(m.status), n = m.values.length;
    if (Atomics.compareExchange(st, 0, 0, 1) !== 0) return self.close(); // taken back before it began
    const missed = new Int32Array(n);
    let row = m.row, pos = m.start, ok = false;
    try {
      const markers = new MissingMarkers(m.markers);
      const lane = {
        bytes: m.bytes,
        end: m.end,
        delim: m.delim,
        point: m.point,
        holes: new Int32Array(n),
        missed: new Int32Array(n),
        pos: 0,
        lo: 0,
        marker: (s: number, t: number) => markers.test(m.bytes, s, t),
        slow: () => NaN, // a long number: this thread stops there
      };
      const los = m.values.map(() => null);
      const w = m.wasm ? makeWasmLane(PLAIN_LANE_WASM, POW10) : null;
      while (row < m.limit && Atomics.load(st, 0) === 1) {
        const next = Math.min(m.limit, row + 65536);
        lane.missed.fill(0);
        const r = w !== null
          ? wasmLoop(w, lane, pos, row, next, m.values, los, plainLoop)
          : plainLoop(lane, pos, row, next, m.values, los);
        for (let c = 0; c < n; c++) missed[c] += lane.missed[c];
        row = r;
        pos = lane.pos;
        Atomics.store(st, 3, row);
        if (r < next) break;
      }
      ok = true;
    } finally {
      st[1] = row;
      st[2] = pos;
      for (let c = 0; c < n; c++) st[5 + c] = missed[c];
      if (Atomics.compareExchange(st, 0, 1, ok ? 2 : 5) === 3) Atomics.store(st, 0, ok ? 4 : 5);
      Atomics.notify(st, 0);
      self.close();
    }
  };
}

/** Where a job goes: a helper this thread started, or a port to one another thread started. */
interface Helper {
  postMessage(message: HelperMessage): void;
}

let helper: Worker | null | undefined;
/** Inside the compute worker: the port to a helper the main thread started, or null for none. */
let given: { port: MessagePort | null; used: () => void } | null = null;

/**
 * For tests: `waitForHelper` makes this thread wait for the helper to begin
 * rather than take its job back (so the helper's paths run every time);
 * `taken` counts the reads whose second half the helper's rows gave.
 */
export const halvesForTests = { waitForHelper: false, taken: 0 };

/**
 * Takes helpers from ports (inside the compute worker): from now on a large
 * read uses the port last given, if any, else reads in one thread; `used` is
 * called when a helper has had its job (it then closes: ask for another).
 *
 * @param port A port to a helper from {@link halvesHelperWorker}, or null (none yet).
 * @param used Called once the port's helper has had its job.
 */
export function useHalvesHelper(port: MessagePort | null, used: () => void): void {
  given = { port, used };
}

/**
 * A new helper thread (no permissions), for the main thread to start and hand
 * to the compute worker through a port: post it `{ port }` with the port
 * transferred; it takes one job from that port and closes.
 *
 * @returns The worker, or null where none can be started.
 */
export function halvesHelperWorker(): Worker | null {
  try {
    const source = [
      `"use strict";`,
      `const SPLITTER = 134217729;`, // 2^27 + 1, as kernel/dd.ts (productError's splitter)
      `const POW10 = new Float64Array([${Array.from(POW10).join(", ")}]);`,
      `const productError = ${productError.toString()};`,
      `const EMPTY = new Int32Array(0);`,
      `const LFS = ${LFS};`,
      `const countLineFeeds = ${countLineFeeds.toString()};`,
      `const encoder = new TextEncoder();`,
      `const MissingMarkers = ${MissingMarkers.toString()};`,
      `const plainLoop = ${plainLoop.toString()};`,
      `const PLAIN_LANE_WASM = ${JSON.stringify(PLAIN_LANE_WASM)};`,
      `const makeWasmLane = ${makeWasmLane.toString()};`,
      `const wasmLoop = ${wasmLoop.toString()};`,
      `(${helperMain.toString()})();`,
    ].join("\n");
    const url = URL.createObjectURL(new Blob([source], { type: "application/javascript" }));
    // The cast: with the DOM library loaded (for views), WorkerOptions lacks Deno's `deno` field.
    const options = { type: "module", deno: { permissions: "none" } } as WorkerOptions;
    const w = new Worker(url, options);
    URL.revokeObjectURL(url);
    return w;
  } catch {
    return null;
  }
}

/** The helper for one read: a port given, else one started here; null where none can be had. */
function helperThread(): Helper | null {
  if (given !== null) {
    const { port, used } = given;
    if (port === null) return null;
    given = { port: null, used };
    let first = true;
    return {
      postMessage(message) {
        port.postMessage(message);
        if (first) used(); // the port's helper is this read's: ask for another
        first = false;
      },
    };
  }
  if (helper !== undefined) return helper;
  const w = halvesHelperWorker();
  if (w !== null) {
    w.onerror = (e) => {
      e.preventDefault();
      helper = null;
    };
  }
  helper = w;
  return helper;
}

/** Stops the helper thread this thread started, if any (tests, and after each read). */
export function stopHalvesHelper(): void {
  helper?.terminate();
  helper = undefined;
}

/** A large file cut in two after a line feed near its middle, each side's line feeds counted. */
export interface Cut {
  /** One past the line feed the second half starts after. */
  mid: number;
  /** Line feeds in [dataStart, mid): the second half's first row. */
  firstRows: number;
  /** Line feeds in [dataStart, end) (end before the trailing line ends): recordBound's count. */
  feeds: number;
  /** The helper, having counted, waiting for its rows; null when this thread counted alone. */
  helper: { thread: Helper; status: Int32Array } | null;
}

/**
 * Cuts a large file in two and counts the line feeds of both sides at once
 * (the second side by the helper, which then waits for its rows: give them
 * with {@link readInHalves}, or let it go with {@link releaseCut}).
 *
 * @param bytes The file.
 * @param dataStart The first record's byte.
 * @param end One past the last byte that is not a trailing line end.
 * @returns The cut, or null for a file too short to cut (count it in one).
 */
export function cutInHalves(bytes: Uint8Array, dataStart: number, end: number): Cut | null {
  if (bytes.length >= 2 ** 31) return null;
  const mid = bytes.indexOf(0x0a, (dataStart + bytes.length) >> 1) + 1;
  if (mid <= dataStart || mid >= end) return null;
  const thread = helperThread();
  const st = new Int32Array(new SharedArrayBuffer(4 * MISSED));
  thread?.postMessage({
    op: "count",
    bytes,
    status: st.buffer as SharedArrayBuffer,
    start: mid,
    end,
  });
  const firstRows = countLineFeeds(bytes, dataStart, mid);
  if (thread !== null && waitForCount(st)) {
    const feeds = firstRows + st[FEEDS];
    return { mid, firstRows, feeds, helper: { thread, status: st } };
  }
  // No helper, or one that did not begin in time (it closes when it sees its job taken back, or
  // on this word after a late count).
  thread?.postMessage({ op: "close" });
  stopHalvesHelper();
  return { mid, firstRows, feeds: firstRows + countLineFeeds(bytes, mid, end), helper: null };
}

/**
 * Takes back a job the helper has not begun (waiting for it to begin first
 * under `halvesForTests.waitForHelper`); true when taken back.
 */
function takenBack(st: Int32Array): boolean {
  const until = Date.now() + STALL_MS;
  while (halvesForTests.waitForHelper && Atomics.load(st, STATE) === POSTED && Date.now() < until) {
    Atomics.wait(st, STATE, POSTED, 10);
  }
  return Atomics.compareExchange(st, STATE, POSTED, TAKEN_BACK) === POSTED;
}

/** Waits for the helper's count (or takes its job back when it has not begun); true if counted. */
function waitForCount(st: Int32Array): boolean {
  const until = Date.now() + STALL_MS;
  if (takenBack(st)) return false;
  for (;;) {
    const state = Atomics.load(st, STATE);
    if (state === COUNTED) return true;
    if (state !== WORKING || Date.now() > until) return false;
    Atomics.wait(st, STATE, WORKING, 50);
  }
}

/**
 * Lets a cut's helper go without rows (the file is read in one thread after
 * all), or after they were taken; safe to call more than once.
 *
 * @param cut From {@link cutInHalves}.
 */
export function releaseCut(cut: Cut): void {
  const h = cut.helper;
  cut.helper = null;
  if (h !== null && Atomics.load(h.status, STATE) === COUNTED) {
    h.thread.postMessage({ op: "close" });
  }
  stopHalvesHelper();
}

/**
 * Reads the records from `dataStart` on in two halves (see the module notes).
 *
 * @param bytes The file.
 * @param o The reader's options.
 * @param pass Pass 1, its columns in shared memory, room for every record.
 * @param ncols Fields per record.
 * @param progress Progress callback.
 * @param dataStart The first record's byte.
 * @param cut From {@link cutInHalves}, its helper waiting for rows.
 * @returns The row count, or null when the cut has no helper (read it in one).
 */
export function readInHalves(
  bytes: Uint8Array,
  o: ResolvedOptions,
  pass: NumberPass,
  ncols: number,
  progress: (fraction: number) => void,
  dataStart: number,
  cut: Cut,
): number | null {
  const { mid, firstRows, helper } = cut;
  if (helper === null) return null;
  cut.helper = null;
  const st = new Int32Array(new SharedArrayBuffer(4 * (MISSED + ncols)));
  const job: ReadJob = {
    op: "read",
    bytes,
    values: pass.values,
    status: st.buffer as SharedArrayBuffer,
    start: mid,
    row: firstRows,
    limit: pass.capacity,
    end: bytes.lastIndexOf(0x0a) + 1,
    delim: o.delimByte,
    point: pass.parser.decimalByte,
    markers: o.missing,
    wasm: useWasm(bytes.length - mid, ncols, []),
  };
  helper.thread.postMessage(job);
  let first: Place;
  try {
    first = readRows(bytes, o, pass, ncols, progress, { pos: dataStart, row: 0 }, {
      pos: mid,
      row: firstRows,
    });
  } catch (err) {
    settle(st, true);
    stopHalvesHelper();
    throw err;
  }
  const joined = first.row === firstRows && first.pos === mid;
  const state = settle(st, !joined);
  let from = first;
  if (joined) {
    from = { pos: mid, row: firstRows };
    if (state === FINISHED) {
      halvesForTests.taken++;
      from = { pos: st[POS], row: st[ROW] };
      const rows = from.row - firstRows;
      for (let c = 0; c < ncols; c++) {
        if (pass.values[c] === null) continue;
        pass.numeric[c] += rows - st[MISSED + c];
        pass.missing[c] += st[MISSED + c];
      }
    }
  }
  const rows = readRows(bytes, o, pass, ncols, progress, from).row;
  // Each helper reads once and closes (see the module notes).
  stopHalvesHelper();
  return rows;
}

/**
 * Waits for the helper to be done with the job (asking it to stop first, or
 * taking back a job it has not begun), and says how it ended.
 */
function settle(st: Int32Array, stop: boolean): number {
  if (takenBack(st)) return TAKEN_BACK;
  if (stop) Atomics.compareExchange(st, STATE, WORKING, STOP);
  let seen = Atomics.load(st, DONE), since = Date.now();
  for (;;) {
    const state = Atomics.load(st, STATE);
    if (state !== WORKING && state !== STOP) return state;
    Atomics.wait(st, STATE, state, 50);
    const done = Atomics.load(st, DONE);
    if (done !== seen) {
      seen = done;
      since = Date.now();
    } else if (Date.now() - since > STALL_MS) {
      // No block of rows in ten seconds: the helper is gone. Its rows are not taken.
      stopHalvesHelper();
      helper = null;
      return FAILED;
    }
  }
}
