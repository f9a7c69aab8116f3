/**
 * Writing expression trees back as text.
 *
 * @module
 */
import type { Expr } from "./expr.ts";

// Binding strength, loosest first; matches the grammar in _parser.ts.
const SUM = 1, PRODUCT = 2, UNARY = 3, ATOM = 5;

/** Least binding strength each operand needs to go without parentheses. */
const NEEDS: Record<string, [left: number, right: number]> = {
  "+": [SUM, PRODUCT],
  "-": [SUM, PRODUCT],
  "*": [PRODUCT, UNARY],
  "/": [PRODUCT, UNARY],
  // `^` is right-associative and its exponent may be signed; its base may not
  // be (`(-x)^2`), nor be a power itself (`(x^a)^b`).
  "^": [ATOM, UNARY],
};

function strength(e: Expr): number {
  switch (e.op) {
    case "num":
      return e.value < 0 || Object.is(e.value, -0) ? UNARY : ATOM;
    case "id":
    case "call":
      return ATOM;
    case "neg":
      return UNARY;
    case "+":
    case "-":
      return SUM;
    case "*":
    case "/":
      return PRODUCT;
    case "^":
      return 4;
  }
}

function number(v: number): string {
  if (Number.isNaN(v)) return "(0/0)";
  if (v === Infinity) return "1e999";
  if (v === -Infinity) return "-1e999";
  if (Object.is(v, -0)) return "-0";
  return String(v);
}

function operand(e: Expr, need: number): string {
  const s = format(e);
  return strength(e) < need ? `(${s})` : s;
}

/**
 * Writes `e` as text with the fewest parentheses that keep its structure:
 * `parseExpression(format(e))` gives back the same tree (spans aside). Binary
 * operators are spaced (`a * b + c`), powers are not (`x^2`).
 *
 * @param e Any tree.
 * @returns The text.
 * @example
 * ```ts
 * import { format, parseExpression } from "./mod.ts";
 * const s = format(parseExpression("((a*b))+(c) - (d - e1)"));
 * if (s !== "a * b + c - (d - e1)") throw new Error(s);
 * ```
 */
export function format(e: Expr): string {
  switch (e.op) {
    case "num":
      return number(e.value);
    case "id":
      return e.name;
    case "call":
      return `${e.fn}(${e.args.map(format).join(", ")})`;
    case "neg": {
      const s = operand(e.arg, UNARY);
      // "- -x", not "-(-x)": parentheses would count against the parser's nesting limit.
      return s.startsWith("-") ? `- ${s}` : `-${s}`;
    }
    default: {
      const [l, r] = NEEDS[e.op];
      const left = operand(e.left, l), right = operand(e.right, r);
      return e.op === "^" ? `${left}^${right}` : `${left} ${e.op} ${right}`;
    }
  }
}
