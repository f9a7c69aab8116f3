/**
 * The scale a `predict` cell reports on. A fit of a transformed response
 * (`log(y) = …`) is fitted on the model scale z = g(y); predictions are
 * reported on the original scale of y by back-transforming the estimate and
 * each interval end through g⁻¹.
 *
 * Why the ends map through: for a strictly monotone g, P(a ≤ z ≤ b) =
 * P(g⁻¹(a) ≤ y ≤ g⁻¹(b)) (or with the ends swapped for a decreasing g), so
 * the coverage is kept; the back-transformed estimate g⁻¹(ẑ) estimates the
 * median of y, not its mean, when the errors are symmetric on the model
 * scale (e.g. Draper & Smith, *Applied Regression Analysis*, 3rd ed., §13.2;
 * from memory). Standard errors stay on the model scale.
 *
 * g⁻¹ is found numerically, so any monotone transform the expression
 * language can write works: g is evaluated on a sign-symmetric logarithmic
 * grid y = 0, ±10^(k/4), k = −1200 … 1200; every pair of neighbouring grid
 * points where g − z changes sign is refined by bisection to adjacent
 * doubles, and a bracket is kept only when g there is within 1e-9·(1 + |z|)
 * of z (which discards the jump of g at a pole, as 1/y at 0). Exactly one
 * root is the answer; none or several (g not monotone, as y² over both
 * signs) give null.
 *
 * @module
 */
import { compileScalar, type Model } from "../../kernel/expr/mod.ts";

/** How a fit's response relates to the column it is made of. */
export interface ResponseScale {
  /** The response as written, e.g. "log(y)". */
  written: string;
  /** The column, e.g. "y". */
  column: string;
  /** Whether the response is a transform of the column (not the column itself). */
  transformed: boolean;
  /** g: column value → model scale. */
  forward(y: number): number;
  /** g⁻¹: model scale → column value, or null when there is no unique value. */
  inverse(z: number): number | null;
}

/** The grid of y values the inverse brackets roots on. */
const GRID: Float64Array = (() => {
  const pos: number[] = [];
  for (let k = -1200; k <= 1200; k++) pos.push(10 ** (k / 4));
  const neg = pos.map((v) => -v).reverse();
  return Float64Array.from([-Number.MAX_VALUE, ...neg, 0, ...pos, Number.MAX_VALUE]);
})();

/**
 * The response scale of a model.
 *
 * @param model The fit's model.
 * @returns g, g⁻¹ and names.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { responseScale } from "./response_scale.ts";
 * const s = responseScale(parseModel("log(y) = a + b*x", ["x", "y"]));
 * if (Math.abs(s.inverse(2)! - Math.exp(2)) > 1e-15 * Math.exp(2)) throw new Error("e²");
 * ```
 */
export function responseScale(model: Model): ResponseScale {
  const written = model.text.slice(model.response.start, model.response.end).trim();
  const column = model.responseColumn;
  const transformed = !(model.response.op === "id" && model.response.name === column);
  const g = compileScalar(model.response, [column]);
  const forward = (y: number) => g([y]);
  return {
    written,
    column,
    transformed,
    forward,
    inverse: transformed ? (z) => invert(forward, z) : (z) => z,
  };
}

function invert(g: (y: number) => number, z: number): number | null {
  if (!Number.isFinite(z)) return null;
  const roots: number[] = [];
  let a = NaN, ga = NaN;
  for (const b of GRID) {
    const gb = g(b) - z;
    if (!Number.isFinite(gb)) {
      a = NaN;
      continue;
    }
    if (gb === 0) roots.push(b);
    else if (Number.isFinite(ga) && ga !== 0 && (ga < 0) !== (gb < 0)) {
      const r = bisect(g, z, a, b, ga);
      if (Math.abs(g(r) - z) <= 1e-9 * (1 + Math.abs(z))) roots.push(r);
    }
    a = b;
    ga = gb;
  }
  return roots.length === 1 ? roots[0] : null;
}

/** Bisection on [a, b] (g(a) − z has sign of `ga`) until the midpoint is an end. */
function bisect(g: (y: number) => number, z: number, a: number, b: number, ga: number): number {
  for (let i = 0; i < 2200; i++) {
    const mid = a + (b - a) / 2;
    if (mid === a || mid === b) break;
    const gm = g(mid) - z;
    if (gm === 0) return mid;
    if ((gm < 0) === (ga < 0)) [a, ga] = [mid, gm];
    else b = mid;
  }
  return Math.abs(g(a) - z) <= Math.abs(g(b) - z) ? a : b;
}
