/**
 * The permissions `plumb serve` needs, and no more. The command relaunches
 * itself with these explicit lists (the cell computation runs in the
 * session's worker, which has none):
 *
 * | flag              | what for                                                    |
 * | ----------------- | ----------------------------------------------------------- |
 * | `--allow-read`    | the document's folder (document, data, watch); the repository (worker and kind modules, node_modules, the front end to bundle) |
 * | `--allow-write`   | the document's folder (atomic saves)                        |
 * | `--allow-net`     | `host:port` only (the listener)                             |
 * | `--allow-env`     | `LOG_TOKENS,LOG_STREAM`, read by the yaml package           |
 * | `--allow-run`     | this Deno binary only (and reading it): calc cells' code is checked and run in child processes of it with no permissions (kernel/sandbox) |
 *
 * The bundler (Deno.bundle) runs inside the runtime.
 *
 * @module
 */

/** The narrowed permission flags. */
export interface NarrowedFlags {
  read: string[];
  write: string[];
  net: string;
  env: string[];
}

/**
 * The permission lists for serving a document.
 *
 * @param docDir The document's folder (absolute).
 * @param repoDir The repository's folder (absolute).
 * @param host The address to bind.
 * @param port The port to bind.
 * @param deno The Deno binary that may be started (for calc cells); omitted: none.
 * @returns The lists, and `args` (the `--allow-*` flags, plus `--no-prompt`).
 * @example
 * ```ts
 * import { narrowedFlags } from "./permissions.ts";
 * const f = narrowedFlags("/d", "/r", "127.0.0.1", 8000);
 * if (f.args.join(" ") !== "--no-prompt --allow-read=/d,/r --allow-write=/d " +
 *   "--allow-net=127.0.0.1:8000 --allow-env=LOG_TOKENS,LOG_STREAM") throw new Error(f.args.join(" "));
 * ```
 */
export function narrowedFlags(
  docDir: string,
  repoDir: string,
  host: string,
  port: number,
  deno?: string,
): NarrowedFlags & { args: string[] } {
  const read = docDir === repoDir ? [docDir] : [docDir, repoDir];
  if (deno !== undefined) read.push(deno);
  const flags = {
    read,
    write: [docDir],
    net: `${host}:${port}`,
    env: ["LOG_TOKENS", "LOG_STREAM"],
  };
  const args = [
    "--no-prompt",
    `--allow-read=${flags.read.join(",")}`,
    `--allow-write=${flags.write.join(",")}`,
    `--allow-net=${flags.net}`,
    `--allow-env=${flags.env.join(",")}`,
    ...(deno === undefined ? [] : [`--allow-run=${deno}`]),
  ];
  return { ...flags, args };
}
