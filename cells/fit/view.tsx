/**
 * The fit cell's view: the model, a parameter table (estimate and its unit,
 * standard uncertainty, interval at the document's confidence level, t, p), the fit
 * statistics (with known σ the Wald χ² of the slopes and the χ² goodness of
 * fit in place of the F test), the weighting stated plainly, the k
 * convention of the criteria, for a fit computed in its database where
 * each number was computed (_in_engine_view.tsx), and intervals beyond Wald
 * with profile traces (_intervals_view.tsx). Shared by the live page and the static record, so it is plain
 * markup with no scripts or state.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { FitResult } from "./result.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatP,
  formatR2,
  formatUncertainty,
  squaredUnit,
  withUnit,
} from "../shared/format.ts";
import { InEngineSection } from "./_in_engine_view.tsx";
import { IntervalsSection } from "./_intervals_view.tsx";
import { RobustSection } from "./_robust_view.tsx";
import { CensoredSection } from "./_censored_view.tsx";

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
 *   sigma_unit: "mAh",
 *   iterations: 1,
 *   rank_deficient: null,
 * } }));
 * if (!html.includes("y = a + b*x")) throw new Error(html);
 * ```
 */
export function FitView({ name, result: r }: ViewProps<FitResult>): VNode {
  const level = `${formatNumber(100 * r.confidence, 4)}% interval`;
  const stat = r.inference === "normal" ? "z" : "t";
  const notes = r.parameters.filter((p) => p.unit_note);
  return (
    <section class="plumb-fit" aria-label={`Fit ${name}`}>
      <p class="plumb-fit-model">
        <code>{r.model}</code>{" "}
        <span class="plumb-fit-method">
          {r.robust
            ? `${r.method} M-estimate, ${r.robust.loss_name} loss`
            : `${r.method} least squares`}
        </span>
      </p>
      <p class="plumb-fit-weighting">Weighting: {r.weighting_statement}</p>
      {r.robust !== undefined && <RobustSection b={r.robust} unit={r.sigma_unit} />}
      {r.in_engine_detail !== undefined && <InEngineSection d={r.in_engine_detail} />}
      {r.censoring !== undefined && (
        <CensoredSection
          c={r.censoring}
          parameters={r.parameters.map((p) => p.name)}
          n={r.n}
        />
      )}
      <table class="plumb-fit-parameters">
        <thead>
          <tr>
            <th scope="col">Parameter</th>
            <th scope="col">Estimate</th>
            <th scope="col">Unit</th>
            <th scope="col">Standard uncertainty</th>
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
              <td>{formatEstimate(p.estimate, p.std_error)}</td>
              <td class="plumb-unit">
                <UnitCell unit={p.unit} note={p.unit_note} mark={notes.indexOf(p) + 1} />
              </td>
              <td>{formatUncertainty(p.std_error)}</td>
              <td>{formatIntervalAt(p.ci, p.std_error, p.estimate, RANGE)}</td>
              <td>{formatNumber(p.t, 3)}</td>
              <td>{formatP(p.p_value)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {notes.length > 0 && (
        <ol class="plumb-fit-unit-notes">
          {notes.map((p) => (
            <li key={p.name}>
              Unit of <code>{p.name}</code>: {p.unit_note}
            </li>
          ))}
        </ol>
      )}
      <IntervalsSection r={r} />
      <p class="plumb-fit-rounding">
        Estimates and interval limits are given to the digit of the standard uncertainty's second
        significant figure (GUM §7.2.6).
      </p>
      <dl class="plumb-fit-statistics">
        {statistics(r).map((
          [term, value],
        ) => [<dt key={`t-${term}`}>{term}</dt>, <dd key={`d-${term}`}>{value}</dd>])}
      </dl>
    </section>
  );
}

/** An interval's limits joined by an ellipsis, as the parameter table writes them. */
const RANGE = { open: "", sep: " … ", close: "" };

/** A parameter's unit, or a dash with a numbered note (its text as a hover and below the table). */
function UnitCell(props: { unit: string | null; note: string | null; mark: number }): VNode {
  if (props.note === null) return <>{props.unit ?? "—"}</>;
  return (
    <span title={props.note}>
      {props.unit ?? "—"}
      <sup>{props.mark}</sup>
    </span>
  );
}

function statistics(r: FitResult): [string, string][] {
  const uncentred = r.r2_kind === "uncentred" ? " (uncentred: no intercept)" : "";
  const nonlinear = r.method === "nonlinear" ? " (not the share of variance explained)" : "";
  const weighted = r.weighted ? ", weighted" : "";
  const u = r.sigma_unit;
  const f = r.f_statistic === null
    ? "—"
    : `F(${r.p - 1}, ${r.df_residual}) = ${formatNumber(r.f_statistic, 5)}, p ${
      formatP(r.f_p_value)
    }`;
  const tests: [string, string][] = r.weighting === "absolute"
    ? [
      ["Slopes jointly zero? Wald χ² with known σ", chi2(r.wald_chi2, r.wald_df, r.wald_p_value)],
      [
        "Scatter as the known σ predict? χ² = Σ((y − ŷ)/σ)²",
        chi2(r.gof_chi2, r.gof_df, r.gof_p_value),
      ],
      ["χ² per degree of freedom", formatNumber(r.reduced_chi2, 4)],
    ]
    : [["Do the terms beyond the intercept help? Joint F test", f]];
  return [
    ["Rows in the fit", String(r.n)],
    ["Parameters estimated", String(r.p)],
    ["Degrees of freedom left", String(r.df_residual)],
    [
      `Sum of squared residuals${weighted}`,
      withUnit(formatNumber(r.rss, 6), r.weighted ? null : squaredUnit(u)),
    ],
    [
      r.robust
        ? "Robust scale of the residuals, s (normalised MAD)"
        : "Scatter about the model, σ = √(RSS/df)",
      withUnit(formatNumber(r.sigma, 4), r.weighted ? null : u),
    ],
    ["Share of variation explained, R²", formatR2(r.r2) + uncentred + nonlinear],
    ["R² adjusted for the parameters", formatR2(r.adj_r2)],
    ...tests,
    ["Log-likelihood (Gaussian)", formatNumber(r.log_likelihood, 6)],
    ["AIC", formatNumber(r.aic, 6)],
    ["AICc", formatNumber(r.aicc, 6)],
    ["BIC", formatNumber(r.bic, 6)],
    ["Parameters counted by the criteria", `${r.k} (${r.k_convention})`],
    ["Response", withUnit(r.response, u ? `(${u})` : null)],
  ];
}

/** `χ²(2) = 12.3, p 0.002`, or — when the test is not given. */
function chi2(x: number | null, df: number | null, p: number | null): string {
  if (x === null || df === null) return "—";
  return `χ²(${df}) = ${formatNumber(x, 5)}, p ${formatP(p)}`;
}

/** The `fit` kind's page face: its view, for the live page and the record. */
export const fitPage: PageFace<FitResult, VNode> = { kind: "fit", view: FitView };
