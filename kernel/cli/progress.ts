/**
 * Progress of long cells on standard error under `plumb run` (standard
 * output keeps the summary or the RUN-JSON alone). The compute worker sends a
 * cell's progress only once it has worked 100 ms, then at most every 50 ms
 * (kernel/worker/_run_cell.ts), so a quick run prints nothing here.
 *
 * ```
 *  computing drivers 42% · 14,090,240 of 33,554,432 subsets
 * ```
 *
 * In a terminal the line is written over in place (carriage return, erase
 * line) and erased when the cell settles; into a file or a pipe, each line
 * ends in a line feed and a cell writes one at most every second, so a log
 * of a long run stays short.
 *
 * @module
 */
import type { SessionEvent } from "../session/types.ts";

/** How progress is written. */
export interface ProgressOptions {
  /** Whether standard error is a terminal (lines written over in place). */
  terminal: boolean;
  /** Least time between two lines of one cell, ms (default 200 in a terminal, else 1,000). */
  everyMs?: number;
  /** The clock, ms (default `performance.now`). */
  now?: () => number;
}

/** Carriage return and erase line (ECMA-48 EL, parameter 2). */
const ERASE = "\r\x1b[2K";

/**
 * The line of one cell's progress.
 *
 * @param name The cell's name.
 * @param fraction Done, in [0, 1] (clamped).
 * @param note What the cell says it is doing, if anything.
 * @returns The line, without a line feed.
 * @example
 * ```ts
 * import { progressLine } from "./progress.ts";
 * const line = progressLine("drivers", 0.426, "14 of 33 subsets");
 * if (line !== "computing drivers 42% · 14 of 33 subsets") throw new Error(line);
 * ```
 */
export function progressLine(name: string, fraction: number, note?: string): string {
  const percent = Math.floor(Math.min(1, Math.max(0, fraction)) * 100);
  return `computing ${name} ${percent}%${note ? ` · ${note}` : ""}`;
}

/**
 * A session listener that writes the progress of computing cells.
 *
 * @param write Writes text to standard error (or a test's collector).
 * @param opts Terminal or not, the interval, the clock.
 * @returns The listener (`SessionOptions.onEvent`).
 */
export function progressWriter(
  write: (text: string) => void,
  opts: ProgressOptions,
): (e: SessionEvent) => void {
  const every = opts.everyMs ?? (opts.terminal ? 200 : 1000);
  const now = opts.now ?? (() => performance.now());
  const last = new Map<string, number>();
  let shown: string | null = null; // in a terminal: the cell whose line is on screen
  return (e) => {
    if (e.state !== "computing") {
      if (opts.terminal && shown === e.name) {
        write(ERASE);
        shown = null;
      }
      return;
    }
    if (e.fraction === undefined) return;
    const t = now();
    const before = last.get(e.name);
    if (before !== undefined && t - before < every) return;
    last.set(e.name, t);
    const line = progressLine(e.name, e.fraction, e.note);
    if (opts.terminal) {
      write(ERASE + line);
      shown = e.name;
    } else write(line + "\n");
  };
}

/**
 * The progress writer of `plumb run`: to standard error, written over in
 * place when it is a terminal.
 *
 * @returns The listener.
 */
export function progressOnStderr(): (e: SessionEvent) => void {
  const enc = new TextEncoder();
  return progressWriter((text) => {
    const bytes = enc.encode(text);
    for (let at = 0; at < bytes.length;) at += Deno.stderr.writeSync(bytes.subarray(at));
  }, { terminal: Deno.stderr.isTerminal() });
}
