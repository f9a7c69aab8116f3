/**
 * Whether fits can be compared at all: the criteria of different data are
 * not comparable (Burnham & Anderson 2002, *Model Selection and Multimodel
 * Inference*, 2nd ed., §2.11.3 from memory for the section: every model
 * must be fitted to the same response values). So the fits must use the
 * same rows, model the same response column with the same values, and count
 * k alike. Each refusal names the two fits and says what differs.
 *
 * Weights: relative weights (`weights`, or none: every wᵢ = 1) are part of
 * the model, a variance model yᵢ ~ N(μᵢ, σ²/wᵢ) with one scale σ² estimated.
 * Its Gaussian log-likelihood, −n/2·(ln 2π + ln(Σwᵢrᵢ²/n) + 1) + ½·Σ ln wᵢ
 * (cells/fit `_likelihood.ts`), is a density of the same y whatever the
 * weights, and does not change when every wᵢ is multiplied by one constant;
 * so fits that differ only in their relative weights (none, 1/x, 1/x²: the
 * classic calibration question) are compared by AIC, AICc and BIC. Known
 * standard deviations (`known_sigma`) fix the scale instead: such fits are
 * compared only with fits of the same σᵢ.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { Fit } from "../fit/mod.ts";
import type { OriginalScale } from "./original_scale.ts";
import { rowList } from "../shared/rows.ts";

/** A fit as the comparison sees it. */
export interface Candidate {
  /** The fit cell's name. */
  name: string;
  fit: Fit;
  /** The response on the scale of its column. */
  scale: OriginalScale;
}

/** Relative gap allowed between two fits' response values or weights (common practice, no source). */
const SAME_VALUE = 1e-9;

/**
 * Whether two fits weight their rows the same (an unweighted fit as wᵢ = 1),
 * within {@link SAME_VALUE} relative; F tests and weighted RMSEs need it.
 *
 * @param a One fit's weights (null: unweighted).
 * @param b The other's, over the same rows.
 * @returns True when equal row for row.
 * @example
 * ```ts
 * import { sameWeights } from "./comparable.ts";
 * if (!sameWeights(null, new Float64Array([1, 1]))) throw new Error("wᵢ = 1 is unweighted");
 * if (sameWeights(null, new Float64Array([1, 0.5]))) throw new Error("1/x differs");
 * ```
 */
export function sameWeights(a: Float64Array | null, b: Float64Array | null): boolean {
  if (a !== null && b !== null && a.length !== b.length) return false;
  const n = (a ?? b)?.length ?? 0;
  for (let i = 0; i < n; i++) if (!near(a?.[i] ?? 1, b?.[i] ?? 1)) return false;
  return true;
}

const WEIGHTINGS = {
  none: "unweighted",
  relative: "weighted by relative weights",
  absolute: "weighted by known standard deviations",
} as const;

/**
 * Refuses fits that cannot be compared; the first candidate is the reference.
 *
 * @param cell The compare cell's name.
 * @param all The candidates, in the order listed.
 * @throws {CellError} At `["fits", j]` for the first fit that differs from the
 *   first one in its rows, response column, response values, k convention,
 *   or known standard deviations (when either fit has them).
 * @example
 * ```ts
 * import { checkComparable } from "./comparable.ts";
 * checkComparable("cmp", []); // nothing to refuse
 * ```
 */
export function checkComparable(cell: string, all: readonly Candidate[]): void {
  if (all.length === 0) return;
  const a = all[0];
  all.slice(1).forEach((b, k) => {
    const at = ["fits", k + 1];
    const why = rowsDiffer(a, b) ?? responseDiffers(a, b) ?? weightingDiffers(a, b) ??
      kDiffers(a, b);
    if (why !== null) throw new CellError(`Cannot compare "${cell}": ${why}`, at);
  });
}

function pair(a: Candidate, b: Candidate): string {
  return `fits "${a.name}" and "${b.name}"`;
}

/** Equal length and equal values in order (a plain loop: `every` with a callback is slower). */
function sameValues(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

function rowsDiffer(a: Candidate, b: Candidate): string | null {
  const ra = a.fit.rows, rb = b.fit.rows;
  if (sameValues(ra, rb)) return null;
  const inB = new Set(rb), inA = new Set(ra);
  const onlyA = Array.from(ra).filter((r) => !inB.has(r));
  const onlyB = Array.from(rb).filter((r) => !inA.has(r));
  const parts = [`"${a.name}" uses ${ra.length} rows, "${b.name}" uses ${rb.length}`];
  if (onlyA.length > 0) parts.push(`only "${a.name}" uses ${rowList(onlyA)}`);
  if (onlyB.length > 0) parts.push(`only "${b.name}" uses ${rowList(onlyB)}`);
  if (onlyA.length === 0 && onlyB.length === 0) parts.push("the rows are in a different order");
  return `${pair(a, b)} are on different rows: ${parts.join("; ")}`;
}

function responseDiffers(a: Candidate, b: Candidate): string | null {
  const ca = a.fit.model.responseColumn, cb = b.fit.model.responseColumn;
  if (ca !== cb) {
    return `${
      pair(a, b)
    } model different responses: "${a.name}" models column "${ca}", "${b.name}" models column "${cb}"`;
  }
  const bad = differing(a.scale.values, b.scale.values, a.fit.rows);
  if (bad.length === 0) return null;
  return `${
    pair(a, b)
  } have different values of response column "${ca}" (fitted on tables "${a.fit.on}" and "${b.fit.on}") in ${
    rowList(bad)
  }`;
}

function weightingDiffers(a: Candidate, b: Candidate): string | null {
  const wa = a.fit.weighting, wb = b.fit.weighting;
  // Relative weights and none: one variance model each, comparable by the criteria (above).
  if (wa !== "absolute" && wb !== "absolute") return null;
  if (wa !== wb) {
    return `${pair(a, b)} are weighted differently: "${a.name}" is ${
      WEIGHTINGS[wa]
    }, "${b.name}" is ${
      WEIGHTINGS[wb]
    }: known standard deviations fix the error scale that the other fit estimates`;
  }
  if (a.fit.weights === null || b.fit.weights === null) return null;
  const bad = differing(a.fit.weights, b.fit.weights, a.fit.rows);
  if (bad.length === 0) return null;
  return `${pair(a, b)} have different known standard deviations in ${rowList(bad)}`;
}

function kDiffers(a: Candidate, b: Candidate): string | null {
  const ka = a.fit.statistics.kConvention, kb = b.fit.statistics.kConvention;
  if (ka === kb) return null;
  return `${
    pair(a, b)
  } count parameters differently for the criteria: "${a.name}" uses ${ka}; "${b.name}" uses ${kb}: set count_variance alike`;
}

/** Source rows where x and y differ by more than SAME_VALUE relative. */
function differing(x: Float64Array, y: Float64Array, rows: Int32Array): number[] {
  const out: number[] = [];
  for (let i = 0; i < x.length; i++) if (!near(x[i], y[i])) out.push(rows[i]);
  return out;
}

/** |x − y| ≤ SAME_VALUE·max(|x|, |y|) (false for NaN). */
function near(x: number, y: number): boolean {
  return Math.abs(x - y) <= SAME_VALUE * Math.max(Math.abs(x), Math.abs(y));
}
