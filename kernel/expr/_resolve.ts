/**
 * Identifier resolution for the compilers: constants first, then columns
 * (values that change per row), then parameters (fixed for a call).
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import type { Resolved } from "./_codegen.ts";

type IdNode = Extract<Expr, { op: "id" }>;

/** Indexes of the columns and parameters a tree turned out to use. */
export interface Used {
  columns: Set<number>;
  params: Set<number>;
}

/**
 * A resolver for {@link generate}: column `k` becomes `x${k}`, parameter `k`
 * becomes `p${k}`, `pi` and `e` become `Math.PI` and `Math.E`.
 *
 * @param columns Names that vary per row.
 * @param params Names fixed for a call.
 * @param used Filled with the indexes that were resolved.
 * @param unknown Message tail for a name in neither list.
 */
export function resolver(
  columns: readonly string[],
  params: readonly string[],
  used: Used,
  unknown: string,
): (node: IdNode) => Resolved {
  return (node) => {
    if (node.name === "pi") return { code: "Math.PI", varies: false };
    if (node.name === "e") return { code: "Math.E", varies: false };
    const c = columns.indexOf(node.name);
    if (c >= 0) {
      used.columns.add(c);
      return { code: `x${c}`, varies: true };
    }
    const p = params.indexOf(node.name);
    if (p >= 0) {
      used.params.add(p);
      return { code: `p${p}`, varies: false };
    }
    throw new ExprError(
      `Unknown name "${node.name}": ${unknown}`,
      node.start,
      node.end - node.start,
    );
  };
}

/** The used indexes in increasing order. */
export function sorted(s: Set<number>): number[] {
  return [...s].sort((a, b) => a - b);
}
