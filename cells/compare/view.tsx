/**
 * The compare cell's view: the fits ranked by the chosen criterion, with n,
 * k, log-likelihood on the original scale, AIC, AICc, BIC, Δ, Akaike weight
 * and leave-one-out RMSE; the nested F tests; the verdict; and notes on the
 * k convention, the scale of the criteria and the evidence scale. Plain
 * markup, shared by the live page and the static record.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { CompareResult, CompareRow } from "./result.ts";
import { distinctTexts, formatNumber, formatP } from "../shared/format.ts";

/**
 * Renders a compare result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { CompareView } from "./view.tsx";
 * const html = renderToString(CompareView({ name: "shape", result: {
 *   by: "aicc", rows: [], preferred: null, nested_tests: [], verdict: "No fit can be ranked",
 *   criterion: "AICc", k_convention: "k = p + 1", evidence_scale: "Burnham & Anderson 2002",
 *   criteria_scale: "", significance: 0.05, weighting_basis: null,
 * } }));
 * if (!html.includes("No fit can be ranked")) throw new Error(html);
 * ```
 */
export function CompareView({ name, result: r }: ViewProps<CompareResult>): VNode {
  const ranked = [...r.rows].sort((a, b) => (a.rank ?? Infinity) - (b.rank ?? Infinity));
  const deltaUnit = r.by === "loo" ? "Δ RMSE" : `Δ${r.criterion}`;
  const texts = columnTexts(ranked);
  return (
    <section class="plumb-compare" aria-label={`Comparison ${name}`}>
      <p class="plumb-compare-verdict">{r.verdict}</p>
      <table class="plumb-compare-rows">
        <thead>
          <tr>
            {["Rank", "Fit", "Response", "n", "k", "log L (original scale)", "AIC", "AICc", "BIC"]
              .map((h) => <th scope="col" key={h}>{h}</th>)}
            <th scope="col">{deltaUnit}</th>
            <th scope="col">Weight</th>
            <th scope="col">LOO RMSE</th>
          </tr>
        </thead>
        <tbody>
          {ranked.map((row, i) => (
            <Row key={row.fit} row={row} texts={texts[i]} preferred={r.preferred} />
          ))}
        </tbody>
      </table>
      {r.nested_tests.length > 0 && <NestedTable result={r} />}
      <ul class="plumb-compare-notes">
        <li>Ranked by {r.criterion}; evidence scale: {r.evidence_scale}.</li>
        <li>Parameters counted by the criteria: {r.k_convention}.</li>
        <li>Scale: {r.criteria_scale}.</li>
        {r.weighting_basis !== null && <li>Weights: {r.weighting_basis}.</li>}
        <li>{looNote(r.rows)}</li>
      </ul>
    </section>
  );
}

/** The numeric columns of the ranking, in table order, with their significant digits. */
const COLUMNS: [keyof CompareRow, number][] = [
  ["log_likelihood_original_scale", 6],
  ["aic", 6],
  ["aicc", 6],
  ["bic", 6],
  ["delta", 3],
  ["weight", 3],
  ["loo_rmse", 4],
];

/** Each row's texts: a column's distinct values never print alike (two AICc 0.004 apart). */
function columnTexts(rows: CompareRow[]): string[][] {
  const byColumn = COLUMNS.map(([key, sig]) =>
    distinctTexts(rows.map((row) => row[key] as number | null), (x, e) => formatNumber(x, sig + e))
  );
  return rows.map((_, i) => byColumn.map((column) => column[i]));
}

function Row(props: { row: CompareRow; texts: string[]; preferred: string | null }): VNode {
  const { row, preferred } = props;
  return (
    <tr class={row.fit === preferred ? "plumb-compare-preferred" : undefined}>
      <td>{row.rank ?? "—"}</td>
      <th scope="row">
        <code>{row.fit}</code>
      </th>
      <td>
        <code>{row.response}</code>
      </td>
      <td>{row.n}</td>
      <td>{row.k}</td>
      {props.texts.map((t, i) => <td key={COLUMNS[i][0]}>{t}</td>)}
    </tr>
  );
}

function NestedTable({ result: r }: { result: CompareResult }): VNode {
  return (
    <table class="plumb-compare-nested">
      <caption>Extra-sum-of-squares F tests of nested linear fits</caption>
      <thead>
        <tr>
          {["Smaller", "Larger", "F", "df", "p"].map((h) => <th scope="col" key={h}>{h}</th>)}
        </tr>
      </thead>
      <tbody>
        {r.nested_tests.map((t) => (
          <tr key={`${t.smaller}-${t.larger}`}>
            <td>
              <code>{t.smaller}</code>
            </td>
            <td>
              <code>{t.larger}</code>
            </td>
            <td>{formatNumber(t.f, 5)}</td>
            <td>{t.df1}, {t.df2}</td>
            <td>{formatP(t.p_value)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function looNote(rows: readonly CompareRow[]): string {
  const kfold = rows.filter((x) => x.loo_method === "k-fold");
  const press = "linear fits: PRESS from the hat matrix (exact leave-one-out, no refitting)";
  if (kfold.length === 0) return `Leave-one-out RMSE: ${press}.`;
  return `Leave-one-out RMSE: ${press}; nonlinear fits: ${
    kfold[0].loo_folds
  }-fold cross-validation with the document's seed, refitted from the full-data estimates.`;
}

/** The `compare` kind's page face: its view, for the live page and the record. */
export const comparePage: PageFace<CompareResult, VNode> = { kind: "compare", view: CompareView };
