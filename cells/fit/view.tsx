/**
 * The fit cell's view: the model, a parameter table (estimate, standard
 * error, interval at the document's confidence level, t, p), the fit
 * statistics (with known σ the Wald χ² of the slopes and the χ² goodness of
 * fit in place of the F test), the weighting stated plainly and the k
 * convention of the criteria. Shared by the live page and the static record, so it is plain
 * markup with no scripts or state.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { FitResult } from "./result.ts";
import { formatNumber, formatR2 } from "../shared/format.ts";

/**
 * Renders a fit result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { FitView } from "./view.tsx";
 * const html = renderToString(FitView({ name: "line", result: {
 *   method: "linear", model: "y = a + b*x", response: "y", weighted: false, n: 3, p: 2,
 *   df_residual: 1, parameters: [], covariance: [], correlation: [], covariance_scaled: true,
 *   rss: 0, tss: 1, ess: 1, r2: 1, adj_r2: 1, r2_kind: "centred", sigma: 0, f_statistic: null,
 *   f_p_value: null, wald_chi2: null, wald_df: null, wald_p_value: null, gof_chi2: null,
 *   gof_df: null, gof_p_value: null, reduced_chi2: null, log_likelihood: null, k: 3, k_convention: "k = p + 1", aic: null, aicc: null,
 *   bic: null, confidence: 0.95, inference: "t", weighting: "none", weighting_statement: "unweighted",
 *   condition_number: 1, fitted: [], residuals: [], rows: [], rows_missing: [], converged: true,
 *   iterations: 1,
 *   rank_deficient: null,
 * } }));
 * if (!html.includes("y = a + b*x")) throw new Error(html);
 * ```
 */
export function FitView({ name, result: r }: ViewProps<FitResult>): VNode {
  const level = `${formatNumber(100 * r.confidence, 4)}% interval`;
  const stat = r.inference === "normal" ? "z" : "t";
  return (
    <section class="plumb-fit" aria-label={`Fit ${name}`}>
      <p class="plumb-fit-model">
        <code>{r.model}</code> <span class="plumb-fit-method">{r.method} least squares</span>
      </p>
      <p class="plumb-fit-weighting">Weighting: {r.weighting_statement}</p>
      <table class="plumb-fit-parameters">
        <thead>
          <tr>
            <th scope="col">Parameter</th>
            <th scope="col">Estimate</th>
            <th scope="col">Std. error</th>
            <th scope="col">{level}</th>
            <th scope="col">{stat}</th>
            <th scope="col">p</th>
          </tr>
        </thead>
        <tbody>
          {r.parameters.map((p) => (
            <tr key={p.name}>
              <th scope="row">
                <code>{p.name}</code>
              </th>
              <td>{formatNumber(p.estimate, 6)}</td>
              <td>{formatNumber(p.std_error, 3)}</td>
              <td>{p.ci ? `${formatNumber(p.ci[0], 5)} … ${formatNumber(p.ci[1], 5)}` : "—"}</td>
              <td>{formatNumber(p.t, 3)}</td>
              <td>{formatP(p.p_value)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <dl class="plumb-fit-statistics">
        {statistics(r).map((
          [term, value],
        ) => [<dt key={`t-${term}`}>{term}</dt>, <dd key={`d-${term}`}>{value}</dd>])}
      </dl>
    </section>
  );
}

/** p-values keep their size: 3.2e-27 is shown as such, never as 0. */
function formatP(p: number | null): string {
  if (p === null) return "—";
  return p < 1e-4 ? p.toExponential(1).replace("e+", "e") : formatNumber(p, 2);
}

function statistics(r: FitResult): [string, string][] {
  const uncentred = r.r2_kind === "uncentred" ? " (uncentred: no intercept)" : "";
  const nonlinear = r.method === "nonlinear" ? " (not the share of variance explained)" : "";
  const weighted = r.weighted ? " (weighted)" : "";
  const f = r.f_statistic === null
    ? "—"
    : `${formatNumber(r.f_statistic, 5)} on ${r.p - 1} and ${r.df_residual} df, p ${
      formatP(r.f_p_value)
    }`;
  const tests: [string, string][] = r.weighting === "absolute"
    ? [
      [
        "Wald χ² (all terms but the intercept, known σ)",
        chi2(r.wald_chi2, r.wald_df, r.wald_p_value),
      ],
      ["Goodness of fit χ² = Σ((y − ŷ)/σ)²", chi2(r.gof_chi2, r.gof_df, r.gof_p_value)],
      ["Reduced χ² (χ²/df)", formatNumber(r.reduced_chi2, 4)],
    ]
    : [["F (all terms but the intercept)", f]];
  return [
    ["Rows used", String(r.n)],
    ["Parameters", String(r.p)],
    ["Residual degrees of freedom", String(r.df_residual)],
    [`Residual sum of squares${weighted}`, formatNumber(r.rss, 6)],
    ["Residual standard error σ", formatNumber(r.sigma, 4)],
    ["R²", formatR2(r.r2) + uncentred + nonlinear],
    ["Adjusted R²", formatR2(r.adj_r2)],
    ...tests,
    ["Log-likelihood (Gaussian)", formatNumber(r.log_likelihood, 6)],
    ["AIC", formatNumber(r.aic, 6)],
    ["AICc", formatNumber(r.aicc, 6)],
    ["BIC", formatNumber(r.bic, 6)],
    ["Parameters counted by the criteria", `${r.k} (${r.k_convention})`],
    ["Response", r.response],
  ];
}

/** `12.3 on 2 df, p 0.002`, or — when the test is not given. */
function chi2(x: number | null, df: number | null, p: number | null): string {
  if (x === null || df === null) return "—";
  return `${formatNumber(x, 5)} on ${df} df, p ${formatP(p)}`;
}

/** The `fit` kind's page face: its view, for the live page and the record. */
export const fitPage: PageFace<FitResult, VNode> = { kind: "fit", view: FitView };
