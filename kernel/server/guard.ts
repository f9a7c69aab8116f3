/**
 * The live server's front door: who may talk to it.
 *
 * ```
 *  request ─▶ Host allowed? ──no──▶ 421 (DNS rebinding: a page on a foreign
 *              │                        name resolving to 127.0.0.1)
 *              ▼
 *           /enter/T   ──T right──▶ 303 to /, Set-Cookie plumb_token=T
 *              │                    (HttpOnly, SameSite=Strict)
 *              ▼
 *           cookie right? ──no──▶ 401
 *              ▼
 *           WebSocket: Origin is ours? ──no──▶ 403
 *           POST: no foreign Origin, and X-Plumb-Token right or Origin ours? ──no──▶ 403
 * ```
 *
 * @module
 */
import { TOKEN_COOKIE, TOKEN_HEADER } from "./protocol.ts";

/** The path that exchanges the printed key for the cookie: `/enter/<token>`. */
export const ENTER = "/enter/";

/** What the guard knows about the server it protects. */
export interface GuardContext {
  token: string;
  /** Host header values accepted, e.g. `127.0.0.1:8123`, `localhost:8123`. */
  hosts: ReadonlySet<string>;
}

/**
 * A new random 128-bit token, as 32 lower-case hex digits.
 *
 * @returns The token.
 * @example
 * ```ts
 * import { newToken } from "./guard.ts";
 * if (!/^[0-9a-f]{32}$/.test(newToken())) throw new Error("bad token");
 * ```
 */
export function newToken(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("");
}

/**
 * Compares two strings in time independent of where they differ.
 *
 * @param a One string.
 * @param b The other.
 * @returns Whether they are equal.
 * @example
 * ```ts
 * import { sameSecret } from "./guard.ts";
 * if (!sameSecret("ab", "ab") || sameSecret("ab", "ac")) throw new Error("wrong");
 * ```
 */
export function sameSecret(a: string, b: string): boolean {
  if (a.length !== b.length) return false;
  let diff = 0;
  for (let i = 0; i < a.length; i++) diff |= a.charCodeAt(i) ^ b.charCodeAt(i);
  return diff === 0;
}

/**
 * The Host header values a server bound to `host:port` answers to.
 *
 * @param host The bound address.
 * @param port The bound port.
 * @returns `127.0.0.1:port`, `localhost:port` and `host:port`.
 * @example
 * ```ts
 * import { allowedHosts } from "./guard.ts";
 * if (!allowedHosts("127.0.0.1", 80).has("localhost:80")) throw new Error("missing");
 * ```
 */
export function allowedHosts(host: string, port: number): Set<string> {
  return new Set([`127.0.0.1:${port}`, `localhost:${port}`, `${host}:${port}`]);
}

/**
 * Reads one cookie from a request.
 *
 * @param req The request.
 * @param name The cookie's name.
 * @returns Its value, or null.
 * @example
 * ```ts
 * import { readCookie } from "./guard.ts";
 * const req = new Request("http://x/", { headers: { cookie: "a=1; plumb_token=t" } });
 * if (readCookie(req, "plumb_token") !== "t") throw new Error("not found");
 * ```
 */
export function readCookie(req: Request, name: string): string | null {
  const header = req.headers.get("cookie") ?? "";
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return null;
}

const refuse = (status: number, message: string, json: boolean): Response =>
  json
    ? Response.json({ error: message }, { status })
    : new Response(`<!doctype html><title>Plumb</title><p>${message}</p>\n`, {
      status,
      headers: { "content-type": "text/html; charset=utf-8" },
    });

/**
 * Checks a request against the token, Host and Origin rules.
 *
 * @param req The request.
 * @param ctx The token and accepted hosts.
 * @returns A response to send instead (refusal or the token exchange), or null to go on.
 * @example
 * ```ts
 * import { checkRequest } from "./guard.ts";
 * const ctx = { token: "t", hosts: new Set(["127.0.0.1:9"]) };
 * const foreign = new Request("http://evil.example:9/", { headers: { host: "evil.example:9" } });
 * if (checkRequest(foreign, ctx)?.status !== 421) throw new Error("let in");
 * ```
 */
export function checkRequest(req: Request, ctx: GuardContext): Response | null {
  const url = new URL(req.url);
  const json = url.pathname.startsWith("/api/");
  const host = req.headers.get("host") ?? "";
  if (!ctx.hosts.has(host.toLowerCase())) {
    return refuse(421, `Host "${host}" is not this server: open the printed URL`, json);
  }
  const given = url.pathname.startsWith(ENTER) ? url.pathname.slice(ENTER.length) : null;
  if (given !== null && req.method === "GET") {
    if (!sameSecret(given, ctx.token)) {
      return refuse(401, "Wrong token: open the printed URL", json);
    }
    return new Response(null, {
      status: 303,
      headers: {
        location: "/",
        "set-cookie": `${TOKEN_COOKIE}=${ctx.token}; HttpOnly; SameSite=Strict; Path=/`,
        "cache-control": "no-store",
      },
    });
  }
  const cookie = readCookie(req, TOKEN_COOKIE);
  if (cookie === null || !sameSecret(cookie, ctx.token)) {
    return refuse(401, "Missing or wrong token: open the URL printed by plumb serve", json);
  }
  const origin = req.headers.get("origin");
  const ours = origin !== null && origin === `http://${host.toLowerCase()}`;
  if (req.headers.get("upgrade")?.toLowerCase() === "websocket" && !ours) {
    return refuse(403, `Origin "${origin}" may not open the live channel`, json);
  }
  if (req.method !== "GET" && req.method !== "HEAD") {
    const header = req.headers.get(TOKEN_HEADER);
    const tokenOk = header !== null && sameSecret(header, ctx.token);
    if ((origin !== null && !ours) || (!ours && !tokenOk)) {
      return refuse(
        403,
        `A ${req.method} needs the ${TOKEN_HEADER} header or the page's Origin`,
        json,
      );
    }
  }
  return null;
}
