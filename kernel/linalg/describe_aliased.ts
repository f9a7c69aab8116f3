/**
 * A message-ready phrase for an aliased column of a least-squares design.
 *
 * @module
 */
import type { AliasedColumn } from "./_aliasing.ts";

/**
 * Quoted names joined as `"a"`, `"a" and "b"` or `"a", "b" and "c"`.
 *
 * @param names The names.
 * @returns The joined list.
 * @example
 * ```ts
 * import { quotedList } from "./describe_aliased.ts";
 * if (quotedList(["x1", "x2"]) !== '"x1" and "x2"') throw new Error("unexpected");
 * ```
 */
export function quotedList(names: readonly string[]): string {
  const q = names.map((n) => `"${n}"`);
  return q.length <= 1 ? q.join("") : `${q.slice(0, -1).join(", ")} and ${q[q.length - 1]}`;
}

/**
 * Describes one aliased column, e.g. `column "x3" is a linear combination of
 * "x1" and "x2"`, ready to follow `Cannot fit "line": `.
 *
 * @param a One entry of a least-squares refusal's `aliasing`.
 * @param noun What to call a column (default "column").
 * @returns The phrase (sentence case is the caller's; no final period).
 * @example
 * ```ts
 * import { describeAliased } from "./describe_aliased.ts";
 * const s = describeAliased({ name: "x2", index: 1, of: ["x1"], coefficients: [2] });
 * if (s !== 'column "x2" is a multiple of "x1"') throw new Error(s);
 * ```
 */
export function describeAliased(a: AliasedColumn, noun = "column"): string {
  if (a.of.length === 0) return `${noun} "${a.name}" is zero in every row`;
  if (a.of.length === 1) return `${noun} "${a.name}" is a multiple of "${a.of[0]}"`;
  return `${noun} "${a.name}" is a linear combination of ${quotedList(a.of)}`;
}
