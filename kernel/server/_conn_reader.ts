/**
 * A buffered reader over one TCP connection, for the HTTP/1.1 layer: the
 * request head up to a size limit, then exact byte counts for bodies. What it
 * read past a head stays buffered for the body or the next request (or for
 * the WebSocket after an upgrade).
 *
 * @module
 */

/** The head did not fit in the limit (answered 431). */
export class HeadTooLarge extends Error {}

const CRLFCRLF = [13, 10, 13, 10];

/** Buffered reads from a connection. */
export class ConnReader {
  #buf = new Uint8Array(16 * 1024);
  #start = 0;
  #end = 0;

  /**
   * @param conn The connection.
   * @param onBytes Called whenever bytes arrive (the connection is alive).
   */
  constructor(readonly conn: Deno.Conn, readonly onBytes: () => void = () => {}) {}

  /** Bytes buffered and not yet taken. */
  get buffered(): number {
    return this.#end - this.#start;
  }

  /** Reads more bytes into the buffer; false at the end of the stream (or when closed). */
  async fill(): Promise<boolean> {
    if (this.#start > 0 && this.#start === this.#end) this.#start = this.#end = 0;
    if (this.#end === this.#buf.length) {
      const live = this.#buf.subarray(this.#start, this.#end);
      const next = live.length * 2 > this.#buf.length
        ? new Uint8Array(this.#buf.length * 2)
        : this.#buf;
      next.set(live);
      this.#buf = next;
      this.#end = live.length;
      this.#start = 0;
    }
    let n: number | null;
    try {
      n = await this.conn.read(this.#buf.subarray(this.#end));
    } catch {
      return false; // reset, or closed by a deadline
    }
    if (n === null) return false;
    this.#end += n;
    this.onBytes();
    return true;
  }

  /**
   * Reads up to and including the blank line that ends a request head.
   *
   * @param max The largest head in bytes.
   * @returns The head's bytes (without the blank line), or null at the end of the stream.
   * @throws {HeadTooLarge} When no blank line comes within `max` bytes.
   */
  async head(max: number): Promise<Uint8Array | null> {
    let scanned = 0; // bytes after #start already searched (fill may move #start to 0)
    for (;;) {
      const at = indexOf(this.#buf, CRLFCRLF, this.#start + scanned, this.#end);
      if (at >= 0) {
        const head = this.#buf.slice(this.#start, at);
        this.#start = at + 4;
        return head;
      }
      if (this.#end - this.#start > max) throw new HeadTooLarge();
      scanned = Math.max(0, this.#end - this.#start - 3);
      if (!(await this.fill())) return null;
    }
  }

  /**
   * Takes up to `n` buffered bytes, reading when none are buffered.
   *
   * @param n The most bytes wanted.
   * @returns The bytes (a copy), or null at the end of the stream.
   */
  async some(n: number): Promise<Uint8Array | null> {
    if (this.buffered === 0 && !(await this.fill())) return null;
    const k = Math.min(n, this.buffered);
    const out = this.#buf.slice(this.#start, this.#start + k);
    this.#start += k;
    return out;
  }

  /**
   * Takes exactly `n` bytes.
   *
   * @param n How many.
   * @returns The bytes, or null when the stream ends first.
   */
  async exactly(n: number): Promise<Uint8Array | null> {
    while (this.buffered < n) if (!(await this.fill())) return null;
    const out = this.#buf.slice(this.#start, this.#start + n);
    this.#start += n;
    return out;
  }

  /**
   * Takes one CRLF-terminated line (chunked bodies), without the CRLF.
   *
   * @param max The longest line.
   * @returns The line, or null at the end of the stream or past `max`.
   */
  async line(max: number): Promise<string | null> {
    for (;;) {
      const at = indexOf(this.#buf, [13, 10], this.#start, this.#end);
      if (at >= 0) {
        const text = new TextDecoder().decode(this.#buf.subarray(this.#start, at));
        this.#start = at + 2;
        return text;
      }
      if (this.buffered > max || !(await this.fill())) return null;
    }
  }
}

function indexOf(buf: Uint8Array, pat: number[], from: number, end: number): number {
  outer: for (let i = from; i + pat.length <= end; i++) {
    for (let j = 0; j < pat.length; j++) if (buf[i + j] !== pat[j]) continue outer;
    return i;
  }
  return -1;
}
