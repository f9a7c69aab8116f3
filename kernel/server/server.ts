/**
 * The live server: HTTP and WebSocket on one loopback port.
 *
 * ```
 *  serveConnections(127.0.0.1:port) (listener.ts: cap, timeouts, survives EMFILE)
 *     ─▶ checkRequest (Host, token cookie, Origin, CSRF)
 *     GET  /                  HTML shell (or the plain page without a front end)
 *     GET  /app.<hash>.js|css the bundle, immutable
 *     GET  /katex/<file>      KaTeX's stylesheet and fonts, from its package
 *     GET  /live              WebSocket: document, cell and run messages
 *     GET  /record            the static record of the latest run (record_route.ts)
 *     POST /api/cell[/new|/delete|/restore]  edits, applied only on the current version
 *  watchFolder(document's folder) ─▶ LiveWorkspace.request(changed paths)
 * ```
 *
 * @module
 */
import { dirname, extname, join, normalize, resolve, sep } from "node:path";
import type { Registry } from "../contract/mod.ts";
import type { Bundle } from "./bundle.ts";
import { Editor } from "./editor.ts";
import { allowedHosts, checkRequest, newToken } from "./guard.ts";
import { LiveWorkspace } from "./live_workspace.ts";
import { LiveChannel } from "./live_channel.ts";
import { type ConnectionLimits, serveConnections } from "./listener.ts";
import { upgradeWebSocket } from "./web_socket.ts";
import type { SaveHooks } from "./replace_if_unchanged.ts";
import { shellHtml } from "./shell.ts";
import { recordResponse } from "./record_route.ts";
import { removeStrayTemps } from "./stray_temps.ts";
import { historyPath, historyTempPath } from "../history/mod.ts";
import { watchFolder } from "./watch_folder.ts";

/** Options of {@link startServer}. */
export interface ServerOptions {
  /** The analysis document. */
  document: string;
  registry: Registry;
  /** The compute worker's entry module. */
  workerUrl: URL;
  /** Address to bind (default 127.0.0.1). */
  hostname?: string;
  /** Port (default 0: any free port). */
  port?: number;
  /** The built front end; null serves the plain page. */
  bundle?: Bundle | null;
  /** Folder of KaTeX's `dist` (stylesheet and fonts), or null. */
  katexDir?: string | null;
  /** Quiet time that ends a burst of file events, in ms (default 2, see watch_folder.ts). */
  debounceMs?: number;
  /** The largest edit request body in bytes (default 16 MiB, request_body.ts). */
  maxBodyBytes?: number;
  /** Test hooks of the save path (failure and race injection); none in production. */
  saveHooks?: SaveHooks;
  /** Connection cap, timeouts and slow-page limits (default listener.ts's DEFAULT_LIMITS). */
  connections?: Partial<ConnectionLimits>;
  /** The product's record module (`GET /record`), or none. */
  recordUrl?: URL;
}

/** A running live server. */
export interface LiveServer {
  /** The URL to open, token included. */
  url: string;
  hostname: string;
  port: number;
  token: string;
  workspace: LiveWorkspace;
  /** Resolves after the first run of the document. */
  ready: Promise<void>;
  /** Stops watching, closes every socket and the worker, and stops listening. */
  close(): Promise<void>;
}

const IMMUTABLE = "public, max-age=31536000, immutable";
const TYPES: Record<string, string> = {
  ".css": "text/css; charset=utf-8",
  ".woff2": "font/woff2",
  ".woff": "font/woff",
  ".ttf": "font/ttf",
};

/**
 * Starts serving a document: binds, runs it once, then watches its folder.
 *
 * @param opts The document, kinds, worker entry, address and front end.
 * @returns The running server.
 * @throws {Deno.errors.AddrInUse} When the port is taken.
 * @example
 * ```ts ignore
 * import { startServer } from "./server.ts";
 * import { registry } from "../../cells/mod.ts";
 * const s = await startServer({ document: "examples/fade/fade.md", registry,
 *   workerUrl: new URL("../../cells/worker.ts", import.meta.url) });
 * console.log(s.url);
 * await s.close();
 * ```
 */
