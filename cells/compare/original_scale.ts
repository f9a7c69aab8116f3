/**
 * A fit's response on the original scale: the response column's values on
 * the rows used, the log-Jacobian of the transform and its inverse.
 *
 * Method (change of variables; Box & Cox 1964, JRSS B 26:211–252, §2, for
 * comparing likelihoods across transforms of y): when the model is written
 * for z = g(y) with Gaussian errors, the density of y is that of z times
 * |g′(y)|, so
 *
 *   log L_y = log L_z + Σᵢ ln |g′(yᵢ)|,
 *
 * e.g. −Σ ln yᵢ for g = log. g′ is the symbolic derivative of the response
 * expression with respect to the response column (kernel/expr `derivative`),
 * evaluated on the rows. Weights do not change the Jacobian: they scale the
 * variance of z, not the map y ↦ z.
 *
 * A Fit keeps the transformed response z, not the column itself, so the
 * column's values are recovered as yᵢ = g⁻¹(zᵢ) (`responseInverse`,
 * kernel/expr/response_inverse.ts, with its domain policy) and checked by
 * evaluating g again.
 *
 * @module
 */
import { compile, derivative, type Expr, responseInverse } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import type { Fit } from "../fit/mod.ts";
import { rowList } from "../shared/rows.ts";

/** Relative gap allowed between g(g⁻¹(z)) and z (common practice, no source). */
const ROUND_TRIP_TOLERANCE = 1e-9;

/** The response of a fit on the scale of its column. */
export interface OriginalScale {
  /** Whether the response is written as a transform of the column (not the bare column). */
  transformed: boolean;
  /** The response column's values on the rows used. */
  values: Float64Array;
  /** Σ ln |g′(yᵢ)|: add to log L of the transformed response (0 for the bare column). */
  logJacobian: number;
  /** y = g⁻¹(z), for predictions made on the transformed scale. */
  inverse: (z: number) => number;
}

/**
 * The original scale of a fit's response.
 *
 * @param fit The fit.
 * @param cell The compare cell's name, for messages.
 * @param at Option path of the fit in the compare cell, for messages.
 * @returns Column values, log-Jacobian and inverse.
 * @throws {CellError} When the transform has no inverse here, the round trip
 *   does not reproduce the response, or g′ is zero or not finite on some rows.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { originalScale } from "./original_scale.ts";
 * import type { Fit } from "../fit/mod.ts";
 * const model = parseModel("log(y) = a + b*x", ["x", "y"]);
 * const fit = { model, responseText: "log(y)", y: Float64Array.from([1, 2].map(Math.log)),
 *   rows: Int32Array.from([1, 2]) } as unknown as Fit;
 * const o = originalScale(fit, "cmp", ["fits", 0]);
 * if (Math.abs(o.logJacobian + Math.log(2)) > 1e-15) throw new Error(String(o.logJacobian)); // −Σ ln y
 * ```
 */
export function originalScale(
  fit: Fit,
  cell: string,
  at: readonly (string | number)[],
): OriginalScale {
  const { response, responseColumn } = fit.model;
  if (response.op === "id" && response.name === responseColumn) {
    return { transformed: false, values: fit.y, logJacobian: 0, inverse: (z) => z };
  }
  const written = fit.responseText;
  const inverse = responseInverse(response, responseColumn);
  if ("reason" in inverse) {
    throw new CellError(
      `Cannot compare "${cell}": the response "${written}" cannot be undone to column "${responseColumn}": ` +
        "the criteria on the original scale need a one-to-one transform such as log(y), sqrt(y) or 1/y",
      at,
    );
  }
  const values = fit.y.map(inverse);
  checkRoundTrip(fit, values, response, cell, at);
  const d = derivative(response, responseColumn);
  const slope = evalOn(d, responseColumn, values);
  const bad: number[] = [];
  let logJacobian = 0;
  slope.forEach((s, i) => {
    const l = Math.log(Math.abs(s));
    if (Number.isFinite(l)) logJacobian += l;
    else bad.push(fit.rows[i]);
  });
  if (bad.length > 0) {
    throw new CellError(
      `Cannot compare "${cell}": the slope of the response "${written}" is 0 or not finite in ${
        rowList(bad)
      }: its log-likelihood has no original-scale value there`,
      at,
    );
  }
  return { transformed: true, values, logJacobian, inverse };
}

function evalOn(e: Expr, column: string, values: Float64Array): Float64Array {
  return compile(e, [column], [])([values], [], values.length);
}

function checkRoundTrip(
  fit: Fit,
  values: Float64Array,
  response: Expr,
  cell: string,
  at: readonly (string | number)[],
): void {
  const again = evalOn(response, fit.model.responseColumn, values);
  const bad: number[] = [];
  again.forEach((z, i) => {
    const want = fit.y[i];
    if (!(Math.abs(z - want) <= ROUND_TRIP_TOLERANCE * Math.max(1, Math.abs(want)))) {
      bad.push(fit.rows[i]);
    }
  });
  if (bad.length > 0) {
    throw new CellError(
      `Cannot compare "${cell}": the response "${fit.responseText}" could not be undone to column "${fit.model.responseColumn}" in ${
        rowList(bad)
      }`,
      at,
    );
  }
}
