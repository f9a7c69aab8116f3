/**
 * The fit cell's view: the model, a parameter table and the fit statistics.
 * Shared by the live page and the static record, so it is plain markup with
 * no scripts or state.
 *
 * @module
 */
import type { VNode } from "preact";
import type { ViewProps } from "../types.ts";
import type { FitResult } from "./result.ts";
import { formatNumber, formatR2 } from "./_format.ts";

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
 *   df_residual: 1, parameters: [], covariance: null, correlation: [], covariance_scaled: true,
 *   rss: 0, tss: 1, ess: 1, r2: 1, adj_r2: 1, r2_kind: "centred", sigma: 0, condition_number: 1,
 *   fitted: [], residuals: [], rows: [], converged: true, iterations: 1, rank_deficient: null,
 * } }));
 * if (!html.includes("y = a + b*x")) throw new Error(html);
 * ```
 */
export function FitView({ name, result: r }: ViewProps<FitResult>): VNode {
  return (
    <section class="plumb-fit" aria-label={`Fit ${name}`}>
      <p class="plumb-fit-model">
        <code>{r.model}</code> <span class="plumb-fit-method">{r.method} least squares</span>
      </p>
      <table class="plumb-fit-parameters">
        <thead>
          <tr>
            <th scope="col">Parameter</th>
            <th scope="col">Estimate</th>
            <th scope="col">Std. error</th>
            <th scope="col">t</th>
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
              <td>{formatNumber(p.t, 3)}</td>
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

function statistics(r: FitResult): [string, string][] {
  const uncentred = r.r2_kind === "uncentred" ? " (uncentred: no intercept)" : "";
  return [
    ["Rows used", String(r.n)],
    ["Parameters", String(r.p)],
    ["Residual degrees of freedom", String(r.df_residual)],
    ["Residual sum of squares", formatNumber(r.rss, 6)],
    ["Residual standard error σ", formatNumber(r.sigma, 4)],
    ["R²", formatR2(r.r2) + uncentred],
    ["Adjusted R²", formatR2(r.adj_r2)],
    ["Response", r.response],
  ];
}
