/**
 * The inverse of a transformed response: a model written for z = g(y)
 * (`log(y) = a + b*x`, `sqrt(y) = …`, `1/y = …`) predicts z; the original
 * scale needs y = g⁻¹(z). The one home of that inverse: `compare` (criteria
 * and cross-validation on the original scale), `chart` (curves and bands)
 * and `predict` (estimates and interval ends) all call it.
 *
 * Method: g is peeled from the outside in, one step at a time, down to the
 * bare column. Every node on the way has one operand that holds the column
 * and one that is a constant c (no column, no parameter), and each step is
 * undone by its inverse operation, applied to a value in the same order:
 *
 * ```
 *  log(y/2) ^ 3          v ──∛──▶ u₁ ──exp──▶ u₂ ──×2──▶ y
 *    "^" ─ 3
 *     │
 *    log      u₁ = ∛v,  u₂ = e^u₁,  y = 2·u₂
 *     │
 *    "/" ─ 2
 *     │
 *     y
 * ```
 *
 * Domain policy (one for every user): g⁻¹(v) is the y with g(y) = v when v
 * lies in the RANGE of g, and NaN (no y) when it does not. Step by step:
 *
 * | step of g        | its range                | inverse at v                 |
 * | ---------------- | ------------------------ | ---------------------------- |
 * | u + c, u − c, −u | all reals                | v − c, v + c, −v             |
 * | c·u, u/c (c ≠ 0) | all reals                | v/c, c·v                     |
 * | c/u (c ≠ 0)      | v ≠ 0                    | c/v                          |
 * | log u, log10 u   | all reals                | eᵛ, 10ᵛ                      |
 * | exp u, cᵘ        | v > 0                    | ln v, log_c v (c > 0, c ≠ 1) |
 * | sqrt u           | v ≥ 0                    | v²                           |
 * | uᵏ, k odd whole  | all reals (v ≠ 0, k < 0) | sign(v)·abs(v)^(1/k)         |
 * | uᵏ, other k ≠ 0  | v ≥ 0 (v > 0, k < 0)     | v^(1/k), the root ≥ 0        |
 * | atan u           | abs(v) < π/2             | tan v                        |
 * | tanh u           | abs(v) < 1               | atanh v                      |
 *
 * So y³ at −8 is −2 (odd powers are one-to-one on the reals), sqrt(y) at −2
 * is NaN (no y has a negative root), atan(y) at 2 is NaN. Even powers are
 * not one-to-one (y² = 4 for y = ±2): there u ≥ 0 is assumed, as the
 * earlier copies in `compare` and `chart` did, and the root ≥ 0 is the
 * answer (y² at 4 is 2, at −4 NaN); other non-integer powers are undefined
 * below 0 anyway (`Math.pow`). pow(u, c) and pow(c, u) are ^. Overflow
 * follows IEEE doubles (log(y) at 800 gives Infinity).
 *
 * No inverse at all (a reason instead): the column used more than once or
 * next to a parameter, a factor, divisor or power of 0, a base ≤ 0 or 1,
 * and functions that are not one-to-one (`abs`, `sin`, `cos`, `tan`, `min`,
 * `max`). Common practice, no source.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { freeNames } from "./free_names.ts";
import { compileScalar } from "./compile_scalar.ts";

/** A value on the model scale ↦ the response column's value; NaN outside the transform's range. */
export type ResponseInverse = (v: number) => number;

/** Why a response has no inverse. */
export interface NoInverse {
  /** Sentence fragment, e.g. `abs() of the response is not one-to-one`. */
  reason: string;
}

/**
 * The inverse of a response transform (see the module's domain policy), or
 * the reason there is none.
 *
 * @param response The response expression, e.g. `log(y)`.
 * @param column The column it is made of, e.g. `y`.
 * @returns g⁻¹ (the identity for the bare column), or `{ reason }`.
 * @example
 * ```ts
 * import { parseExpression, responseInverse } from "./mod.ts";
 * const inv = responseInverse(parseExpression("y^3"), "y");
 * if ("reason" in inv || inv(-8) !== -2) throw new Error("odd powers are one-to-one");
 * const root = responseInverse(parseExpression("sqrt(y)"), "y");
 * if ("reason" in root || !Number.isNaN(root(-2))) throw new Error("no y has sqrt(y) = -2");
 * ```
 */
