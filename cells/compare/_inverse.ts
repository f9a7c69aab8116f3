/**
 * The inverse of a response transform, z = g(y), for getting back to the
 * response column's own values.
 *
 * Method: walk the tree of g from the root towards the one occurrence of the
 * column; every node on that path has one operand that holds the column and
 * one that is constant, so each step is undone by its inverse operation
 * (z = u + c ⇒ u = z − c, z = c/u ⇒ u = c/z, z = u^c ⇒ u = z^(1/c),
 * z = log u ⇒ u = eᶻ, …). Transforms that are not one-to-one in this way
 * (the column used twice, `abs`, trigonometric functions, `min`, `max`)
 * have no inverse here. An even power is undone by the non-negative root.
 *
 * @module
 */
import { compileScalar, type Expr, freeNames } from "../../kernel/expr/mod.ts";

/** u = inverse(z) for one step of the path. */
type Step = (z: number) => number;

/**
 * The inverse of `g` as a function of z, or null when g is not invertible
 * step by step (see the module notes).
 *
 * @param g The response expression (one column, no parameters).
 * @param column The column it is made of.
 * @returns y = g⁻¹(z), or null.
 * @example
 * ```ts
 * import { parseExpression } from "../../kernel/expr/mod.ts";
 * import { inverseOf } from "./_inverse.ts";
 * const inv = inverseOf(parseExpression("1/sqrt(y)"), "y")!;
 * if (Math.abs(inv(0.5) - 4) > 1e-15) throw new Error(String(inv(0.5)));
 * ```
 */
export function inverseOf(g: Expr, column: string): ((z: number) => number) | null {
  const steps: Step[] = [];
  let e = g;
  while (!(e.op === "id" && e.name === column)) {
    const next = undo(e, column, steps);
    if (next === null) return null;
    e = next;
  }
  return (z: number) => {
    let u = z;
    for (const s of steps) u = s(u);
    return u;
  };
}

const holds = (e: Expr, column: string) => freeNames(e).has(column);
const constant = (e: Expr) => compileScalar(e, [])([]);

const CALLS: Record<string, Step> = {
  log: (z) => Math.exp(z),
  log10: (z) => 10 ** z,
  exp: (z) => Math.log(z),
  sqrt: (z) => z * z,
  tanh: (z) => Math.atanh(z),
};

/** Pushes the inverse of node `e` and returns the operand holding the column. */
function undo(e: Expr, column: string, steps: Step[]): Expr | null {
  switch (e.op) {
    case "num":
    case "id":
      return null;
    case "neg":
      steps.push((z) => -z);
      return e.arg;
    case "call": {
      const inv = CALLS[e.fn];
      if (inv === undefined || e.args.length !== 1) return null;
      steps.push(inv);
      return e.args[0];
    }
    default: {
      const inLeft = holds(e.left, column), inRight = holds(e.right, column);
      if (inLeft === inRight) return null;
      const c = constant(inLeft ? e.right : e.left);
      if (!Number.isFinite(c)) return null;
      steps.push(binaryStep(e.op, c, inLeft));
      return inLeft ? e.left : e.right;
    }
  }
}

/** Inverse of z = u op c (column on the left) or z = c op u (on the right). */
function binaryStep(op: "+" | "-" | "*" | "/" | "^", c: number, left: boolean): Step {
  switch (op) {
    case "+":
      return (z) => z - c;
    case "-":
      return left ? (z) => z + c : (z) => c - z;
    case "*":
      return (z) => z / c;
    case "/":
      return left ? (z) => z * c : (z) => c / z;
    case "^":
      return left ? (z) => Math.sign(z) * Math.abs(z) ** (1 / c) : (z) => Math.log(z) / Math.log(c);
  }
}
