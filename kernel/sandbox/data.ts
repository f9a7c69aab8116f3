/**
 * Data as it crosses into a child process: JSON text in which typed arrays
 * travel as `{"\u0000f64": base64 of their float64 bytes}` (NaN and the exact
 * doubles kept; plain JSON has neither), read back by `_child.js` and by
 * {@link decodeColumn}.
 *
 * @module
 */

/** The key that marks an encoded array. */
export const F64 = "\u0000f64";

function toBase64(bytes: Uint8Array): string {
  let bin = "";
  for (let i = 0; i < bytes.length; i += 8192) {
    bin += String.fromCharCode(...bytes.subarray(i, i + 8192));
  }
  return btoa(bin);
}

/**
 * JSON text of a value whose typed arrays are sent as float64 bytes.
 *
 * @param value Plain data with Float64Array / Int32Array where wanted.
 * @returns The JSON text.
 * @example
 * ```ts
 * import { decodeColumn, encodeData } from "./data.ts";
 * const text = encodeData({ y: new Float64Array([1.5, NaN]) });
 * const back = decodeColumn(JSON.parse(text).y);
 * if (back === null || back[0] !== 1.5 || !Number.isNaN(back[1])) throw new Error("round trip");
 * ```
 */
export function encodeData(value: unknown): string {
  return JSON.stringify(value, (_k, v) => {
    if (v instanceof Float64Array) {
      return { [F64]: toBase64(new Uint8Array(v.buffer, v.byteOffset, v.byteLength)) };
    }
    if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
      return {
        [F64]: toBase64(
          new Uint8Array(Float64Array.from(v as unknown as ArrayLike<number>).buffer),
        ),
      };
    }
    return v;
  });
}

/**
 * An encoded array back as Float64Array, or null when `v` is not one.
 *
 * @param v A value from parsed JSON.
 * @returns The array.
 */
export function decodeColumn(v: unknown): Float64Array | null {
  if (v === null || typeof v !== "object" || Array.isArray(v)) return null;
  const s = (v as Record<string, unknown>)[F64];
  if (typeof s !== "string") return null;
  const bin = atob(s);
  if (bin.length % 8 !== 0) return null;
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  return new Float64Array(bytes.buffer);
}
