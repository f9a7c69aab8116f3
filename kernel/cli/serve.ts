/**
 * `plumb serve <document.md> [--port N] [--host H]`: the live workspace.
 *
 * ```
 *  plumb serve doc.md                (may run, read, reach loopback)
 *     │ picks a free port, relaunches itself:
 *     ▼
 *  deno run --no-prompt --allow-read=<doc folder>,<repo>,<deno> --allow-write=<doc folder>
 *           --allow-net=127.0.0.1:<port> --allow-env=LOG_TOKENS,LOG_STREAM --allow-run=<deno>
 *           --unstable-bundle main.ts serve doc.md --port <port> --host <host> --narrowed
 *     │ bundles the page (product.pageUrl), binds, prints the URL, runs the document, watches its folder
 * ```
 *
 * Without permission to run Deno the command serves in its own process with
 * whatever permissions it was given.
 *
 * A relative document path is resolved from the user's folder (`caller.ts`);
 * the relaunched process is given the absolute path. `--default <doc>` names
 * a document served when none is given, resolved from the working folder:
 * `deno task start` serves the demo that way, and `deno task start my.md`
 * serves my.md.
 *
 * @module
 */
import { dirname, join, resolve } from "node:path";
import { fileURLToPath as fromFileUrl } from "node:url";
import { buildBundle, type Bundle, canBundle } from "../server/bundle.ts";
import { narrowedFlags } from "../server/permissions.ts";
import { startServer } from "../server/server.ts";
import { documentTrouble, fromCaller } from "./caller.ts";
import type { Product } from "./product.ts";

const REPO = fromFileUrl(new URL("../../", import.meta.url)).replace(/\/$/, "");
const USAGE = "Usage: plumb serve <document.md> [--port N] [--host H]";
const LOOPBACK = new Set(["127.0.0.1", "localhost"]);

interface ServeArgs {
  /** The document as given ("" when none was given and `fallback` is served). */
  document: string;
  /** `--default`: the document served when none is given. */
  fallback: string | null;
  port: number | null;
  host: string;
  narrowed: boolean;
}

/**
 * Reads the arguments of `plumb serve`.
 *
 * @param args Arguments after `serve`.
 * @returns The parsed arguments.
 * @throws {RangeError} For an unknown option, a bad port or a missing document.
 * @example
 * ```ts
 * import { parseServeArgs } from "./serve.ts";
 * const a = parseServeArgs(["doc.md", "--port", "8100"]);
 * if (a.port !== 8100 || a.host !== "127.0.0.1") throw new Error("unexpected");
 * ```
 */
export function parseServeArgs(args: string[]): ServeArgs {
  const out: ServeArgs = {
    document: "",
    fallback: null,
    port: null,
    host: "127.0.0.1",
    narrowed: false,
  };
  const paths: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === "--port") {
      const n = Number(args[++i]);
      if (!Number.isInteger(n) || n < 1 || n > 65535) {
        throw new RangeError(`Bad port "${args[i]}": a whole number from 1 to 65535`);
      }
      out.port = n;
    } else if (a === "--host") {
      if (!args[i + 1]) throw new RangeError(`Option "--host" needs an address`);
      out.host = args[++i];
    } else if (a === "--default") {
      if (!args[i + 1]) throw new RangeError(`Option "--default" needs a document`);
      out.fallback = args[++i];
    } else if (a === "--narrowed") out.narrowed = true;
    else if (a.startsWith("-")) throw new RangeError(`Unknown option "${a}"`);
    else paths.push(a);
  }
  if (paths.length > 1 || (paths.length === 0 && out.fallback === null)) {
    throw new RangeError(USAGE);
  }
  out.document = paths[0] ?? "";
  return out;
}

/**
 * Runs `plumb serve`: relaunches itself with narrowed permissions when it
 * may, then serves until interrupted.
 *
 * @param args Arguments after `serve`.
 * @param product The kinds, the worker entry and the entry module to relaunch.
 * @returns The exit status (2 for a usage error or an unreadable document).
 */
export async function serveCommand(args: string[], product: Product): Promise<number> {
  let a: ServeArgs;
  try {
    a = parseServeArgs(args);
  } catch (err) {
    console.error((err as Error).message);
    return 2;
  }
  const given = a.document || a.fallback!;
  const path = a.document ? fromCaller(a.document) : resolve(a.fallback!);
  const trouble = await documentTrouble(given, path) ??
    (a.port === null || a.narrowed ? null : listenTrouble(given, a.host, a.port));
  if (trouble) {
    console.error(trouble);
    return 2;
  }
  const mayRun = Deno.permissions.querySync({ name: "run", command: Deno.execPath() }).state ===
    "granted";
  if (!a.narrowed && mayRun) return await relaunch(a, path, product);
  return await serveHere(a, given, path, product);
}

