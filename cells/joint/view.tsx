/**
 * The joint cell's view: the model and its groups, the sharing verdicts
 * first (what a reader came for), then the parameters, shared ones in their
 * own table and the per-group ones side by side (a row per parameter, a
 * column per group), then the statistics of the pooled residuals. Plain
 * markup, shared by the live page and the static record.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { JointParameterResult, JointResult, JointSharingResult } from "./result.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatP,
  formatUncertainty,
  squaredUnit,
  withUnit,
} from "../shared/format.ts";

const RANGE = { open: "", sep: " … ", close: "" };

/**
 * Renders a joint result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { JointView } from "./view.tsx";
 * const html = renderToString(JointView({ name: "decay", result: {
 *   model: "y = a*exp(-k*t)", response: "y", grouped_by: null, groups: [], shared: ["k"],
 *   per_group: ["a"], n: 0, p: 0, df_residual: 0, parameters: [], covariance: [], correlation: [],
 *   rss: 0, sigma: null, sigma_unit: null, log_likelihood: null, k: 1, k_convention: "k = p + 1",
 *   aic: null, aicc: null, bic: null, confidence: 0.95, converged: true, iterations: 0,
 *   sharing: [], verdict: "At the 95% level, one \"k\" fits every group",
 * } }));
 * if (!html.includes("one &quot;k&quot; fits")) throw new Error(html);
 * ```
 */
export function JointView({ name, result: r }: ViewProps<JointResult>): VNode {
  const level = `${formatNumber(100 * r.confidence, 4)}% interval`;
  const shared = r.parameters.filter((p) => p.table === null);
  return (
    <section class="plumb-joint" aria-label={`Joint fit ${name}`}>
      <p class="plumb-joint-model">
        <code>{r.model}</code> fitted to {r.groups.length} groups at once
        {r.grouped_by !== null && (
          <>
            {" "}(rows of <code>{r.groups[0]?.table}</code> by <code>{r.grouped_by}</code>)
          </>
        )}; {sharedPhrase(r)}
      </p>
      <p class="plumb-joint-verdict">{r.verdict}.</p>
      {r.sharing.length > 0 && <SharingTable r={r} />}
      {shared.length > 0 && (
        <table class="plumb-joint-shared">
          <caption>Shared by every group</caption>
          <thead>
            <tr>
              {["Parameter", "Estimate", "Unit", "Standard uncertainty", level, "t", "p"].map((
                h,
              ) => <th scope="col" key={h}>{h}</th>)}
            </tr>
          </thead>
          <tbody>
            {shared.map((p) => (
              <tr key={p.name}>
                <th scope="row">
                  <code>{p.name}</code>
                </th>
                <td>{formatEstimate(p.estimate, p.std_error)}</td>
                <td>{p.unit ?? "—"}</td>
                <td>{formatUncertainty(p.std_error)}</td>
                <td>{formatIntervalAt(p.ci, p.std_error, p.estimate, RANGE)}</td>
                <td>{formatNumber(p.t, 3)}</td>
                <td>{formatP(p.p_value)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {r.per_group.length > 0 && <PerGroupTable r={r} level={level} />}
      <p class="plumb-joint-rounding">
        Estimates and interval limits are given to the digit of the standard uncertainty's second
        significant figure (GUM §7.2.6); intervals are Wald's, t with {r.df_residual}{" "}
        degrees of freedom, from the covariance over every parameter.
      </p>
      <dl class="plumb-joint-statistics">
        {statistics(r).map(([term, value]) => [
          <dt key={`t-${term}`}>{term}</dt>,
          <dd key={`d-${term}`}>{value}</dd>,
        ])}
      </dl>
    </section>
  );
}

function sharedPhrase(r: JointResult): string {
  const list = (xs: string[]) => xs.map((x) => `"${x}"`).join(", ");
  if (r.shared.length === 0) return "no parameter shared.";
  if (r.per_group.length === 0) return `every parameter shared (${list(r.shared)}).`;
  return `${list(r.shared)} shared, ${list(r.per_group)} one per group.`;
}

function SharingTable({ r }: { r: JointResult }): VNode {
  return (
    <table class="plumb-joint-sharing">
      <caption>May it be shared? Extra-sum-of-squares F test against a value per group</caption>
      <thead>
        <tr>
          {["Shared", "RSS shared", "RSS per group", "F", "df", "p", "Reading"].map((h) => (
            <th scope="col" key={h}>{h}</th>
          ))}
        </tr>
      </thead>
      <tbody>
        {r.sharing.map((s) => (
          <tr key={s.parameters.join(",")}>
            <th scope="row">
              <code>{s.parameters.join(", ")}</code>
              {s.parameters.length > 1 && " together"}
            </th>
            <td>{formatNumber(s.rss_shared, 5)}</td>
            <td>{formatNumber(s.rss_separate, 5)}</td>
            <td>{formatNumber(s.f, 4)}</td>
            <td>{s.df1}, {s.df2}</td>
            <td>{formatP(s.p_value)}</td>
            <td>{reading(s)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function reading(s: JointSharingResult): string {
  if (s.shareable === null) return "no test";
  return s.shareable ? "one value fits" : "groups differ";
}

/** A row per parameter of the model that is not shared, a column per group. */
function PerGroupTable({ r, level }: { r: JointResult; level: string }): VNode {
  const byParameter = new Map<string, JointParameterResult[]>();
  for (const p of r.parameters) {
    if (p.table === null) continue;
    byParameter.set(p.parameter, [...(byParameter.get(p.parameter) ?? []), p]);
  }
  return (
    <table class="plumb-joint-per-group">
      <caption>One value per group: estimate, standard uncertainty and {level}</caption>
      <thead>
        <tr>
          <th scope="col">Parameter</th>
          {r.groups.map((g) => (
            <th scope="col" key={g.name}>
              <code>{g.name}</code> ({g.n} rows)
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {[...byParameter].map(([k, ps]) => (
          <tr key={k}>
            <th scope="row">
              <code>{k}</code>
              {ps[0].unit !== null && ` (${ps[0].unit})`}
            </th>
            {ps.map((p) => (
              <td key={p.name}>
                {formatEstimate(p.estimate, p.std_error)}, u {formatUncertainty(p.std_error)}
                <br />
                {formatIntervalAt(p.ci, p.std_error, p.estimate, RANGE)}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function statistics(r: JointResult): [string, string][] {
  const u = r.sigma_unit;
  return [
    ["Rows in the fit", `${r.n} (${r.groups.map((g) => `${g.name} ${g.n}`).join(", ")})`],
    ["Parameters estimated", String(r.p)],
    ["Degrees of freedom left", String(r.df_residual)],
    ["Sum of squared residuals", withUnit(formatNumber(r.rss, 6), squaredUnit(u))],
    ["Scatter about the model, σ = √(RSS/df), pooled", withUnit(formatNumber(r.sigma, 4), u)],
    ["Log-likelihood (Gaussian)", formatNumber(r.log_likelihood, 6)],
    ["AIC", formatNumber(r.aic, 6)],
    ["AICc", formatNumber(r.aicc, 6)],
    ["BIC", formatNumber(r.bic, 6)],
    ["Parameters counted by the criteria", `${r.k} (${r.k_convention})`],
  ];
}

/** The `joint` kind's page face: its view, for the live page and the record. */
export const jointPage: PageFace<JointResult, VNode> = { kind: "joint", view: JointView };
