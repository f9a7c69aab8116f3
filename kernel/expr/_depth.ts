/**
 * The bound on how deep an expression tree may be.
 *
 * Every pass over a tree (parse, resolve, simplify, derivative, code
 * generation, double-double evaluation, free names, format, linearity,
 * units) recurses once a level, and V8 refuses the generated row loop's
 * source when its parentheses nest a few thousand deep. Rather than make
 * each pass iterative, the parser refuses more than {@link MAX_NESTING}
 * nested parentheses, calls and powers (counted while parsing, before its
 * own recursion runs out; signs are read in a loop) and a tree deeper than {@link MAX_DEPTH}, where
 * each term of a sum or factor of a product counts one level (`a + b + c` is
 * `(a + b) + c`). Measured on two cores: every pass survives trees of 2,000
 * levels and code generation fails between 2,000 and 3,000. Nesting is held
 * lower because a derivative repeats the inner term at every level: the
 * derivative of 100 nested calls compiles in 86 ms, of 200 in 0.56 s, of 490
 * in 8 s (the cost grows as the cube).
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { at } from "./_lexer.ts";

/** Most parentheses, calls and powers one inside another. */
export const MAX_NESTING = 100;

/** Deepest expression tree accepted (a term of a sum or product counts one level). */
export const MAX_DEPTH = 500;

/** The error for nesting past {@link MAX_NESTING} at `start` (an offset in the text). */
export function tooNested(start: number, length: number): ExprError {
  return new ExprError(
    `Expression nests more than ${MAX_NESTING} parentheses, calls or powers at ${
      at(start)
    }: the limit is ${MAX_NESTING}`,
    start,
    length,
  );
}

function tooDeep(start: number, length: number): ExprError {
  return new ExprError(
    `Expression is more than ${MAX_DEPTH} levels deep at ${
      at(start)
    }: the limit is ${MAX_DEPTH}, ` +
      "a term of a sum or a factor of a product counting one level",
    start,
    length,
  );
}

function kids(e: Expr): readonly Expr[] {
  if (e.op === "num" || e.op === "id") return [];
  if (e.op === "neg") return [e.arg];
  if (e.op === "call") return e.args;
  return [e.left, e.right];
}

/**
 * Refuses a tree deeper than {@link MAX_DEPTH} (a loop with its own stack).
 *
 * @param e The tree.
 * @returns `e`.
 * @throws {ExprError} At the first node past the bound.
 */
export function checkDepth(e: Expr): Expr {
  const stack: [Expr, number][] = [[e, 1]];
  while (stack.length > 0) {
    const [node, depth] = stack.pop()!;
    if (depth > MAX_DEPTH) throw tooDeep(node.start, node.end - node.start);
    for (const k of kids(node)) stack.push([k, depth + 1]);
  }
  return e;
}
