/**
 * The RUN-JSON `robust` object of a robust fit (docs/run-json.md): what the
 * loss was, the scale, the covariance's form and the rows down-weighted.
 *
 * A row is listed as down-weighted when its scaled residual |uᵢ| = |√wᵢ·rᵢ|/s
 * exceeds the tuning constant c: for Huber exactly the rows given a weight
 * below 1; for soft-L1 those below 1/√2; for bisquare those given weight 0.
 * (Soft-L1 and bisquare lower every weight a little; the list keeps to the
 * rows the loss treats as beyond the bulk.)
 *
 * @module
 */
import type { RobustRecord } from "./_robust.ts";
import { type Loss, LOSS_WORDS } from "./_robust_loss.ts";

/** One down-weighted row. */
export interface DownWeightedRow {
  /** Source row number. */
  row: number;
  /** The loss's final weight ψ(u)/u (prior weights not included). */
  weight: number;
  /** u = √w·r/s. */
  scaled_residual: number;
}

/** RUN-JSON `robust`. */
export interface RobustResult {
  loss: Loss;
  /** The loss in words ("Huber", "soft-L1", "Tukey's bisquare"). */
  loss_name: string;
  tuning: number;
  /** The robust scale s (also the fit's `sigma`). */
  scale: number;
  scale_method: string;
  /** sandwich, or scaled when W was not positive definite (_robust_covariance.ts). */
  covariance_form: "sandwich" | "scaled";
  covariance_statement: string;
  /** Huber's small-sample correction factor K. */
  correction_factor: number;
  iterations: number;
  /** Where the reweighting started, in words. */
  start: string;
  /** Which rows count as down-weighted, in words. */
  down_weighted_rule: string;
  /** Rows with |u| > c, lowest weight first. */
  down_weighted: DownWeightedRow[];
}

/** How the scale is estimated, in words. */
export const SCALE_METHOD =
  "normalised median absolute deviation of the residuals about 0, s = median |√wᵢ·rᵢ| / Φ⁻¹(3/4), re-estimated at each iteration";

const STATEMENTS: Readonly<Record<"sandwich" | "scaled", string>> = {
  sandwich:
    "Huber's sandwich K⁻¹·Σψ(uᵢ)²/(n − p)·s²·W⁻¹(XᵀX)W⁻¹, W = Σψ′(uᵢ)xᵢxᵢᵀ, K = 1 + (p/n)·var ψ′/(mean ψ′)² (Huber 1981 §7.6)",
  scaled:
    "Huber's scaled form K²·Σψ(uᵢ)²/(n − p)/(mean ψ′)²·s²·(XᵀX)⁻¹ (Huber 1981 §7.6), as W = Σψ′(uᵢ)xᵢxᵢᵀ is not positive definite",
};

/**
 * Builds the RUN-JSON `robust` object.
 *
 * @param r The fit's robust record.
 * @param rows Source row numbers of the rows used.
 * @returns Plain JSON.
 */
export function robustResult(r: RobustRecord, rows: Int32Array): RobustResult {
  const down: DownWeightedRow[] = [];
  for (let i = 0; i < r.scaled.length; i++) {
    if (Math.abs(r.scaled[i]) > r.tuning) {
      down.push({ row: rows[i], weight: r.weights[i], scaled_residual: r.scaled[i] });
    }
  }
  down.sort((a, b) => a.weight - b.weight || a.row - b.row);
  return {
    loss: r.loss,
    loss_name: LOSS_WORDS[r.loss],
    tuning: r.tuning,
    scale: r.scale,
    scale_method: SCALE_METHOD,
    covariance_form: r.covariance.form,
    covariance_statement: STATEMENTS[r.covariance.form],
    correction_factor: r.covariance.k,
    iterations: r.iterations,
    start: r.start,
    down_weighted_rule: `|rᵢ|/s above the tuning constant ${r.tuning}`,
    down_weighted: down,
  };
}
