/**
 * The verdict sentence of a comparison, naming the evidence scale it reads
 * Δ on.
 *
 * Scales:
 * - AIC and AICc: Burnham & Anderson 2002, *Model Selection and Multimodel
 *   Inference*, 2nd ed., §2.6: Δ 0–2 substantial support, 4–7 considerably
 *   less, > 10 essentially none (the gaps 2–4 and 7–10 are said to lie
 *   between).
 * - BIC: Kass & Raftery 1995, "Bayes factors", JASA 90:773–795, §3.2, on
 *   2 ln B ≈ ΔBIC: 0–2 not worth more than a bare mention, 2–6 positive,
 *   6–10 strong, > 10 very strong.
 * - LOO RMSE has no published evidence scale and no weights; the verdict
 *   says so.
 *
 * When the fits differ in their relative weights the verdict also states
 * the basis of the comparison in plain words ({@link weightingBasis}): each
 * fit's weights are its variance model, and its log-likelihood carries
 * ½·Σ ln wᵢ (comparable.ts).
 *
 * @module
 */
import type { Criterion } from "./spec.ts";
import type { NestedTest } from "./nested_tests.ts";
import { formatNumber, formatP } from "../shared/format.ts";

/** The criteria's names as printed. */
export const LABELS: Readonly<Record<Criterion, string>> = {
  aic: "AIC",
  aicc: "AICc",
  bic: "BIC",
  loo: "leave-one-out RMSE",
};

/** Each criterion's evidence scale in words (shown in the view and the result). */
export const EVIDENCE_SCALES: Readonly<Record<Criterion, string>> = {
  aic:
    "Burnham & Anderson 2002: Δ 0–2 substantial support, 4–7 considerably less, > 10 essentially none",
  aicc:
    "Burnham & Anderson 2002: Δ 0–2 substantial support, 4–7 considerably less, > 10 essentially none",
  bic:
    "Kass & Raftery 1995: ΔBIC 0–2 not worth more than a bare mention, 2–6 positive, 6–10 strong, > 10 very strong",
  loo: "none: RMSE differences have no published evidence scale, and no Akaike weights are given",
};

/** Δ below which the two best fits count as no clear winner (Burnham & Anderson 2002, §2.6). */
export const CLEAR_WINNER = 2;

/** What the verdict is built from: fits in rank order (best first). */
export interface VerdictInput {
  by: Criterion;
  ranked: { fit: string; value: number; delta: number; weight: number | null }[];
  /** Fits whose criterion does not exist. */
  unranked: string[];
  nested: readonly NestedTest[];
  significance: number;
  /** Each fit's weights as written (null: unweighted), given when they differ between fits. */
  weights?: readonly { fit: string; weights: string | null }[];
}

/**
 * The basis of comparing fits that differ in their relative weights, in
 * plain words.
 *
 * @param fits Each fit's `weights` as written, null for an unweighted fit.
 * @returns One sentence.
 * @example
 * ```ts
 * import { weightingBasis } from "./verdict.ts";
 * const s = weightingBasis([{ fit: "line", weights: null }, { fit: "line_x2", weights: "1/x^2" }]);
 * if (!s.includes("½·Σ ln wᵢ") || !s.includes('"line_x2" weights 1/x^2')) throw new Error(s);
 * ```
 */
export function weightingBasis(fits: readonly { fit: string; weights: string | null }[]): string {
  const each = fits.map((f) =>
    f.weights === null ? `"${f.fit}" unweighted` : `"${f.fit}" weights ${f.weights}`
  );
  return `The fits differ in their weights (${
    each.join(", ")
  }): each fit's weights are read as its model of the variance, yᵢ ~ N(μᵢ, σ²/wᵢ) with one scale σ² estimated, so its Gaussian log-likelihood includes ½·Σ ln wᵢ (unchanged if every weight is multiplied by one constant) and AIC, AICc and BIC compare the weightings on the same rows and the same response; RSS, σ, R² and the leave-one-out RMSE are each on its own fit's weighted scale and are not compared`;
}

