/**
 * The `where` row filter: comparisons of two expressions over the columns,
 * joined by `and`, such as `temp >= 20 and flow < 3.5`. The expression
 * language itself has no comparisons, so this file splits the text at the
 * comparison operators and hands each side to it.
 *
 * A row is kept when every comparison holds; a comparison involving NaN (a
 * missing value) does not hold, so such rows are left out, and counted.
 *
 * @module
 */
import { compile, ExprError, parseColumnExpression } from "../../kernel/expr/mod.ts";
import { findId } from "./_find_id.ts";

/** A piece of the filter's text and where it starts in the whole. */
export interface Part {
  text: string;
  offset: number;
}

/** One comparison `left op right`. */
export interface Comparison {
  left: Part;
  op: "<" | "<=" | ">" | ">=" | "==" | "!=";
  right: Part;
}

const OPS = /<=|>=|==|!=|<|>|=/g;

/**
 * Splits a filter into comparisons.
 *
 * @param text The `where` text.
 * @returns The comparisons, in order.
 * @throws {ExprError} For a clause without exactly one comparison operator,
 *   or a lone `=` (offsets into `text`).
 */
export function splitComparison(text: string): Comparison[] {
  const out: Comparison[] = [];
  const clause = /\band\b/g;
  let start = 0;
  const ends = [...text.matchAll(clause)].map((m) => [m.index!, m.index! + 3]);
  ends.push([text.length, text.length]);
  for (const [stop, next] of ends) {
    const piece = text.slice(start, stop);
    const ops = [...piece.matchAll(OPS)];
    if (ops.length !== 1) {
      const at = ops.length === 0 ? start : start + ops[1].index!;
      throw new ExprError(
        ops.length === 0
          ? `Comparison "${piece.trim()}" has no operator: use <, <=, >, >=, == or !=`
          : `Comparison "${piece.trim()}" has more than one operator: join comparisons with and`,
        at,
        ops.length === 0 ? piece.length : ops[1][0].length,
      );
    }
    const m = ops[0];
    if (m[0] === "=") {
      throw new ExprError(`Comparison uses "=": write == to test equality`, start + m.index!, 1);
    }
    out.push({
      left: { text: piece.slice(0, m.index!), offset: start },
      op: m[0] as Comparison["op"],
      right: { text: piece.slice(m.index! + m[0].length), offset: start + m.index! + m[0].length },
    });
    start = next;
  }
  return out;
}

function side(
  part: Part,
  columns: readonly string[],
  text: readonly string[],
  cols: Float64Array[],
  n: number,
) {
  try {
    const e = parseColumnExpression(part.text, [...columns, ...text]);
    for (const t of text) {
      const at = findId(e, t);
      if (at !== null) {
        throw new ExprError(
          `Column "${t}" is text: a filter can compare only number columns`,
          at.start,
          t.length,
        );
      }
    }
    return compile(e, columns, [])(cols, [], n);
  } catch (err) {
    if (err instanceof ExprError) {
      throw new ExprError(err.message, err.offset + part.offset, err.length);
    }
    throw err;
  }
}

/**
 * Evaluates a filter over number columns.
 *
 * @param text The `where` text.
 * @param columns Names of the number columns.
 * @param cols Their values, in the same order.
 * @param n Number of rows.
 * @param textColumns Names of the text columns (named in an error when compared).
 * @returns One flag per row: 1 when the row passes.
 * @throws {ExprError} For a syntax error or an unknown column (offsets into `text`).
 */
export function evaluateWhere(
  text: string,
  columns: readonly string[],
  cols: Float64Array[],
  n: number,
  textColumns: readonly string[] = [],
): Uint8Array {
  const keep = new Uint8Array(n).fill(1);
  for (const c of splitComparison(text)) {
    const a = side(c.left, columns, textColumns, cols, n);
    const b = side(c.right, columns, textColumns, cols, n);
    for (let i = 0; i < n; i++) {
      const x = a[i], y = b[i];
      const ok = c.op === "<"
        ? x < y
        : c.op === "<="
        ? x <= y
        : c.op === ">"
        ? x > y
        : c.op === ">="
        ? x >= y
        : c.op === "=="
        ? x === y
        : x !== y && x === x && y === y;
      if (!ok) keep[i] = 0;
    }
  }
  return keep;
}
