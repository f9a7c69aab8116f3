/**
 * The `plumb` command line.
 *
 * ```
 * plumb run <document.md> [--json]   run every cell headless (and record it in the run history)
 * plumb changes <document.md>        what changed since the previous data revision
 * plumb serve <document.md>          the live workspace in the browser
 * plumb new <document.md>            a new document with invented data beside it
 * plumb export <document.md>         its static record (HTML, or PDF with --pdf)
 * plumb help                         this text
 * ```
 *
 * Exit status (../shared/RUN-JSON.md): 0 when every cell is current, 1 when
 * any cell failed or is held, 2 for a usage error or an unreadable document
 * (and for `new`, a file it will not overwrite or a folder it cannot write).
 * Relative paths are resolved from the user's folder (`caller.ts`). Whatever
 * is thrown reaches the user as one line, never a stack trace.
 *
 * @module
 */
import type { Product } from "./product.ts";
import { newCommand } from "./new.ts";
import { runCommand } from "./run.ts";
import { serveCommand } from "./serve.ts";
import { exportCommand } from "./export.ts";
import { changesCommand } from "./changes.ts";

export type { Product };

const USAGE = `Plumb: fit models to measurements and judge them

Usage:
  plumb run <document.md> [--json]   run every cell of an analysis document and
              [--no-history]         record the run in its history beside it
  plumb changes <document.md>        what changed since the previous data revision
              [--json]               (or between any two records of the history)
              [--since T] [--until T]
  plumb serve <document.md>          open the live workspace: prints a URL to open
              [--port N] [--host H]  (default: a free port on 127.0.0.1)
  plumb new <document.md>            start an analysis: a document with one cell of
                                     each common kind, and invented data beside it
  plumb export <document.md>         write its record: one self-contained HTML file
              [-o <file>] [--pdf]    (default <document>.record.html beside it;
              [--paper a4|letter]    --pdf prints it through Chromium)
  plumb help                         show this text

Relative paths are taken from the folder you are in.

  --json   print the machine-readable result (RUN-JSON) on standard output`;

/**
 * Runs the command line with the given arguments.
 *
 * @param args Command-line arguments (without the program name).
 * @param product The kinds, the worker entry and the entry module.
 * @returns The exit status.
 */
export async function main(args: string[], product: Product): Promise<number> {
  try {
    return await dispatch(args, product);
  } catch (err) {
    console.error(`Plumb stopped: ${oneLine(err)}`);
    return 2;
  }
}

/** An error as one line: its message's first line, without Deno's call-site detail. */
function oneLine(err: unknown): string {
  const text = err instanceof Error ? err.message : String(err);
  return text.split("\n")[0].replace(/\s*\(os error \d+\)/, "");
}

async function dispatch(args: string[], product: Product): Promise<number> {
  const [command, ...rest] = args;
  if (command === undefined || command === "help" || command === "--help" || command === "-h") {
    console.log(USAGE);
    return command === undefined ? 2 : 0;
  }
  if (command === "run") return await runCommand(rest, product);
  if (command === "serve") return await serveCommand(rest, product);
  if (command === "new") return await newCommand(rest, product);
  if (command === "export") return await exportCommand(rest, product);
  if (command === "changes") return await changesCommand(rest, product);
  console.error(`Unknown command "${command}"\n\n${USAGE}`);
  return 2;
}
