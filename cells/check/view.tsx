/**
 * The check cell's view: the findings first, then a compact table of the
 * tests with their statistic, p-value and the rule that makes a finding.
 * Plain markup (shared by the live page and the static record), with the
 * residual figure drawn from the result alone (`residual_charts.ts`): one
 * panel per question the check asks, titled by it, with its test's verdict,
 * the findings' thresholds and the rows they name. Fitted values, residuals,
 * PRESS and the leave-one-out RMSE carry the fit's unit.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { CheckResult } from "./result.ts";
import { fmt, fmtVif } from "./_format.ts";
import { DrawnFigure } from "../../ui/charts/mod.ts";
import { checkFigure, type FigureInput } from "./residual_charts.ts";
import {
  formatIntervalAt,
  formatP,
  formatUncertainty,
  squaredUnit,
  withUnit,
} from "../shared/format.ts";

interface TestRow {
  name: string;
  statistic: string;
  p: number | null;
  rule: string;
}

function testRows(r: CheckResult): TestRow[] {
  const a = `p < ${r.significance}`;
  const bp = r.breusch_pagan, lof = r.lack_of_fit;
  if (r.in_engine !== undefined) return inEngineTests(r, a);
  return [
    {
      name: "Shapiro–Wilk W",
      statistic: fmt(r.shapiro_wilk?.w ?? null, 4),
      p: r.shapiro_wilk?.p_value ?? null,
      rule: a,
    },
    {
      name: "Jarque–Bera",
      statistic: fmt(r.jarque_bera?.statistic ?? null),
      p: r.jarque_bera?.p_value ?? null,
      rule: "shown only",
    },
    {
      name: `Breusch–Pagan (${bp?.variant ?? "koenker"}${
        bp?.regressors === "fitted" ? ", on ŷ" : ""
      })`,
      statistic: fmt(bp?.statistic ?? null),
      p: bp?.p_value ?? null,
      rule: a,
    },
    {
      name: "Durbin–Watson",
      statistic: fmt(r.durbin_watson),
      p: r.durbin_watson_test
        ? Math.min(r.durbin_watson_test.p_value, r.durbin_watson_test.p_value_negative)
        : null,
      rule: `${a}, the smaller one-sided p (${
        r.durbin_watson_test?.distribution === "beta" ? "beta approx." : "exact"
      })`,
    },
    {
      name: `Runs (${r.runs?.order === "x" ? "x order" : "row order"})`,
      statistic: r.runs ? String(r.runs.runs) : "—",
      p: r.runs?.p_value ?? null,
      rule: r.runs?.order === "x" ? `too few, ${a}` : `too few or too many, ${a}`,
    },
    {
      name: "RESET (ŷ², ŷ³)",
      statistic: fmt(r.reset?.f ?? null),
      p: r.reset?.p_value ?? null,
      rule: a,
    },
    {
      name: "Lack of fit",
      statistic: fmt(lof?.f ?? null),
      p: lof?.p_value ?? null,
      rule: lof ? a : "no replicate rows",
    },
  ];
}

/**
 * The tests of a fit computed in its database: those sums can give (Jarque–Bera is then the
 * normality test that makes a finding); the others are listed as not judged.
 */
function inEngineTests(r: CheckResult, a: string): TestRow[] {
  const bp = r.breusch_pagan, dw = r.durbin_watson_test;
  return [
    {
      name: `Breusch–Pagan (${bp?.variant ?? "koenker"})`,
      statistic: fmt(bp?.statistic ?? null),
      p: bp?.p_value ?? null,
      rule: a,
    },
    {
      name: r.in_engine?.order_by
        ? `Durbin–Watson (order of ${r.in_engine.order_by})`
        : "Durbin–Watson",
      statistic: r.durbin_watson === null ? "not computed" : fmt(r.durbin_watson),
      p: dw ? Math.min(dw.p_value, dw.p_value_negative) : null,
      rule: r.durbin_watson === null
        ? "needs an order column (order_by)"
        : `${a}, the smaller one-sided p (beta approx.)`,
    },
    {
      name: "Jarque–Bera",
      statistic: fmt(r.jarque_bera?.statistic ?? null),
      p: r.jarque_bera?.p_value ?? null,
      rule: a,
    },
  ];
}

