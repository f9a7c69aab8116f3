/**
 * Writing to a connection, and HTTP status lines.
 *
 * @module
 */

const REASONS: Record<number, string> = {
  101: "Switching Protocols",
  200: "OK",
  303: "See Other",
  304: "Not Modified",
  400: "Bad Request",
  401: "Unauthorized",
  403: "Forbidden",
  404: "Not Found",
  405: "Method Not Allowed",
  409: "Conflict",
  413: "Content Too Large",
  421: "Misdirected Request",
  422: "Unprocessable Content",
  426: "Upgrade Required",
  431: "Request Header Fields Too Large",
  500: "Internal Server Error",
  503: "Service Unavailable",
  507: "Insufficient Storage",
};

/**
 * The status line of a response.
 *
 * @param status The status code.
 * @returns E.g. `HTTP/1.1 404 Not Found`.
 * @example
 * ```ts
 * import { statusLine } from "./_http_write.ts";
 * if (statusLine(431) !== "HTTP/1.1 431 Request Header Fields Too Large") throw new Error();
 * ```
 */
export function statusLine(status: number): string {
  return `HTTP/1.1 ${status} ${REASONS[status] ?? "Status"}`;
}

/**
 * Writes byte arrays in full, in order.
 *
 * @param conn The connection.
 * @param parts The bytes.
 * @returns False when the connection failed or was closed meanwhile.
 */
export async function writeAll(conn: Deno.Conn, parts: Uint8Array[]): Promise<boolean> {
  try {
    for (const p of parts) {
      for (let off = 0; off < p.length;) off += await conn.write(p.subarray(off));
    }
    return true;
  } catch {
    return false;
  }
}
