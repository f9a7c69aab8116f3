/**
 * Byte-level record scanner for delimited text (RFC 4180 quoting), with
 * UTF-8 validation on the way.
 *
 * The scanner never builds strings: it reports each field as a byte range to
 * a {@link FieldSink}. Quoted fields are reported without their quotes;
 * `escaped` says the range still holds doubled quotes (`""`) to undo.
 *
 * ```
 *  bytes:  a , " b , "" c " \r\n 1 , 2 \n
 *          └┘  └──────────┘       └┘  └┘
 *        field 0   field 1 (quoted, escaped)   next record
 * ```
 *
 * Line ends: LF, CRLF or a lone CR. Blank lines (between records or at the
 * end) are skipped and are not records. UTF-8 is validated per Unicode §3.9,
 * Table 3-7 (well-formed byte sequences: no overlongs, no surrogates, nothing
 * above U+10FFFF).
 *
 * @module
 */
import type { DecimalParser } from "./decimal_parser.ts";
import { DelimitedError } from "./delimited_error.ts";

/** Receives the fields of one record. */
export interface FieldSink {
  /**
   * @param col 0-based field position in the record.
   * @param start First byte of the field's content.
   * @param end One past its last byte.
   * @param quoted The field was quoted (range excludes the quotes).
   * @param escaped The range contains doubled quotes.
   */
  field(col: number, start: number, end: number, quoted: boolean, escaped: boolean): void;
  /**
   * Fused parsing (optional): for fields of these columns the scanner first
   * tries to read a number while it looks for the field's end; when the
   * number fills the unquoted field it calls {@link FieldSink.number}
   * instead of `field`.
   */
  readonly numbers?: readonly boolean[];
  /** The parser used for fused parsing (its `lo` holds the correction). */
  readonly parser?: DecimalParser;
  /** Receives a number read by fused parsing. */
  number?(col: number, value: number): void;
}

/** Index after the well-formed UTF-8 sequence starting at `j`, or -1. */
function utf8Next(b: Uint8Array, j: number): number {
  const c = b[j], n = b.length;
  const cont = (k: number) => k < n && (b[k] & 0xc0) === 0x80;
  if (c < 0xc2) return -1;
  if (c < 0xe0) return cont(j + 1) ? j + 2 : -1;
  if (c < 0xf0) {
    const c1 = b[j + 1];
    const lo = c === 0xe0 ? 0xa0 : 0x80, hi = c === 0xed ? 0x9f : 0xbf;
    return j + 1 < n && c1 >= lo && c1 <= hi && cont(j + 2) ? j + 3 : -1;
  }
  if (c < 0xf5) {
    const c1 = b[j + 1];
    const lo = c === 0xf0 ? 0x90 : 0x80, hi = c === 0xf4 ? 0x8f : 0xbf;
    return j + 1 < n && c1 >= lo && c1 <= hi && cont(j + 2) && cont(j + 3) ? j + 4 : -1;
  }
  return -1;
}

/** Reads records one at a time from a byte buffer. */
export class Scanner {
  /** Next byte to read. */
  pos: number;
  /** Data row number of the record being read, 0 for the header (for messages). */
  row = 0;
  private readonly bytes: Uint8Array;
  private readonly delim: number;
  private readonly label: string;

  /**
   * @param bytes The whole file.
   * @param start Where to begin (after a BOM).
   * @param delim The delimiter's byte.
   * @param label The file's name for messages.
   */
  constructor(bytes: Uint8Array, start: number, delim: number, label: string) {
    this.bytes = bytes;
    this.pos = start;
    this.delim = delim;
    this.label = label;
  }

  /** Fraction of the buffer read so far. */
  progress(): number {
    return this.bytes.length === 0 ? 1 : this.pos / this.bytes.length;
  }

  private where(): string {
    return this.row === 0 ? "in the header" : `at row ${this.row}`;
  }

  private badUtf8(j: number): DelimitedError {
    const hex = this.bytes[j].toString(16).toUpperCase().padStart(2, "0");
    return new DelimitedError(
      `File "${this.label}" is not valid UTF-8: bad byte 0x${hex} ${this.where()} (byte ${j}); save it as UTF-8`,
      { row: this.row || null, offset: j },
    );
  }

  /**
   * Reads one record, passing its fields to `sink`.
   *
   * @param sink Receives the fields.
   * @returns The number of fields, or -1 at the end of the input.
   * @throws {DelimitedError} On invalid UTF-8, an unterminated quote or text after a closing quote.
   */
  next(sink: FieldSink): number {
    const b = this.bytes, n = b.length, D = this.delim;
    let i = this.pos;
    while (i < n && (b[i] === 0x0a || b[i] === 0x0d)) i++;
    if (i >= n) {
      this.pos = n;
      return -1;
    }
    const numbers = sink.numbers, parser = sink.parser;
    let col = 0;
    for (;;) {
      let j: number;
      if (b[i] === 0x22) {
        j = this.quoted(i, sink, col++);
      } else {
        if (numbers !== undefined && numbers[col] === true) {
          // Fused path: one pass over the bytes for the common unquoted number.
          const x = parser!.scan(b, i, n);
          j = parser!.stop;
          const c = j < n ? b[j] : D;
          if (x === x && (c === D || c === 0x0a || c === 0x0d)) {
            sink.number!(col++, x);
          } else {
            j = this.unquotedEnd(i);
            sink.field(col++, i, j, false, false);
          }
        } else {
          j = this.unquotedEnd(i);
          sink.field(col++, i, j, false, false);
        }
      }
      if (j >= n) {
        i = n;
        break;
      }
      const c = b[j];
      i = j + 1;
      if (c === D) continue;
      if (c === 0x0d && i < n && b[i] === 0x0a) i++;
      break;
    }
    this.pos = i;
    return col;
  }

  /** The end of an unquoted field starting at `i`, validating UTF-8 on the way. */
  private unquotedEnd(i: number): number {
    const b = this.bytes, n = b.length, D = this.delim;
    let j = i;
    while (j < n) {
      const c = b[j];
      if (c === D || c === 0x0a || c === 0x0d) break;
      if (c < 0x80) j++;
      else {
        const k = utf8Next(b, j);
        if (k < 0) throw this.badUtf8(j);
        j = k;
      }
    }
    return j;
  }

  /** Scans a quoted field opening at `i`; returns the index after the closing quote. */
  private quoted(i: number, sink: FieldSink, col: number): number {
    const b = this.bytes, n = b.length;
    let j = i + 1, escaped = false;
    for (;;) {
      if (j >= n) {
        throw new DelimitedError(
          `File "${this.label}" has a quote that is never closed ${this.where()} (byte ${i}): ` +
            `a quoted field must end with "`,
          { row: this.row || null, offset: i },
        );
      }
      const c = b[j];
      if (c === 0x22) {
        if (j + 1 < n && b[j + 1] === 0x22) {
          escaped = true;
          j += 2;
          continue;
        }
        break;
      }
      if (c < 0x80) j++;
      else {
        const k = utf8Next(b, j);
        if (k < 0) throw this.badUtf8(j);
        j = k;
      }
    }
    sink.field(col, i + 1, j, true, escaped);
    j++;
    if (j < n) {
      const c = b[j];
      if (c !== this.delim && c !== 0x0a && c !== 0x0d) {
        throw new DelimitedError(
          `File "${this.label}" has text after a closing quote ${this.where()} (byte ${j}): ` +
            `write a quote inside a quoted field as ""`,
          { row: this.row || null, offset: j },
        );
      }
    }
    return j;
  }
}
