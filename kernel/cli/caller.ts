/**
 * Where the user stands, and what went wrong with a file, in words.
 *
 * `deno task` runs its command in the repository (the folder of deno.json)
 * and says where it was typed in the environment variable `INIT_CWD`. The
 * tasks grant reading that one variable, so a path the user gives is
 * resolved from the user's folder, as any command line tool would; the
 * installed `plumb` runs where the user stands and is not given `INIT_CWD`.
 *
 * ```
 *  ~/work$ deno task --config ~/plumb/deno.json plumb run my.md
 *            task runs in ~/plumb, INIT_CWD=~/work  ─▶  ~/work/my.md
 *  ~/work$ plumb run my.md          (installed)      ─▶  ~/work/my.md
 * ```
 *
 * @module
 */
import { isAbsolute, resolve } from "node:path";

/**
 * The folder relative paths are resolved from: `INIT_CWD` when the command
 * may read it and it is an absolute path, else the working folder.
 *
 * @returns An absolute folder path.
 */
export function callerFolder(): string {
  const granted = Deno.permissions.querySync({ name: "env", variable: "INIT_CWD" }).state ===
    "granted";
  const init = granted ? Deno.env.get("INIT_CWD") : undefined;
  return init && isAbsolute(init) ? init : Deno.cwd();
}

/**
 * A path the user typed, made absolute from the user's folder.
 *
 * @param path The path as given.
 * @returns The absolute path (an absolute path is returned as it is, normalised).
 * @example
 * ```ts
 * import { fromCaller } from "./caller.ts";
 * if (fromCaller("/a/b/../c.md") !== "/a/c.md") throw new Error("not normalised");
 * ```
 */
export function fromCaller(path: string): string {
  return isAbsolute(path) ? resolve(path) : resolve(callerFolder(), path);
}

/**
 * A file system error in a few words for a one-line message (no OS error
 * number, no call site).
 *
 * @param err What was thrown.
 * @returns For example "no such file" or "permission denied".
 * @example
 * ```ts
 * import { fileTrouble } from "./caller.ts";
 * if (fileTrouble(new Deno.errors.NotFound("x")) !== "no such file") throw new Error();
 * ```
 */
export function fileTrouble(err: unknown): string {
  if (err instanceof Deno.errors.NotFound) return "no such file";
  if (err instanceof Deno.errors.PermissionDenied) return "permission denied";
  if (err instanceof Deno.errors.NotCapable) return "Plumb was not given permission";
  if (err instanceof Deno.errors.AlreadyExists) return "it exists";
  if (err instanceof Deno.errors.IsADirectory) return "a folder, not a file";
  if (err instanceof Deno.errors.NotADirectory) return "a part of the path is not a folder";
  const text = err instanceof Error ? err.message : String(err);
  if (/read-only file system/i.test(text)) return "read-only file system";
  return text.replace(/\s*\(os error \d+\).*$/s, "");
}

/**
 * Checks that a document exists and is a file.
 *
 * @param given The path as the user gave it (for the message).
 * @param path The absolute path.
 * @returns Null when it is a file, else the one-line message.
 */
export async function documentTrouble(given: string, path: string): Promise<string | null> {
  try {
    if ((await Deno.stat(path)).isFile) return null;
    return `Cannot read document "${given}": a folder, not a file`;
  } catch (err) {
    return `Cannot read document "${given}": ${fileTrouble(err)}`;
  }
}
