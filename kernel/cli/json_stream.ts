/**
 * Writing a large JSON value to a stream as it is walked: the same text as
 * `JSON.stringify(value, null, 2)` (typed arrays as arrays, non-finite
 * numbers as null, `undefined` fields left out), without building the whole
 * string. A million-row fit's RUN-JSON is a few hundred MB of text: as one
 * string, `JSON.stringify` took 8–10 s and writing it 1 s more (issue 16);
 * here numbers go straight into one reused byte buffer that is flushed when
 * full.
 *
 * ```
 *  value ─walk─▶ small pieces (keys, scalars, short strings)  ─┐
 *        └─────▶ number arrays: blocks of 2,048 joined, encoded ┴─▶ 1 MiB buffer ─▶ sink
 * ```
 *
 * A block of whole numbers (row numbers: a quarter of a million-row check's
 * RUN-JSON) is written digit by digit straight into the buffer, without a
 * string a number (8 against 60 ns a number here); its text is `String`'s.
 *
 * @module
 */

/** Where the bytes go: `Deno.stdout`, a file, or a collector in tests. */
export interface ByteSink {
  write(bytes: Uint8Array): Promise<number>;
}

const CHUNK = 1 << 20;
/** Numbers joined into one string before encoding (about 50 KB of text). */
const NUMBER_BLOCK = 2048;

/** A byte buffer in front of a sink, written through when full. */
class Out {
  #buf = new Uint8Array(CHUNK);
  #at = 0;
  #enc = new TextEncoder();

  constructor(readonly sink: ByteSink) {}

  /** Appends ASCII or any text (encoded as UTF-8). */
  async text(s: string): Promise<void> {
    if (s.length * 3 > CHUNK - this.#at) {
      await this.flush();
      if (s.length * 3 > CHUNK) return await this.#all(this.#enc.encode(s));
    }
    this.#at += this.#enc.encodeInto(s, this.#buf.subarray(this.#at)).written;
  }

  /**
   * Appends `sep` and each of `v[from, to)`, which are all whole numbers of
   * magnitude below 2^31, as `String` writes them ("-0" is "0").
   */
  async ints(v: Indexed, from: number, to: number, sep: Uint8Array): Promise<void> {
    const most = (to - from) * (sep.length + 11);
    if (most > CHUNK - this.#at) await this.flush();
    const buf = this.#buf, digits = this.#digits;
    let at = this.#at;
    for (let k = from; k < to; k++) {
      for (let j = 0; j < sep.length; j++) buf[at++] = sep[j];
      let x = v[k] | 0; // an int32 from here on: x / 10 is an integer division (by multiplication)
      if (x < 0) {
        buf[at++] = 0x2d;
        x = -x;
      }
      let n = 0;
      do {
        const q = (x / 10) | 0;
        digits[n++] = 0x30 + x - 10 * q;
        x = q;
      } while (x > 0);
      while (n > 0) buf[at++] = digits[--n];
    }
    this.#at = at;
  }

  #digits = new Uint8Array(12);

  async flush(): Promise<void> {
    await this.#all(this.#buf.subarray(0, this.#at));
    this.#at = 0;
  }

  async #all(bytes: Uint8Array): Promise<void> {
    for (let at = 0; at < bytes.length;) at += await this.sink.write(bytes.subarray(at));
  }
}

type Indexed = ArrayLike<number> & { length: number };

function isNumberArray(v: unknown): v is Indexed {
  if (ArrayBuffer.isView(v)) {
    return !(v instanceof DataView || v instanceof BigInt64Array || v instanceof BigUint64Array);
  }
  if (!Array.isArray(v) || v.length < 64) return false;
  for (let i = 0; i < v.length; i++) if (typeof v[i] !== "number") return false;
  return true;
}

/** Whether every one of `v[from, to)` is a whole number of magnitude below 2^31. */
function smallInts(v: Indexed, from: number, to: number): boolean {
  for (let k = from; k < to; k++) {
    const x = v[k];
    if ((x | 0) !== x) return false; // NaN, ±Infinity, fractions and large values fail; −0 passes
  }
  return true;
}

/** A number as JSON writes it (non-finite: null). */
function numberText(x: number): string {
  return Number.isFinite(x) ? String(x) : "null";
}

/**
 * Writes `value` as `JSON.stringify(value, null, 2)` would, followed by a
 * line feed.
 *
 * @param value Plain data, typed arrays allowed anywhere.
 * @param sink Where the bytes go.
 * @example
 * ```ts
 * import { writeJson } from "./json_stream.ts";
 * const parts: Uint8Array[] = [];
 * await writeJson({ a: new Float64Array([1, NaN]) }, {
 *   write: (b) => (parts.push(b.slice()), Promise.resolve(b.length)),
 * });
 * const text = new TextDecoder().decode(new Uint8Array(parts.flatMap((p) => [...p])));
 * if (text !== '{\n  "a": [\n    1,\n    null\n  ]\n}\n') throw new Error(text);
 * ```
 */
export async function writeJson(value: unknown, sink: ByteSink): Promise<void> {
  const out = new Out(sink);
  await walk(value, "", out);
  await out.text("\n");
  await out.flush();
}

async function walk(v: unknown, indent: string, out: Out): Promise<void> {
  if (v === null || typeof v !== "object") {
    if (typeof v === "number") return out.text(numberText(v));
    return out.text(JSON.stringify(v) ?? "null");
  }
  const inner = indent + "  ";
  if (isNumberArray(v)) {
    if (v.length === 0) return out.text("[]");
    await out.text("[");
    // A block of numbers joined into one string, encoded natively (encodeInto): byte by byte
    // from JavaScript it was about twice as slow; an await per number cost a promise each.
    const sep = ",\n" + inner, sepBytes = new TextEncoder().encode(sep);
    await out.text("\n" + inner + numberText(v[0]));
    for (let i = 1; i < v.length; i += NUMBER_BLOCK) {
      const end = Math.min(v.length, i + NUMBER_BLOCK);
      // A block's text, at most 11 bytes a number after its separator, must fit the buffer.
      if ((sepBytes.length + 11) * NUMBER_BLOCK <= CHUNK && smallInts(v, i, end)) {
        await out.ints(v, i, end, sepBytes);
        continue;
      }
      let s = "";
      for (let k = i; k < end; k++) s += sep + numberText(v[k]);
      await out.text(s);
    }
    return out.text(`\n${indent}]`);
  }
  if (typeof (v as { toJSON?: unknown }).toJSON === "function") {
    return walk((v as { toJSON(): unknown }).toJSON(), indent, out);
  }
  if (Array.isArray(v)) {
    if (v.length === 0) return out.text("[]");
    await out.text("[");
    for (let i = 0; i < v.length; i++) {
      await out.text(`${i === 0 ? "\n" : ",\n"}${inner}`);
      const x = v[i];
      await walk(x === undefined || typeof x === "function" ? null : x, inner, out);
    }
    return out.text(`\n${indent}]`);
  }
  const entries = Object.entries(v).filter(([, x]) => x !== undefined && typeof x !== "function");
  if (entries.length === 0) return out.text("{}");
  await out.text("{");
  for (let i = 0; i < entries.length; i++) {
    const [k, x] = entries[i];
    await out.text(`${i === 0 ? "\n" : ",\n"}${inner}${JSON.stringify(k)}: `);
    await walk(x, inner, out);
  }
  await out.text(`\n${indent}}`);
}
