/**
 * Back-transforming a fit's response: a fit of `log(capacity) = …` predicts
 * log(capacity); a chart of capacity needs exp of that.
 *
 * Method: the response is peeled from the outside in, one invertible step
 * at a time (`log u` ↦ exp v, `u + c` ↦ v − c, `u^c` ↦ v^(1/c), …, with c
 * free of the column), until the bare column is left; the steps, applied to
 * a value in reverse, invert the transform. Each step is strictly monotone
 * on its domain, so an interval [lo, hi] on the fitted scale maps to an
 * interval with its ends possibly swapped. Common practice, no source.
 *
 * @module
 */
import { compileScalar, type Expr, freeNames } from "../../kernel/expr/mod.ts";

/** A value on the fitted scale ↦ the column's value (NaN outside the transform's range). */
export type Inverse = (v: number) => number;

/**
 * The inverse of a response transform, or a reason why there is none.
 *
 * @param response The response expression (one column, no parameters).
 * @param column The column it is made of.
 * @returns The inverse, the identity for a bare column, or `{ reason }`.
 */
export function inverseOf(response: Expr, column: string): Inverse | { reason: string } {
  const steps: Inverse[] = [];
  let e = response;
  while (!(e.op === "id" && e.name === column)) {
    const step = peel(e, column);
    if ("reason" in step) return step;
    steps.push(step.invert);
    e = step.inner;
  }
  return (v: number) => {
    let out = v;
    for (const s of steps) out = s(out);
    return out;
  };
}

type Step = { inner: Expr; invert: Inverse } | { reason: string };

const UNARY: Record<string, Inverse> = {
  log: Math.exp,
  log10: (v) => 10 ** v,
  exp: Math.log,
  sqrt: (v) => (v >= 0 ? v * v : NaN),
  atan: (v) => (Math.abs(v) < Math.PI / 2 ? Math.tan(v) : NaN),
  tanh: Math.atanh,
};

function peel(e: Expr, column: string): Step {
  if (e.op === "neg") return { inner: e.arg, invert: (v) => -v };
  if (e.op === "call") {
    const inv = UNARY[e.fn];
    if (inv === undefined || e.args.length !== 1) {
      return { reason: `${e.fn}() of the response cannot be undone on a chart` };
    }
    return { inner: e.args[0], invert: inv };
  }
  if (e.op === "num" || e.op === "id") {
    return { reason: `the response does not reduce to column "${column}"` };
  }
  const leftHas = freeNames(e.left).has(column);
  const inner = leftHas ? e.left : e.right;
  const c = constantValue(leftHas ? e.right : e.left);
  if (freeNames(leftHas ? e.right : e.left).has(column) || !Number.isFinite(c)) {
    return { reason: `the response uses column "${column}" more than once or with parameters` };
  }
  const invert = binaryInverse(e.op, leftHas, c);
  return invert === null
    ? { reason: `the response transform is not invertible (a factor or power of 0)` }
    : { inner, invert };
}

function binaryInverse(op: string, columnLeft: boolean, c: number): Inverse | null {
  switch (op) {
    case "+":
      return (v) => v - c;
    case "-":
      return columnLeft ? (v) => v + c : (v) => c - v;
    case "*":
      return c === 0 ? null : (v) => v / c;
    case "/":
      return columnLeft ? (c === 0 ? null : (v) => v * c) : (v) => c / v;
    default: // "^"
      if (columnLeft) return c === 0 ? null : (v) => Math.pow(v, 1 / c);
      return c > 0 && c !== 1 ? (v) => Math.log(v) / Math.log(c) : null;
  }
}

function constantValue(e: Expr): number {
  try {
    return compileScalar(e, [])([]);
  } catch {
    return NaN;
  }
}
