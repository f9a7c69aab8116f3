/**
 * Weighted sums of squares about the (weighted) mean, for R².
 *
 * Method: the corrected two-pass algorithm (Chan, Golub & LeVeque 1983,
 * "Algorithms for computing the sample variance", Am. Statistician 37; from
 * memory), extended to weights by West 1979 ("Updating mean and variance
 * estimates", CACM 22; from memory): first the weighted mean, corrected by
 * the weighted mean of the deviations, then Σ wᵢ(yᵢ − ȳ_w)². Exactly 0 for a
 * constant y.
 *
 * @module
 */

/**
 * Σwᵢ(yᵢ − ȳ_w)² (centred) or Σwᵢyᵢ² (uncentred); wᵢ = 1 when weights are null.
 *
 * @param y The response on the rows used.
 * @param w Weights, or null.
 * @param centred About the weighted mean (true) or about 0.
 * @returns The total sum of squares.
 * @example
 * ```ts
 * import { totalSum } from "./_sums.ts";
 * // (1 − 2)² + (3 − 2)² = 2 (hand computation).
 * if (totalSum(new Float64Array([1, 3]), null, true) !== 2) throw new Error();
 * ```
 */
export function totalSum(y: Float64Array, w: Float64Array | null, centred: boolean): number {
  if (!centred) {
    let s = 0;
    for (let i = 0; i < y.length; i++) s += (w ? w[i] : 1) * y[i] * y[i];
    return s;
  }
  if (y.every((v) => v === y[0])) return 0;
  const m = weightedMean(y, w);
  let ss = 0;
  for (let i = 0; i < y.length; i++) ss += (w ? w[i] : 1) * (y[i] - m) * (y[i] - m);
  return ss;
}

/**
 * Σwᵢ(ŷᵢ − ȳ_w)² (centred, ȳ_w the weighted mean of the observed y) or
 * Σwᵢŷᵢ² (uncentred): the explained sum computed directly, for fits where
 * TSS − RSS is not it (nonlinear).
 *
 * @param fitted Fitted values.
 * @param y Observed values.
 * @param w Weights, or null.
 * @param centred About the weighted mean of y, or about 0.
 * @returns The explained sum of squares.
 */
export function explainedSum(
  fitted: Float64Array,
  y: Float64Array,
  w: Float64Array | null,
  centred: boolean,
): number {
  const m = centred ? weightedMean(y, w) : 0;
  let ss = 0;
  for (let i = 0; i < y.length; i++) ss += (w ? w[i] : 1) * (fitted[i] - m) * (fitted[i] - m);
  return ss;
}

function weightedMean(y: Float64Array, w: Float64Array | null): number {
  let sw = 0, swy = 0;
  for (let i = 0; i < y.length; i++) {
    const wi = w ? w[i] : 1;
    sw += wi;
    swy += wi * y[i];
  }
  let mean = swy / sw, corr = 0;
  for (let i = 0; i < y.length; i++) corr += (w ? w[i] : 1) * (y[i] - mean);
  mean += corr / sw;
  return mean;
}
