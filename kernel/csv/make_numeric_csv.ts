/**
 * A seeded generator of large numeric CSV files, written straight to bytes
 * (no giant string), for benchmarks and the large-file test.
 *
 * Random numbers: mulberry32 (Tommy Ettinger's 32-bit generator; common
 * practice, no source beyond its public description). The layout, chosen to
 * look like logged measurements: column `c0` is the row index; the other
 * columns hold decimals with up to 9 digits, 0–6 decimal places, one
 * in five negative, one in twenty in exponent form (`4.2517e-7`). About 100
 * bytes per row of 11 columns.
 *
 * @module
 */
import { mulberry32Uint as mulberry32 } from "../random.ts";

class ByteWriter {
  buf: Uint8Array;
  len = 0;
  private readonly digits = new Uint8Array(24);
  constructor(capacity: number) {
    this.buf = new Uint8Array(capacity);
  }
  ensure(extra: number): void {
    if (this.len + extra <= this.buf.length) return;
    const next = new Uint8Array(Math.max(this.buf.length * 2, this.len + extra));
    next.set(this.buf.subarray(0, this.len));
    this.buf = next;
  }
  byte(b: number): void {
    this.buf[this.len++] = b;
  }
  /** Writes a non-negative integer, with a decimal point before its last `point` digits. */
  int(n: number, point = 0): void {
    let k = 0;
    do {
      this.digits[k++] = 0x30 + (n % 10);
      n = Math.floor(n / 10);
    } while (n > 0 || k <= point);
    for (let i = k - 1; i >= 0; i--) {
      this.buf[this.len++] = this.digits[i];
      if (i === point && point > 0) this.buf[this.len++] = 0x2e;
    }
  }
}

/**
 * Makes a seeded numeric CSV: a header `c0,c1,…` and `rows` lines of `cols` numbers.
 *
 * @param rows Number of data rows.
 * @param cols Number of columns (at least 1).
 * @param seed Seed of the random numbers; equal seeds give equal bytes.
 * @returns The file's bytes (UTF-8, LF line ends, final line end).
 * @example
 * ```ts
 * import { makeNumericCsv } from "./make_numeric_csv.ts";
 * const text = new TextDecoder().decode(makeNumericCsv(2, 3, 7));
 * if (!text.startsWith("c0,c1,c2\n1,")) throw new Error("unexpected layout");
 * ```
 */
export function makeNumericCsv(rows: number, cols: number, seed: number): Uint8Array {
  const rand = mulberry32(seed);
  const w = new ByteWriter(64 + cols * 6 + Math.ceil(rows * cols * 10));
  const header = Array.from({ length: cols }, (_, c) => `c${c}`).join(",") + "\n";
  w.ensure(header.length);
  for (let i = 0; i < header.length; i++) w.byte(header.charCodeAt(i));
  for (let r = 1; r <= rows; r++) {
    w.ensure(cols * 16 + 16);
    w.int(r);
    for (let c = 1; c < cols; c++) {
      w.byte(0x2c);
      const u = rand();
      const sig = 3 + (u % 7); // significant digits
      const mant = rand() % 10 ** sig;
      if (u % 5 === 0) w.byte(0x2d);
      if ((u >>> 8) % 20 === 0) {
        // exponent form d.ddd e±x
        w.int(mant, Math.max(0, sig - 1));
        w.byte(0x65);
        const ex = ((u >>> 16) % 25) - 12;
        if (ex < 0) w.byte(0x2d);
        w.int(Math.abs(ex));
      } else {
        w.int(mant, (u >>> 12) % 7);
      }
    }
    w.byte(0x0a);
  }
  return w.buf.subarray(0, w.len);
}
