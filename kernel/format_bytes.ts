/**
 * Sizes for messages, in binary units (KiB, MiB, GiB), matching how limits
 * such as the default 512 MiB are set.
 *
 * @module
 */

/**
 * Formats a byte count: "812 bytes", "3.9 KiB", "512 MiB".
 *
 * @param bytes A size in bytes.
 * @returns A short human size; one decimal below 100 of a unit.
 * @example
 * ```ts
 * import { formatBytes } from "./format_bytes.ts";
 * if (formatBytes(512 * 2 ** 20) !== "512 MiB") throw new Error();
 * ```
 */
export function formatBytes(bytes: number): string {
  const units = ["bytes", "KiB", "MiB", "GiB", "TiB"];
  let v = bytes, u = 0;
  while (v >= 1024 && u < units.length - 1) {
    v /= 1024;
    u++;
  }
  return u === 0 ? `${v} bytes` : `${v >= 100 ? Math.round(v) : v.toFixed(1)} ${units[u]}`;
}
