/**
 * Reading an edit request's JSON body within a size limit. A body larger
 * than the limit is refused from its Content-Length before anything is read,
 * or as soon as the bytes read pass the limit (a chunked body), so a client
 * cannot make the server hold more than the limit. Nothing of the body is
 * ever sent back.
 *
 * @module
 */

/** Default largest request body: 16 MiB (a cell body, with room for inline rows). */
export const MAX_BODY_BYTES = 16 * 1024 * 1024;

/** A request the server refuses before looking at its content. */
export class BodyRefusal extends Error {
  override name = "BodyRefusal";
  /**
   * @param message What is wrong.
   * @param status 400 (not a JSON object) or 413 (too large).
   */
  constructor(message: string, readonly status: 400 | 413) {
    super(message);
  }
}

/**
 * Reads a request's body as a JSON object.
 *
 * @param req The request.
 * @param limit The largest body in bytes.
 * @returns The object.
 * @throws {BodyRefusal} 413 over the limit, 400 when it is not a UTF-8 JSON object.
 * @example
 * ```ts
 * import { readJsonObject } from "./request_body.ts";
 * const req = new Request("http://x/", { method: "POST", body: '{"a":1}' });
 * if ((await readJsonObject(req, 100)).a !== 1) throw new Error();
 * ```
 */
export async function readJsonObject(
  req: Request,
  limit = MAX_BODY_BYTES,
): Promise<Record<string, unknown>> {
  const bytes = await readLimited(req, limit);
  let value: unknown;
  try {
    value = JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
  } catch {
    value = null;
  }
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    throw new BodyRefusal("The request body must be a JSON object", 400);
  }
  return value as Record<string, unknown>;
}

async function readLimited(req: Request, limit: number): Promise<Uint8Array> {
  const tooLarge = () =>
    new BodyRefusal(
      `The request body is larger than ${sizeText(limit)}: edit a smaller piece at a time`,
      413,
    );
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (declared > limit) {
    await req.body?.cancel().catch(() => {});
    throw tooLarge();
  }
  if (!req.body) return new Uint8Array();
  const parts: Uint8Array[] = [];
  let size = 0;
  const reader = req.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.length;
    if (size > limit) {
      await reader.cancel().catch(() => {});
      throw tooLarge();
    }
    parts.push(value);
  }
  const out = new Uint8Array(size);
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

const sizeText = (bytes: number): string =>
  bytes % (1024 * 1024) === 0 ? `${bytes / (1024 * 1024)} MiB` : `${bytes} bytes`;
