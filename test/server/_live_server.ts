/**
 * A real `startServer` on 127.0.0.1 over a temporary folder, for the server
 * suites: the folder, the document's path, the cookie and a POST helper.
 *
 * @module
 */
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { sha256Hex } from "../../kernel/hash.ts";
import { type LiveServer, type ServerOptions, startServer } from "../../kernel/server/server.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);

/** What a test gets: the server, its folder, the document and the request headers' values. */
export interface Ctx {
  server: LiveServer;
  dir: string;
  doc: string;
  cookie: string;
  origin: string;
}

/** The folder a test serves: the document's bytes or text, and files beside it. */
export interface Folder {
  document: string | Uint8Array;
  files?: Record<string, string>;
  /** Server options other than the document, kinds and worker. */
  options?: Partial<ServerOptions>;
  /** Runs after the folder is written and before the server starts. */
  prepare?(dir: string, doc: string): Promise<void> | void;
}

/**
 * Serves a temporary folder for the duration of `fn`, then closes and removes it.
 *
 * @param folder The document and its files.
 * @param fn The test body.
 */
export async function withServer(folder: Folder, fn: (ctx: Ctx) => Promise<void>): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-serve-" });
  const doc = join(dir, "doc.md");
  const d = folder.document;
  await (typeof d === "string" ? Deno.writeTextFile(doc, d) : Deno.writeFile(doc, d));
  for (const [name, text] of Object.entries(folder.files ?? {})) {
    await Deno.writeTextFile(join(dir, name), text);
  }
  await folder.prepare?.(dir, doc);
  const server = await startServer({
    document: doc,
    registry,
    workerUrl: WORKER,
    bundle: null,
    debounceMs: 30,
    ...folder.options,
  });
  try {
    await server.ready;
    const origin = `http://127.0.0.1:${server.port}`;
    await fn({ server, dir, doc, cookie: `plumb_token=${server.token}`, origin });
  } finally {
    await server.close();
    await Deno.chmod(dir, 0o755).catch(() => {});
    await Deno.remove(dir, { recursive: true });
  }
}

/**
 * POSTs JSON (or a raw body) with the cookie and the token header.
 *
 * @param ctx The served folder.
 * @param path The endpoint.
 * @param body A value sent as JSON, or a string sent as it is.
 * @param headers Extra headers.
 * @returns The response.
 */
export const post = (
  ctx: Ctx,
  path: string,
  body: unknown,
  headers: Record<string, string> = {},
): Promise<Response> =>
  fetch(`${ctx.origin}${path}`, {
    method: "POST",
    headers: {
      cookie: ctx.cookie,
      "content-type": "application/json",
      "x-plumb-token": ctx.server.token,
      ...headers,
    },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });

/**
 * The version of a text or of bytes (hex SHA-256), as the server computes it.
 *
 * @param data Text (encoded as UTF-8) or bytes.
 * @returns The version.
 */
export const versionOf = async (data: string | Uint8Array): Promise<string> =>
  await sha256Hex(typeof data === "string" ? new TextEncoder().encode(data) : data);

/**
 * The names in a folder, less the run history the server keeps beside the
 * document after each run (kernel/history: `doc.history.jsonl` and its
 * temporary twin), which the save path never touches.
 *
 * @param dir The folder.
 * @returns Its entries' names, sorted.
 */
export const namesIn = async (dir: string): Promise<string[]> =>
  (await Array.fromAsync(Deno.readDir(dir))).map((e) => e.name)
    .filter((n) => !/^\.?doc\.history\.jsonl(\.tmp)?$/.test(n)).sort();
