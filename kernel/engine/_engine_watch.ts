/**
 * What an engine process watches while a statement runs (kernel/engine/_engine_child.ts):
 * its time limit, and its progress when the request asks for it.
 *
 * ```
 *  statement starts ─┬─ limitMs later (if > 0) ─▶ over(): the engine is asked to stop it
 *                    └─ PROGRESS_AFTER_MS later, then every PROGRESS_EVERY_MS:
 *                         share (the engine's, else rows read / expectRows) and rows read
 *                         ─▶ {"id", "progress": {"fraction"?, "rows"?}} when either moved up
 *  statement ends ──▶ the returned function stops both
 * ```
 *
 * @module
 */

/** Progress is first looked at this long into a statement (ms): a quick one reports none. */
export const PROGRESS_AFTER_MS = 250;
/** Then this often (ms): a few lines a second at most. */
export const PROGRESS_EVERY_MS = 250;

/** One running statement, as {@link watchStatement} sees it. */
export interface Watched {
  /** The request's id (each progress line names it). */
  id: number;
  /** Milliseconds the statement may run; 0 for no limit. */
  limitMs: number;
  /** Whether progress lines are wanted. */
  progress: boolean;
  /** Rows the statement will give, when the caller knows. */
  expectRows?: number;
  /** The engine's share done, in [0, 1], or null where it says none. */
  share: () => number | null;
  /** Rows read so far from a streamed statement; -1 for one that is not streamed. */
  rowsRead: () => number;
  /** Called once when the limit passes. */
  over: () => void;
  /** Writes a line to Plumb. */
  say: (line: unknown) => void;
}

/**
 * Watches a running statement: its time limit and, when asked, its progress.
 * A share is never said lower than before (an engine may re-estimate its
 * work), and a line goes out only when the share or the rows moved.
 *
 * @param w The statement.
 * @returns Stops watching.
 * @example
 * ```ts
 * import { watchStatement } from "./_engine_watch.ts";
 * let overs = 0;
 * const stop = watchStatement({
 *   id: 1, limitMs: 0, progress: false, share: () => null, rowsRead: () => -1,
 *   over: () => overs++, say: () => {},
 * });
 * stop();
 * if (overs !== 0) throw new Error("no limit, nothing stopped");
 * ```
 */
export function watchStatement(w: Watched): () => void {
  const timer = w.limitMs > 0 ? setTimeout(w.over, w.limitMs) : undefined;
  let ticker: ReturnType<typeof setInterval> | undefined;
  let lastShare = -1;
  let lastRows = -1;
  const look = () => {
    const rows = w.rowsRead();
    let share = w.share();
    if (share === null && rows >= 0 && w.expectRows !== undefined && w.expectRows > 0) {
      share = Math.min(1, rows / w.expectRows);
    }
    const said: { fraction?: number; rows?: number } = {};
    if (share !== null && share > lastShare) said.fraction = lastShare = share;
    if (rows > lastRows) said.rows = lastRows = rows;
    if (said.fraction !== undefined || said.rows !== undefined) {
      w.say({ id: w.id, progress: said });
    }
  };
  const first = w.progress
    ? setTimeout(() => {
      look();
      ticker = setInterval(look, PROGRESS_EVERY_MS);
    }, PROGRESS_AFTER_MS)
    : undefined;
  return () => {
    clearTimeout(timer);
    clearTimeout(first);
    clearInterval(ticker);
  };
}

/**
 * A time limit in words: whole minutes as minutes, else seconds.
 *
 * @param ms The limit in milliseconds.
 * @returns The words.
 * @example
 * ```ts
 * import { limitWords } from "./_engine_watch.ts";
 * if (limitWords(1_800_000) !== "30 min" || limitWords(500) !== "0.5 s") throw new Error();
 * ```
 */
export function limitWords(ms: number): string {
  const s = ms / 1000;
  if (s >= 60 && s % 60 === 0) return `${(s / 60).toLocaleString("en")} min`;
  return `${Number(s.toPrecision(6)).toLocaleString("en")} s`;
}

/**
 * The answer of a statement stopped at its time limit: the limit and the setting.
 *
 * @param ms The limit in milliseconds.
 * @returns The sentence.
 * @example
 * ```ts
 * import { overTimeMessage } from "./_engine_watch.ts";
 * if (!overTimeMessage(90_000).includes("time limit of 90 s")) throw new Error();
 * ```
 */
export function overTimeMessage(ms: number): string {
  return `The statement ran longer than the time limit of ${
    limitWords(ms)
  } and was stopped (set query_time_limit in the front matter to raise it, or to none)`;
}
