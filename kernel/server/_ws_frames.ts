/**
 * Reading one WebSocket frame from a client (RFC 6455 §5.2): every client
 * frame is masked; control frames carry at most 125 bytes and are never
 * fragmented. Fragments of a data message are joined here.
 *
 * @module
 */
import type { ConnReader } from "./_conn_reader.ts";

/** A whole message or control frame. */
export interface Frame {
  opcode: number;
  payload: Uint8Array;
}

/**
 * Reads the next message or control frame.
 *
 * @param reader The connection's reader.
 * @param max The largest message.
 * @returns The frame; null at the end of the stream; "too large" or "malformed".
 */
export async function readFrame(
  reader: ConnReader,
  max: number,
): Promise<Frame | null | "too large" | "malformed"> {
  const parts: Uint8Array[] = [];
  let opcode = -1;
  let total = 0;
  for (;;) {
    const h = await reader.exactly(2);
    if (h === null) return null;
    const fin = (h[0] & 0x80) !== 0;
    const op = h[0] & 0x0f;
    if ((h[1] & 0x80) === 0) return "malformed"; // clients must mask
    let n = h[1] & 0x7f;
    if (n >= 126) {
      const ext = await reader.exactly(n === 126 ? 2 : 8);
      if (ext === null) return null;
      const v = new DataView(ext.buffer);
      n = n === 126 ? v.getUint16(0) : Number(v.getBigUint64(0));
    }
    if (op >= 8 && (n > 125 || !fin)) return "malformed";
    if (total + n > max) return "too large";
    const mask = await reader.exactly(4);
    const payload = mask && await reader.exactly(n);
    if (!mask || !payload) return null;
    for (let i = 0; i < n; i++) payload[i] ^= mask[i & 3];
    if (op >= 8) return { opcode: op, payload }; // control frames may come between fragments
    if (opcode === -1) {
      if (op === 0) return "malformed";
      opcode = op;
    } else if (op !== 0) return "malformed";
    parts.push(payload);
    total += n;
    if (fin) break;
  }
  const payload = new Uint8Array(total);
  let off = 0;
  for (const p of parts) (payload.set(p, off), off += p.length);
  return { opcode, payload };
}