/**
 * The verdict sentence.
 *
 * @param v The ranking, nested tests and level.
 * @returns One or two plain sentences.
 * @example
 * ```ts
 * import { verdict } from "./verdict.ts";
 * const s = verdict({ by: "bic", ranked: [{ fit: "quad", value: 10, delta: 0, weight: 0.9 },
 *   { fit: "line", value: 17, delta: 7, weight: 0.1 }], unranked: [], nested: [], significance: 0.05 });
 * if (!s.includes("strong") || !s.includes("Kass & Raftery 1995")) throw new Error(s);
 * ```
 */
export function verdict(v: VerdictInput): string {
  const label = LABELS[v.by];
  if (v.ranked.length === 0) {
    return `No fit can be ranked by ${label}: it does not exist for any of them (see the warnings)`;
  }
  const [best, next] = v.ranked;
  const parts: string[] = [];
  if (next === undefined) {
    parts.push(`"${best.fit}" is the only fit with a ${label}`);
  } else if (v.by === "loo") {
    parts.push(
      `"${best.fit}" is preferred by ${label} (${formatNumber(best.value, 4)}, against ${
        formatNumber(next.value, 4)
      } for "${next.fit}"); ${EVIDENCE_SCALES.loo}`,
    );
  } else {
    parts.push(criterionSentence(v.by, best, next));
  }
  if (v.unranked.length > 0) {
    parts.push(`not ranked (no ${label}): ${v.unranked.map((f) => `"${f}"`).join(", ")}`);
  }
  const tests = v.nested.filter((t) => t.smaller === best.fit || t.larger === best.fit);
  if (tests.length > 0) parts.push(testsSentence(tests, v.significance));
  if (v.weights !== undefined) parts.push(weightingBasis(v.weights));
  return parts.join(". ");
}

function criterionSentence(
  by: Exclude<Criterion, "loo">,
  best: VerdictInput["ranked"][0],
  next: VerdictInput["ranked"][0],
): string {
  const label = LABELS[by];
  const d = `Δ${label} ${formatNumber(next.delta, 3)}`;
  const w = best.weight === null ? "" : ` (Akaike weight ${formatNumber(best.weight, 2)})`;
  const scale = `on the scale of ${EVIDENCE_SCALES[by]}`;
  const lead = next.delta <= CLEAR_WINNER
    ? `No clear winner: "${best.fit}" and "${next.fit}" are within ${CLEAR_WINNER} by ${label} (${d}); "${best.fit}" is ahead${w}`
    : `"${best.fit}" is preferred by ${label}${w} over "${next.fit}" (${d})`;
  const reading = by === "bic"
    ? `the evidence against "${next.fit}" is ${bicWords(next.delta)}`
    : `"${next.fit}" has ${aicWords(next.delta)}`;
  return `${lead}; ${reading}, ${scale}`;
}

function aicWords(d: number): string {
  if (d <= 2) return "substantial support";
  if (d < 4) return "support between substantial and considerably less";
  if (d <= 7) return "considerably less support";
  if (d <= 10) return "support between considerably less and essentially none";
  return "essentially no support";
}

function bicWords(d: number): string {
  if (d <= 2) return "not worth more than a bare mention";
  if (d <= 6) return "positive";
  if (d <= 10) return "strong";
  return "very strong";
}

function testsSentence(tests: readonly NestedTest[], alpha: number): string {
  const one = (t: NestedTest) => {
    const p = t.p_value === null ? "—" : formatP(t.p_value);
    const sig = t.p_value === null
      ? ""
      : t.p_value < alpha
      ? `, significant at ${alpha}`
      : `, not significant at ${alpha}`;
    return `"${t.larger}" over "${t.smaller}" F(${t.df1}, ${t.df2}) = ${
      formatNumber(t.f, 4)
    }, p ${p}${sig}`;
  };
  return `Nested F tests: ${tests.map(one).join("; ")}`;
}
