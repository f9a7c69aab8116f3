/**
 * Lookups by a user's name that never reach `Object.prototype`.
 *
 * A column, cell, parameter or unit may be called `constructor`, `toString`,
 * `valueOf` or `hasOwnProperty`; on a plain object `units[name]` then answers
 * with a built-in function (which no worker message can carry) and `name in
 * units` is true for a name never given. Every lookup by a user's name goes
 * through {@link ownValue} / {@link hasOwnKey}, or through a `Map`.
 *
 * @module
 */

/**
 * The value `record` holds under `key` itself, never an inherited one.
 *
 * @param record A plain object keyed by user names (YAML options, a spec).
 * @param key The user's name.
 * @returns The own value, or undefined.
 * @example
 * ```ts
 * import { ownValue } from "./own.ts";
 * if (ownValue({ x: "s" }, "constructor") !== undefined) throw new Error("inherited");
 * if (ownValue({ x: "s" }, "x") !== "s") throw new Error("own");
 * ```
 */
export function ownValue<T>(record: Readonly<Record<string, T>>, key: string): T | undefined {
  return Object.hasOwn(record, key) ? record[key] : undefined;
}

/**
 * Whether `record` has `key` itself (what `key in record` means for user names).
 *
 * @param record A plain object keyed by user names.
 * @param key The user's name.
 * @returns True for an own key only.
 * @example
 * ```ts
 * import { hasOwnKey } from "./own.ts";
 * if (hasOwnKey({}, "toString")) throw new Error("inherited");
 * ```
 */
export function hasOwnKey(record: object, key: string): boolean {
  return Object.hasOwn(record, key);
}