export function responseInverse(response: Expr, column: string): ResponseInverse | NoInverse {
  const steps: ResponseInverse[] = [];
  let e = response;
  while (!(e.op === "id" && e.name === column)) {
    const step = peel(e, column);
    if ("reason" in step) return step;
    steps.push(step.invert);
    e = step.inner;
  }
  if (steps.length === 0) return (v) => v;
  return (v) => {
    let u = v;
    for (const s of steps) u = s(u);
    return u;
  };
}

type Step = { inner: Expr; invert: ResponseInverse } | NoInverse;

/** Inverses of one-argument functions, NaN outside their range. */
const UNARY: Record<string, ResponseInverse> = {
  log: Math.exp,
  log10: (v) => 10 ** v,
  exp: (v) => (v > 0 ? Math.log(v) : NaN),
  sqrt: (v) => (v >= 0 ? v * v : NaN),
  atan: (v) => (Math.abs(v) < Math.PI / 2 ? Math.tan(v) : NaN),
  tanh: (v) => (Math.abs(v) < 1 ? Math.atanh(v) : NaN),
};

/** One step: the operand holding the column and the inverse of the node around it. */
function peel(e: Expr, column: string): Step {
  switch (e.op) {
    case "num":
    case "id":
      return { reason: `the response does not reduce to column "${column}"` };
    case "neg":
      return { inner: e.arg, invert: (v) => -v };
    case "call":
      if (e.fn === "pow" && e.args.length === 2) {
        return peelBinary("^", e.args[0], e.args[1], column);
      }
      if (!Object.hasOwn(UNARY, e.fn) || e.args.length !== 1) {
        return { reason: `${e.fn}() of the response is not one-to-one` };
      }
      return { inner: e.args[0], invert: UNARY[e.fn] };
    default:
      return peelBinary(e.op, e.left, e.right, column);
  }
}

function peelBinary(op: string, left: Expr, right: Expr, column: string): Step {
  const inLeft = freeNames(left).has(column);
  const [inner, other] = inLeft ? [left, right] : [right, left];
  const c = constantValue(other);
  if (freeNames(other).has(column) || !Number.isFinite(c)) {
    return { reason: `the response uses column "${column}" more than once or with parameters` };
  }
  const invert = inLeft ? columnLeft(op, c) : columnRight(op, c);
  return typeof invert === "string" ? { reason: invert } : { inner, invert };
}

/** Inverse of v = u op c; a reason when there is none. */
function columnLeft(op: string, c: number): ResponseInverse | string {
  switch (op) {
    case "+":
      return (v) => v - c;
    case "-":
      return (v) => v + c;
    case "*":
      return c === 0 ? "the response is multiplied by 0" : (v) => v / c;
    case "/":
      return c === 0 ? "the response is divided by 0" : (v) => v * c;
    default: // "^"
      return c === 0 ? "the response is raised to the power 0" : rootOf(c);
  }
}

/** Inverse of v = c op u; a reason when there is none. */
function columnRight(op: string, c: number): ResponseInverse | string {
  switch (op) {
    case "+":
      return (v) => v - c;
    case "-":
      return (v) => c - v;
    case "*":
      return c === 0 ? "the response is multiplied by 0" : (v) => v / c;
    case "/":
      return c === 0 ? "the response is 0 divided by the column" : (v) => (v !== 0 ? c / v : NaN);
    default: // "^": v = cᵘ
      if (!(c > 0) || c === 1) return `the response is a power of ${c}, which is not one-to-one`;
      return (v) => (v > 0 ? logBase(c, v) : NaN);
  }
}

/** Inverse of v = uᵏ, k ≠ 0 (see the module's table). */
function rootOf(k: number): ResponseInverse {
  const odd = Number.isInteger(k) && Math.abs(k % 2) === 1;
  const root = k === 2 ? Math.sqrt : k === 3 ? Math.cbrt : (v: number) => v ** (1 / k);
  if (odd) return (v) => (k < 0 && v === 0 ? NaN : Math.sign(v) * root(Math.abs(v)));
  return (v) => (v > 0 || (v === 0 && k > 0) ? root(v) : NaN);
}

/** log_c v, exact for the bases written most (2, e, 10). */
function logBase(c: number, v: number): number {
  if (c === 10) return Math.log10(v);
  if (c === 2) return Math.log2(v);
  if (c === Math.E) return Math.log(v);
  return Math.log(v) / Math.log(c);
}

function constantValue(e: Expr): number {
  try {
    return compileScalar(e, [])([]);
  } catch {
    return NaN; // a parameter or a column: not a constant
  }
}
