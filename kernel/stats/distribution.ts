/**
 * The shape every continuous distribution of kernel/stats has.
 *
 * Upper-tail functions are first-class: a p-value is `upper(t)`, computed
 * directly, never as `1 − cdf(t)`, so a p-value of 1e-300 is reported as a
 * number, not rounded to 0.
 *
 * @module
 */

/** A continuous distribution. */
export interface Distribution {
  /** P(X ≤ x). */
  cdf(x: number): number;
  /** P(X > x), relative-accurate when small. */
  upper(x: number): number;
  /** The probability density at x. */
  density(x: number): number;
  /** The x with P(X ≤ x) = p, for p in [0, 1]. */
  quantile(p: number): number;
  /** The x with P(X > x) = q, for q in [0, 1]; accurate for tiny q. */
  upperQuantile(q: number): number;
}

/**
 * Checks a probability argument.
 *
 * @param p The probability.
 * @param what Its role, for the message.
 * @throws {RangeError} When p is outside [0, 1] or NaN.
 */
export function checkProbability(p: number, what: string): void {
  if (!(p >= 0 && p <= 1)) {
    throw new RangeError(`${what} "${p}" is not a probability in [0, 1]`);
  }
}

/**
 * Checks a degrees-of-freedom argument.
 *
 * @param df The degrees of freedom.
 * @param what The distribution, for the message.
 * @throws {RangeError} When df is not a positive finite number.
 */
export function checkDf(df: number, what: string): void {
  if (!(df > 0) || !Number.isFinite(df)) {
    throw new RangeError(`Degrees of freedom "${df}" of the ${what} are not a positive number`);
  }
}