/** The summaries of the rows a database's sums gave: leverage, studentized residuals, Cook's D, moments. */
function InEngineSums({ r }: { r: CheckResult }): VNode {
  const e = r.in_engine!, l = e.leverage, f = e.influence, m = e.residual_moments;
  const rows: [string, string, string][] = [
    [
      "Leverage",
      `largest ${fmt(l.max, 3)}`,
      `${l.over_2p.toLocaleString("en-US")} rows > 2p/n = ${fmt(l.limit_2p, 2)}, ${
        l.over_3p.toLocaleString("en-US")
      } > 3p/n = ${fmt(l.limit_3p, 2)}`,
    ],
    [
      "Externally studentized residual",
      `largest |t| ${fmt(f.max_abs_studentized)}`,
      `${f.studentized_over_3.toLocaleString("en-US")} rows beyond ±3`,
    ],
    [
      "Cook's distance",
      `largest ${fmt(f.max_cooks_distance)}`,
      `${f.cooks_over_cut.toLocaleString("en-US")} rows > ${fmt(f.cooks_cut)}`,
    ],
    [
      "Residual shape",
      `skewness ${fmt(m.skewness)}, kurtosis ${fmt(m.kurtosis)}`,
      "normal: 0 and 3",
    ],
  ];
  return (
    <table class="plumb-check-tests plumb-check-sums">
      <caption>
        From sums over the rows in {e.engine === "postgres" ? "PostgreSQL" : "DuckDB"}
      </caption>
      <thead>
        <tr>
          <th scope="col">Measure</th>
          <th scope="col">Value</th>
          <th scope="col">Rows</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([name, value, count]) => (
          <tr key={name}>
            <th scope="row">{name}</th>
            <td>{value}</td>
            <td>{count}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** The sentence that the rows stay in the database, and what was judged from sums and what not. */
function InEngineNote({ r }: { r: CheckResult }): VNode {
  const e = r.in_engine!;
  return (
    <div class="plumb-check-in-engine">
      <p>{e.note}</p>
      <details>
        <summary>What was judged from sums, and what needs the rows</summary>
        <p>Judged from sums:</p>
        <ul>
          {e.judged.map((s) => <li key={s}>{s}</li>)}
        </ul>
        <p>Not judged (the rows stay in the database):</p>
        <ul>
          {e.not_judged.map((s) => <li key={s}>{s}</li>)}
        </ul>
      </details>
    </div>
  );
}

/** Interval limits joined by "to", as the robust table writes them. */
const TO = { open: "", sep: " to ", close: "" };

/** The unit of residuals (unweighted fits only: weighted residuals carry √w). */
function plainUnit(r: CheckResult): string | null {
  return r.weighted ? null : r.sigma_unit ?? null;
}

/** The robust (sandwich) inference: one row per parameter. */
function RobustTable({ robust: b }: { robust: NonNullable<CheckResult["robust"]> }): VNode {
  const pct = `${fmt(100 * b.level, 4)}%`;
  return (
    <table class="plumb-check-robust">
      <caption>
        Robust inference ({b.type.toUpperCase()}; White 1980, MacKinnon &amp; White 1985), t on{" "}
        {b.df} df
      </caption>
      <thead>
        <tr>
          <th scope="col">Parameter</th>
          <th scope="col">Robust SE</th>
          <th scope="col">t</th>
          <th scope="col">p</th>
          <th scope="col">{pct} interval</th>
        </tr>
      </thead>
      <tbody>
        {Object.entries(b.std_errors).map(([k, se]) => {
          const ci = b.ci?.[k] ?? null;
          return (
            <tr key={k}>
              <th scope="row">{k}</th>
              <td>{formatUncertainty(se)}</td>
              <td>{fmt(b.t?.[k] ?? null)}</td>
              <td>{formatP(b.p_value?.[k] ?? null)}</td>
              <td>{formatIntervalAt(ci, se, null, TO)}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/**
 * Renders a check result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { CheckView } from "./view.tsx";
 * const html = renderToString(CheckView({ name: "judge", result: {
 *   fit: "line", n: 3, p: 2, method: "linear", weighted: false, significance: 0.05, rows: [], fitted: [],
 *   residuals: [], leverage: [], studentized_internal: [], studentized_external: [], cooks_distance: [],
 *   dffits: [], vif: {}, vif_form: "centred", condition_number: 2, durbin_watson: null, durbin_watson_test: null,
 *   breusch_pagan: null, shapiro_wilk: null, jarque_bera: null, reset: null, runs: null, lack_of_fit: null,
 *   press: null, loo_rmse: null, robust: null, findings: [],
 * } }));
 * if (!html.includes("No findings")) throw new Error(html);
 * ```
 */
export function CheckView({ name, result: r }: ViewProps<CheckResult>): VNode {
  // The live page's copy of a large check has its charts counted (`density`) instead of the arrays.
  const charts = r as CheckResult & FigureInput;
  return (
    <section class="plumb-check" aria-label={`Check ${name}`}>
      {r.findings.length === 0
        ? (
          <p class="plumb-check-none">
            No findings for fit <code>{r.fit}</code> (n = {r.n}).
          </p>
        )
        : (
          <ul class="plumb-check-findings">
            {r.findings.map((f) => (
              <li key={f.code} data-code={f.code}>
                <strong>{f.code.replaceAll("-", " ")}</strong>: {f.message}
              </li>
            ))}
          </ul>
        )}
      {r.in_engine !== undefined ? <InEngineNote r={r} /> : (
        <div class="plumb-check-charts">
          {(charts.density !== undefined || (r.fitted?.length ?? 0) > 0) && (
            <DrawnFigure draw={(d) => checkFigure(charts, d)} data={r} />
          )}
        </div>
      )}
      <table class="plumb-check-tests">
        <thead>
          <tr>
            <th scope="col">Test</th>
            <th scope="col">Statistic</th>
            <th scope="col">p</th>
            <th scope="col">Finding when</th>
          </tr>
        </thead>
        <tbody>
          {testRows(r).map((t) => (
            <tr key={t.name}>
              <th scope="row">{t.name}</th>
              <td>{t.statistic}</td>
              <td>{formatP(t.p)}</td>
              <td>{t.rule}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {r.in_engine !== undefined && <InEngineSums r={r} />}
      <p class="plumb-check-summary">
        Condition number {fmt(r.condition_number)}
        {r.in_engine !== undefined && ` (κ of the centred design ${fmt(r.in_engine.kappa)})`}{" "}
        · PRESS {withUnit(fmt(r.press), squaredUnit(plainUnit(r)))} · leave-one-out RMSE{" "}
        {withUnit(fmt(r.loo_rmse), plainUnit(r))}
        {Object.keys(r.vif).length > 0 &&
          ` · VIF${r.vif_form === "uncentred" ? " (uncentred)" : ""} ${
            Object.entries(r.vif).map(([k, v]) => `${k} ${fmtVif(v)}`).join(", ")
          }`}
      </p>
      {r.robust && <RobustTable robust={r.robust} />}
      <p class="plumb-check-note">
        Thresholds are common practice (leverage &gt; 2p/n, |studentized| &gt; 3, Cook's D &gt; 4/n
        and &gt; F(0.5; p, n−p), VIF &gt; 10); tests at the check's significance level.
        {r.vif_form === "uncentred" &&
          " Without an intercept the VIF is uncentred, (XᵀX)ⱼⱼ·((XᵀX)⁻¹)ⱼⱼ: the variance actually inflated (Belsley 1984)."}
        {r.method === "nonlinear" &&
          " For this nonlinear fit, leverage, VIF and the condition number come from the Jacobian at the estimates: local, linearised quantities that describe the model near these estimates only; Breusch–Pagan regresses e² on the fitted values."}
      </p>
    </section>
  );
}

/** The `check` kind's page face: its view, for the live page and the record. */
export const checkPage: PageFace<CheckResult, VNode> = { kind: "check", view: CheckView };
