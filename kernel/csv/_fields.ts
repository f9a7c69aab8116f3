/**
 * Field-level helpers shared by the reader's passes: missing-value markers
 * and decoding a field's bytes to a string.
 *
 * @module
 */

import type { DecimalParser } from "./decimal_parser.ts";

const decoder = new TextDecoder("utf-8");
const encoder = new TextEncoder();

/** Marker byte strings, grouped for a quick length test. */
export class MissingMarkers {
  private readonly markers: Uint8Array[];
  private readonly maxLength: number;

  /** @param markers Texts that mean "no value" besides the empty field. */
  constructor(markers: readonly string[]) {
    this.markers = markers.map((m) => encoder.encode(m.trim())).filter((m) => m.length > 0);
    this.maxLength = this.markers.reduce((a, m) => Math.max(a, m.length), 0);
  }

  /**
   * Whether some marker reads as a number with `parser` (e.g. the sentinel "-999").
   *
   * @param parser The decimal parser in use.
   * @returns True when markers must be tested before numbers.
   */
  numeric(parser: DecimalParser): boolean {
    const saved = parser.wantLo;
    parser.wantLo = false;
    const any = this.markers.some((m) => !Number.isNaN(parser.parse(m, 0, m.length)));
    parser.wantLo = saved;
    return any;
  }

  /**
   * Whether `bytes[start, end)`, trimmed of spaces and tabs, is empty or a marker.
   *
   * @param bytes The buffer.
   * @param start First byte.
   * @param end One past the last byte.
   * @returns True for a missing value.
   */
  test(bytes: Uint8Array, start: number, end: number): boolean {
    let i = start, e = end;
    while (i < e && (bytes[i] === 0x20 || bytes[i] === 0x09)) i++;
    while (e > i && (bytes[e - 1] === 0x20 || bytes[e - 1] === 0x09)) e--;
    const len = e - i;
    if (len === 0) return true;
    if (len > this.maxLength) return false;
    outer: for (const m of this.markers) {
      if (m.length !== len) continue;
      for (let k = 0; k < len; k++) if (m[k] !== bytes[i + k]) continue outer;
      return true;
    }
    return false;
  }
}

/**
 * Decodes a field (already validated as UTF-8) and undoes doubled quotes.
 *
 * @param bytes The buffer.
 * @param start First byte.
 * @param end One past the last byte.
 * @param escaped The range contains doubled quotes.
 * @returns The field's text.
 */
export function decodeField(
  bytes: Uint8Array,
  start: number,
  end: number,
  escaped: boolean,
): string {
  let s: string;
  if (end - start <= 32) {
    s = "";
    let ascii = true;
    for (let i = start; i < end; i++) {
      const c = bytes[i];
      if (c >= 0x80) {
        ascii = false;
        break;
      }
      s += String.fromCharCode(c);
    }
    if (!ascii) s = decoder.decode(bytes.subarray(start, end));
  } else {
    s = decoder.decode(bytes.subarray(start, end));
  }
  return escaped ? s.replaceAll('""', '"') : s;
}