export async function startServer(opts: ServerOptions): Promise<LiveServer> {
  const hostname = opts.hostname ?? "127.0.0.1";
  const token = newToken();
  const sockets = new LiveChannel(opts.connections);
  const workspace = new LiveWorkspace({
    path: opts.document,
    registry: opts.registry,
    workerUrl: opts.workerUrl,
    send: (msg) => sockets.broadcast(msg),
    sendMany: (msgs) => sockets.broadcastMany(msgs),
  });
  await workspace.readDisk(); // fail early on a missing document
  await removeStrayTemps(workspace.documentPath).catch(() => {}); // a crashed save's leftovers
  const ctx = { token, hosts: new Set<string>() };
  const editor = new Editor({ workspace, ...opts });
  const st = {
    bundle: opts.bundle ?? null,
    token,
    katex: opts.katexDir ?? null,
    recordUrl: opts.recordUrl ?? null,
  };
  const live = { sockets, workspace, editor };
  const server = serveConnections({
    hostname,
    port: opts.port ?? 0,
    limits: opts.connections,
    handler: (req) => checkRequest(req, ctx) ?? answer(req, st, live),
  });
  const port = server.addr.port;
  for (const h of allowedHosts(hostname, port)) ctx.hosts.add(h);
  const ready = workspace.request();
  // The run history beside the document is written after each run: not a change to run for.
  const own = new Set([historyPath(workspace.documentPath)]);
  own.add(historyTempPath([...own][0]));
  const watch = watchFolder(dirname(workspace.documentPath), (paths) => {
    for (const p of own) paths.delete(p);
    if (paths.size > 0) void workspace.request(paths);
  }, opts.debounceMs);
  return {
    url: `http://${hostname}:${port}/enter/${token}`,
    hostname,
    port,
    token,
    workspace,
    ready,
    async close() {
      watch.close();
      sockets.closeAll();
      await server.shutdown();
      await workspace.idle().catch(() => {});
      workspace.close();
    },
  };
}

interface Static {
  bundle: Bundle | null;
  token: string;
  katex: string | null;
  recordUrl: URL | null;
}

interface Live {
  sockets: LiveChannel;
  workspace: LiveWorkspace;
  editor: Editor;
}

/** Routes a request; an unexpected failure is answered in words, never as a bare 500. */
async function answer(req: Request, st: Static, live: Live): Promise<Response> {
  try {
    return await route(req, st, live);
  } catch (err) {
    const why = err instanceof Error ? err.message : String(err);
    const { pathname } = new URL(req.url);
    return new Response(`Cannot answer ${req.method} "${pathname}": ${why}\n`, {
      status: 500,
      headers: { "content-type": "text/plain; charset=utf-8" },
    });
  }
}

async function route(req: Request, st: Static, live: Live): Promise<Response> {
  const { pathname } = new URL(req.url);
  if (req.method === "POST" && pathname.startsWith("/api/cell")) {
    return await live.editor.handle(pathname, req);
  }
  if (req.method !== "GET" && req.method !== "HEAD") {
    return Response.json({ error: `Method ${req.method} not allowed` }, { status: 405 });
  }
  if (pathname === "/live") return openLive(req, live);
  if (pathname === "/record") {
    return await recordResponse(
      live.workspace.lastRun,
      live.workspace.documentPath,
      st.recordUrl,
    );
  }
  if (pathname === "/") {
    const nonce = newToken();
    return new Response(shellHtml(st.bundle, st.token, nonce), {
      headers: {
        "content-type": "text/html; charset=utf-8",
        "cache-control": "no-store",
        "content-security-policy": `default-src 'self'; script-src 'self' 'nonce-${nonce}'; ` +
          `style-src 'self' 'unsafe-inline'; img-src 'self' data:; font-src 'self' data:; ` +
          `connect-src 'self'; frame-ancestors 'none'`,
        "x-content-type-options": "nosniff",
      },
    });
  }
  const b = st.bundle;
  if (b && pathname === `/app.${b.hash}.js`) {
    return new Response(b.js, {
      headers: { "content-type": "text/javascript; charset=utf-8", "cache-control": IMMUTABLE },
    });
  }
  if (b?.css && pathname === `/app.${b.hash}.css`) {
    return new Response(b.css, {
      headers: { "content-type": "text/css; charset=utf-8", "cache-control": IMMUTABLE },
    });
  }
  if (st.katex && pathname.startsWith("/katex/")) return await katexFile(st.katex, pathname);
  return new Response("Not found\n", { status: 404 });
}

async function katexFile(dir: string, pathname: string): Promise<Response> {
  const root = resolve(dir);
  let name: string;
  try {
    name = decodeURIComponent(pathname.slice("/katex/".length));
  } catch {
    return new Response(`Malformed percent-encoding in the path "${pathname}"\n`, { status: 400 });
  }
  const file = normalize(join(root, name));
  const type = TYPES[extname(file)];
  if (!file.startsWith(root + sep) || !type) return new Response("Not found\n", { status: 404 });
  try {
    return new Response(await Deno.readFile(file), {
      headers: { "content-type": type, "cache-control": "public, max-age=86400" },
    });
  } catch {
    return new Response("Not found\n", { status: 404 });
  }
}

function openLive(req: Request, live: Live): Response {
  if (req.headers.get("upgrade")?.toLowerCase() !== "websocket") {
    return new Response("Expected a WebSocket upgrade\n", { status: 426 });
  }
  const { socket, response } = upgradeWebSocket(req);
  socket.onopen = () => live.sockets.open(socket, () => live.workspace.welcome(), req.url);
  socket.onclose = () => live.sockets.close(socket);
  socket.onerror = () => live.sockets.close(socket);
  return response;
}