/**
 * The server's V8 flags. A young generation of at most 8 MB a semi-space: a
 * live update of 10,000 rows makes a few MB of short-lived arrays in the
 * compute worker, and with V8's smallest sizes the worker stops to collect
 * them several times an update; larger sizes bought nothing on the latency
 * bench (8 against 32 MB, three runs each: p50 62-74 ms against 62-72 ms) but
 * cost memory under load (`deno task load`, 60 s: RSS growth 106 MB at 32 MB,
 * 66 MB at 8 MB; the young generation grows to its limit in both isolates).
 * The load suite starts its server with the same flags.
 */
export const SERVE_V8_FLAGS = "--v8-flags=--max-semi-space-size=8";

async function relaunch(a: ServeArgs, path: string, product: Product): Promise<number> {
  const port = a.port ?? freePort(a.host);
  const docDir = dirname(path);
  const flags = narrowedFlags(docDir, REPO, a.host, port, Deno.execPath());
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      `--config=${join(REPO, "deno.json")}`,
      "--unstable-bundle",
      SERVE_V8_FLAGS,
      ...flags.args,
      fromFileUrl(product.mainUrl),
      "serve",
      path,
      "--port",
      String(port),
      "--host",
      a.host,
      "--narrowed",
    ],
    stdin: "inherit",
    stdout: "inherit",
    stderr: "inherit",
  }).spawn();
  const stop = () => {
    try {
      child.kill("SIGTERM");
    } catch { /* already gone */ }
  };
  const signals: Deno.Signal[] = Deno.build.os === "windows" ? ["SIGINT"] : ["SIGINT", "SIGTERM"];
  for (const s of signals) Deno.addSignalListener(s, stop);
  const status = await child.status;
  for (const s of signals) Deno.removeSignalListener(s, stop);
  return status.code;
}

/** A free port on `host` (asked of the system, then released for the child to bind). */
function freePort(host: string): number {
  const l = Deno.listen({ hostname: host, port: 0 });
  const port = (l.addr as Deno.NetAddr).port;
  l.close();
  return port;
}

/** Why `host:port` cannot be listened on, in one line; null when it can. */
function listenTrouble(given: string, host: string, port: number): string | null {
  try {
    Deno.listen({ hostname: host, port }).close();
    return null;
  } catch (err) {
    return serveTrouble(given, host, port, err);
  }
}

/** The one line for a failure to serve: a port in use is said as such. */
function serveTrouble(given: string, host: string, port: number, err: unknown): string {
  if (err instanceof Deno.errors.AddrInUse || /address already in use/i.test(String(err))) {
    return `Cannot serve "${given}": port ${port} on ${host} is in use ` +
      `(choose another with --port, or leave --port out for a free one)`;
  }
  if (err instanceof Deno.errors.NotCapable) {
    return `Cannot serve "${given}" on "${host}:${port}": Plumb was not given permission ` +
      `to listen there`;
  }
  return `Cannot serve "${given}": ${(err as Error).message ?? String(err)}`;
}

async function serveHere(
  a: ServeArgs,
  given: string,
  path: string,
  product: Product,
): Promise<number> {
  if (!LOOPBACK.has(a.host)) {
    console.warn(
      `Warning: serving on "${a.host}", not only this computer: anyone who can reach it and ` +
        `learns the URL can read and change the analysis and its folder`,
    );
  }
  const bundle = await frontEnd(product.pageUrl);
  const katex = join(REPO, "node_modules", "katex", "dist");
  let server;
  try {
    server = await startServer({
      document: path,
      registry: product.registry,
      workerUrl: product.workerUrl,
      hostname: a.host,
      port: a.port ?? 0,
      bundle,
      katexDir: await exists(katex) ? katex : null,
      recordUrl: product.recordUrl,
    });
  } catch (err) {
    console.error(serveTrouble(given, a.host, a.port ?? 0, err));
    return 2;
  }
  console.log(`Plumb is serving ${given}\nOpen ${server.url}`);
  const stopped = Promise.withResolvers<void>();
  const stop = () => stopped.resolve();
  Deno.addSignalListener("SIGINT", stop);
  if (Deno.build.os !== "windows") Deno.addSignalListener("SIGTERM", stop);
  await stopped.promise;
  await server.close();
  return 0;
}

/** Bundles the page's entry module when it exists; null (the plain page) otherwise. */
async function frontEnd(page: URL): Promise<Bundle | null> {
  const entry = fromFileUrl(page);
  if (!(await exists(entry))) return null;
  if (!canBundle()) {
    console.warn("The front end is not bundled (run deno with --unstable-bundle): plain page");
    return null;
  }
  return await buildBundle(page);
}

async function exists(path: string): Promise<boolean> {
  try {
    await Deno.stat(path);
    return true;
  } catch {
    return false;
  }
}
