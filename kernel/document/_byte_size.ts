/**
 * Data sizes such as `512 MB` or `2 GiB`. Units follow IEC 80000-13: `kB`,
 * `MB`, `GB`, `TB` are powers of 1000 and `KiB`, `MiB`, `GiB`, `TiB` powers of
 * 1024 (common practice, no source beyond the standard's names). Units are
 * read case-insensitively; `B` or no unit means bytes.
 *
 * @module
 */
import { ownValue } from "../own.ts";

const UNITS: Record<string, number> = {
  "": 1,
  b: 1,
  kb: 1e3,
  mb: 1e6,
  gb: 1e9,
  tb: 1e12,
  kib: 2 ** 10,
  mib: 2 ** 20,
  gib: 2 ** 30,
  tib: 2 ** 40,
};

/**
 * The number of bytes a size denotes.
 *
 * @param value A positive number of bytes, or text like `512 MB`, `1.5GiB`.
 * @returns Whole bytes (rounded down), or `null` when `value` is not a positive size.
 */
export function byteSize(value: unknown): number | null {
  let bytes = NaN;
  if (typeof value === "number") bytes = value;
  else if (typeof value === "string") {
    const m = /^\s*(\d+(?:\.\d+)?|\.\d+)\s*([a-zA-Z]*)\s*$/.exec(value);
    const unit = m === null ? undefined : ownValue(UNITS, m[2].toLowerCase());
    if (m !== null && unit !== undefined) bytes = Number(m[1]) * unit;
  }
  if (!Number.isFinite(bytes) || bytes < 1 || bytes > Number.MAX_SAFE_INTEGER) return null;
  return Math.floor(bytes);
}
