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
 * g⁻¹ is the expression language's one inverse of a response transform
 * (`responseInverse`, kernel/expr/response_inverse.ts), with its domain
 * policy: a value outside the range of g has no y (null here), an even
 * power is undone by the root ≥ 0. A transform it cannot undo (the column
 * used twice, `abs`, …) leaves every value null, with the reason.
 *
 * @module
 */
import { compileScalar, type Model, responseInverse } from "../../kernel/expr/mod.ts";

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
  /** g⁻¹: model scale → column value, or null when no finite value gives z. */
  inverse(z: number): number | null;
  /** Why g has no inverse at all, or null when it has one. */
  noInverse: string | null;
}

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
  const inv = responseInverse(model.response, column);
  const noInverse = "reason" in inv ? inv.reason : null;
  return {
    written,
    column,
    transformed,
    forward: (y) => g([y]),
    inverse: "reason" in inv ? () => null : (z) => {
      const y = inv(z);
      return Number.isFinite(y) ? y : null;
    },
    noInverse,
  };
}
