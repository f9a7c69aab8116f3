/**
 * `plumb run`'s arguments, and its relaunch decided before the rest loads.
 *
 * A `plumb run` that records its history but may not write beside the
 * document starts itself again with leave to write the history file only
 * (kernel/cli/run.ts). Decided after loading every kind, that first process
 * cost a cold run of the demo about 130 ms; {@link relaunchEarly} decides it
 * from the arguments and the permissions alone, with nothing heavy loaded
 * (the entry, cells/main.ts, asks it first). A document whose front matter
 * turns the history off is then run by the relaunched process, which records
 * nothing, as the first would have.
 *
 * @module
 */
import { fromCaller } from "./caller.ts";
import { historyPath, historyTempPath } from "../history/paths.ts";
import { mayRelaunch, relaunch } from "./relaunch.ts";

/** `plumb run`'s arguments. */
export interface RunArgs {
  path: string;
  json: boolean;
  /** `--no-history`: record nothing, report nothing. */
  history: boolean;
  /** `--without-rows`: RUN-JSON without the per-row fields (`CellKind.rows`). */
  withoutRows: boolean;
  /** Set by the relaunch that may write the history (never typed by a user). */
  narrowed: boolean;
}

/**
 * Reads `plumb run`'s arguments.
 *
 * @param args Arguments after `run`.
 * @returns The arguments, or the line to print for a misuse.
 * @example
 * ```ts
 * import { parseRunArgs } from "./run_args.ts";
 * const a = parseRunArgs(["fade.md", "--json"]);
 * if (typeof a === "string" || !a.json || a.path !== "fade.md") throw new Error(String(a));
 * ```
 */
export function parseRunArgs(args: string[]): RunArgs | string {
  const a: RunArgs = { path: "", json: false, history: true, withoutRows: false, narrowed: false };
  const paths: string[] = [];
  for (const x of args) {
    if (x === "--json") a.json = true;
    else if (x === "--no-history") a.history = false;
    else if (x === "--without-rows") a.withoutRows = true;
    else if (x === "--narrowed") a.narrowed = true;
    else if (x.startsWith("-")) return `Unknown option "${x}"`;
    else paths.push(x);
  }
  if (paths.length !== 1) {
    return "Usage: plumb run <document.md> [--json] [--without-rows] [--no-history]";
  }
  a.path = paths[0];
  return a;
}

/**
 * The permissions of the relaunched `plumb run`: read, write the history file
 * and its temporary twin only, and start this Deno (calc cells' code is
 * checked and run in child processes, kernel/sandbox).
 *
 * @param hist The history file.
 * @returns Deno's permission flags.
 */
export function historyPermissions(hist: string): string[] {
  return [
    "--allow-read",
    `--allow-write=${hist},${historyTempPath(hist)}`,
    "--allow-env=LOG_TOKENS,LOG_STREAM,INIT_CWD",
    `--allow-run=${Deno.execPath()}`,
  ];
}

/**
 * Whether this process may write `path`.
 *
 * @param path A file.
 * @returns True when write leave for it is granted.
 */
export function mayWrite(path: string): boolean {
  return Deno.permissions.querySync({ name: "write", path }).state === "granted";
}

/**
 * Whether a run that records its history relaunches itself to write it: it may
 * not write the history file here, but may start this Deno.
 *
 * @param a The run's arguments.
 * @param hist The history file.
 * @returns True to relaunch with {@link historyPermissions}.
 */
export function relaunchesForHistory(a: RunArgs, hist: string): boolean {
  return a.history && !a.narrowed && !mayWrite(hist) && mayRelaunch();
}

/**
 * Relaunches `plumb run` with leave to write the history when it would relaunch
 * anyway (see the module notes), before anything else loads.
 *
 * @param args The command line (`run …`).
 * @param mainUrl The entry module.
 * @returns The relaunched process's exit status, or null: go on here.
 */
export async function relaunchEarly(args: string[], mainUrl: URL): Promise<number | null> {
  if (args[0] !== "run") return null;
  const a = parseRunArgs(args.slice(1));
  if (typeof a === "string") return null;
  const hist = historyPath(fromCaller(a.path));
  if (!relaunchesForHistory(a, hist)) return null;
  return await relaunch({ mainUrl }, historyPermissions(hist), [...args, "--narrowed"]);
}
