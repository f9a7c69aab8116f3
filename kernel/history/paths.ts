/**
 * Where a document's run history lives: beside the document. A module of its
 * own, with nothing heavy behind it, so that `plumb run` can decide to
 * relaunch itself before it loads the rest (kernel/cli/run_args.ts).
 *
 * @module
 */
import { basename, dirname, extname, join } from "node:path";

/**
 * The history file of a document: beside it, its extension replaced by `.history.jsonl`.
 *
 * @param documentPath The document's file.
 * @returns The history file's path.
 * @example
 * ```ts
 * import { historyPath } from "./history_file.ts";
 * if (historyPath("/lab/fade.md") !== "/lab/fade.history.jsonl") throw new Error(historyPath("/lab/fade.md"));
 * ```
 */
export function historyPath(documentPath: string): string {
  const name = basename(documentPath);
  return join(
    dirname(documentPath),
    `${name.slice(0, name.length - extname(name).length)}.history.jsonl`,
  );
}

/**
 * The one temporary name a rewrite of the history uses, beside it: a fixed
 * name, so that leave to write it can be given ahead (a stale one from a
 * crash is overwritten).
 *
 * @param path The history file.
 * @returns `.<name>.tmp` in the same folder.
 * @example
 * ```ts
 * import { historyTempPath } from "./history_file.ts";
 * if (historyTempPath("/lab/fade.history.jsonl") !== "/lab/.fade.history.jsonl.tmp") throw new Error();
 * ```
 */
export function historyTempPath(path: string): string {
  return join(dirname(path), `.${basename(path)}.tmp`);
}
