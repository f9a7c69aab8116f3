/**
 * `deno task install [--root DIR]`: puts `plumb` on the PATH with
 * `deno install --global`, given the fewest permissions its commands need.
 *
 * | flag                        | what for                                              |
 * | --------------------------- | ----------------------------------------------------- |
 * | `--allow-read`              | documents and their data wherever they are; the code  |
 * | `--allow-net=127.0.0.1`     | `serve`: find a free port, see that a port is free    |
 * | `--allow-run=<this deno>`   | `serve` and `new` relaunch themselves with narrower lists |
 * | `--allow-env=LOG_TOKENS,LOG_STREAM` | read by the yaml package                      |
 * | `--no-prompt`               | a missing permission is a one-line error, never a question |
 *
 * No write permission: `plumb new` relaunches itself with write permission
 * for the target folder only, and `plumb serve` relaunches itself with write
 * permission for the document's folder only (kernel/server/permissions.ts);
 * `plumb run` writes nothing. No `INIT_CWD`: the installed command runs in
 * the folder the user stands in.
 *
 * `deno install` writes a shim that runs `deno` from the PATH. The shim is
 * rewritten to run the Deno that installed it: `--allow-run` names that
 * executable, and Deno may not be on the PATH at all (run through npx).
 * Installing again (after updating the checkout or Deno) replaces it.
 *
 * @module
 */
import { delimiter, join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { fromCaller } from "./caller.ts";

/** The installed command's name. */
export const NAME = "plumb";

/**
 * The permission flags of the installed command.
 *
 * @param deno The Deno executable the command will relaunch.
 * @returns The flags, in the order `deno install` writes them.
 * @example
 * ```ts
 * import { installedFlags } from "./install.ts";
 * const f = installedFlags("/opt/deno");
 * if (!f.includes("--allow-run=/opt/deno") || f.some((x) => x.startsWith("--allow-write"))) {
 *   throw new Error(f.join(" "));
 * }
 * ```
 */
export function installedFlags(deno: string): string[] {
  return [
    "--no-prompt",
    "--allow-read",
    "--allow-net=127.0.0.1",
    `--allow-run=${deno}`,
    "--allow-env=LOG_TOKENS,LOG_STREAM",
  ];
}

/** An environment variable when the installer may read it. */
function env(name: string): string | undefined {
  return Deno.permissions.querySync({ name: "env", variable: name }).state === "granted"
    ? Deno.env.get(name)
    : undefined;
}

/** Where `deno install --global` puts its shims: `--root`, DENO_INSTALL_ROOT or ~/.deno. */
function installRoot(root: string | null): string {
  if (root) return root;
  return env("DENO_INSTALL_ROOT") ?? join(env("HOME") ?? env("USERPROFILE") ?? ".", ".deno");
}

/**
 * Installs the command.
 *
 * @param args `<entry module> [--root DIR]`.
 * @returns The exit status.
 */
export async function install(args: string[]): Promise<number> {
  const [entry, ...rest] = args;
  const at = rest.indexOf("--root");
  const root = at >= 0 && rest[at + 1] ? fromCaller(rest[at + 1]) : null;
  if (!entry || (at >= 0 && !root) || rest.length !== (at >= 0 ? 2 : 0)) {
    console.error("Usage: deno task install [--root DIR]");
    return 2;
  }
  const deno = Deno.execPath();
  const repo = new URL("../../", import.meta.url);
  const out = await new Deno.Command(deno, {
    args: [
      "install",
      "--global",
      "--force",
      "--quiet",
      `--name=${NAME}`,
      `--config=${new URL("deno.json", repo).pathname}`,
      ...(root ? [`--root=${root}`] : []),
      ...installedFlags(deno),
      // The entry is named by the task, from the repository (the task's folder).
      pathToFileURL(resolve(entry)).href,
    ],
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  if (!out.success) {
    const text = new TextDecoder().decode(out.stderr);
    const why = text.split("\n").find((l) => /^error:/i.test(l)) ?? text.trim().split("\n")[0];
    console.error(`Cannot install "${NAME}": ${(why ?? "").replace(/^error:\s*/i, "")}`);
    return 1;
  }
  const bin = join(installRoot(root), "bin");
  const shim = join(bin, NAME);
  if (Deno.build.os !== "windows") {
    const text = await Deno.readTextFile(shim);
    const quoted = `'${deno.replaceAll("'", `'\\''`)}'`;
    await Deno.writeTextFile(shim, text.replace(/^exec deno /m, `exec ${quoted} `));
  }
  console.log(`Installed ${NAME} at ${shim}`);
  const onPath = (env("PATH") ?? "").split(delimiter).includes(bin);
  if (!onPath) console.log(`Add ${bin} to PATH, for example: export PATH="${bin}:$PATH"`);
  return 0;
}

if (import.meta.main) Deno.exit(await install(Deno.args));
