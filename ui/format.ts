/**
 * Small words of the page: how long ago, a file's name. Numbers, durations
 * included, are formatted by cells/shared/format.ts, so they read alike in
 * the blocks and around them.
 *
 * @module
 */

/**
 * How long ago something happened, in words.
 *
 * @param then The time, ISO 8601.
 * @param now The current time in ms since the epoch.
 * @returns "just now", "40 s ago", "2 min ago", "3 h ago", or the date.
 * @example
 * ```ts
 * import { formatAge } from "./format.ts";
 * const now = Date.parse("2026-01-02T10:00:00Z");
 * if (formatAge("2026-01-02T09:58:00Z", now) !== "2 min ago") throw new Error("age");
 * ```
 */
export function formatAge(then: string, now: number): string {
  const t = Date.parse(then);
  if (Number.isNaN(t)) return "at an unknown time";
  const s = Math.max(0, (now - t) / 1000);
  if (s < 5) return "just now";
  if (s < 60) return `${Math.round(s)} s ago`;
  if (s < 3600) return `${Math.round(s / 60)} min ago`;
  if (s < 86400) return `${Math.round(s / 3600)} h ago`;
  return `on ${then.slice(0, 10)}`;
}

/**
 * The file name at the end of a path.
 *
 * @param path A path with `/` (or `\`) separators.
 * @returns Its last part.
 */
export function baseName(path: string): string {
  const parts = path.split(/[\\/]/);
  return parts[parts.length - 1] || path;
}
