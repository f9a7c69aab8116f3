/**
 * The check of a fit computed in its database (issue 18): the rows and their
 * residuals stay there, so the check judges what sums can show, from the
 * numbers the fit brought back (cells/fit/_in_engine_moments.ts computes them
 * in the engine, each as the in-memory check computes it from rows):
 *
 * | question            | from sums                                                  |
 * | ------------------- | ---------------------------------------------------------- |
 * | constant variance   | Breusch–Pagan (Koenker's form, or the original from it)    |
 * | independence        | Durbin–Watson in order_by's order, beta law; else not done |
 * | leverage            | largest hᵢ, counts over 2p/n and 3p/n                      |
 * | outliers, influence | largest \|tᵢ\| and count beyond ±3; largest Cook's D, count |
 * | normality           | skewness and kurtosis of √w·e, Jarque–Bera                 |
 * | collinearity        | VIF per term, σmax/σmin of √W·X, κ of the centred design   |
 *
 * What needs the rows themselves (the residual panels, Shapiro–Wilk's sorted
 * sample, RESET's refit, the runs test's signs, lack of fit's replicate
 * groups, HC covariances) is listed as not judged, with why. Findings use the
 * in-memory check's rules and words (findings.ts); a finding about rows
 * counts them instead of naming them.
 *
 * Breusch–Pagan's original form from Koenker's: both are of the same
 * auxiliary R² (Koenker n·R², original ESS·(n/Σf)²/2 with ESS = R²·TSS_f), and
 * TSS_f = Σu⁴ − (Σu²)²/n for f = u² = w·e², so one is the other times
 * TSS_f·n/(2·RSS²) (Breusch & Pagan 1979; Koenker 1981; kernel/stats
 * breusch_pagan.ts).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { chiSquared, fisherF } from "../../kernel/stats/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { InEngineRecord } from "../fit/_in_engine.ts";
import type { CheckSpec } from "./spec.ts";
import type { CheckResult, CheckRows, CheckScalars, Finding, InEngineCheck } from "./result.ts";
import { findingsOf } from "./findings.ts";
import { fmt } from "./_format.ts";

const ENGINES = { duckdb: "DuckDB", postgres: "PostgreSQL" } as const;

/** Said of a finding about rows that stay in the database. */
const COUNTED = "The rows stay in the database, so they are counted, not named.";

/**
 * The check of an in-engine fit.
 *
 * @param fit The fit, with `inEngine` (no per-row residuals).
 * @param spec The check's options.
 * @returns The result (its per-row fields empty) and empty per-row arrays.
 * @throws {CellError} For `robust:` (HC covariances need each row's residual and leverage here).
 */
export function diagnoseInEngine(
  fit: Fit & { inEngine: InEngineRecord },
  spec: CheckSpec,
): { result: CheckScalars; perRow: CheckRows } {
  const d = judgedOf(fit.inEngine, spec);
  if (spec.robust !== null) {
    throw new CellError(
      `Cannot give robust: ${spec.robust} for "${spec.fit}": it was fitted in the database, and its rows stay there; heteroscedasticity-consistent covariances are not computed there yet: remove robust, or give the table keep_rows: memory`,
      ["robust"],
    );
  }
  const n = fit.statistics.n, p = fit.parameters.length;
  const none = new Float64Array(0);
  const perRow: CheckRows = {
    rows: none,
    fitted: none,
    residuals: none,
    leverage: none,
    studentized_internal: none,
    studentized_external: none,
    cooks_distance: none,
    dffits: none,
  };
  const m = d.residual_moments;
  const base: Omit<CheckScalars, "findings"> = {
    fit: spec.fit,
    n,
    p,
    method: "linear",
    weighted: fit.weighted,
    significance: spec.significance,
    sigma_unit: fit.units?.response ?? null,
    vif: d.vif,
    vif_form: d.vif_form,
    condition_number: d.condition_number,
    durbin_watson: d.durbin_watson,
    durbin_watson_test: d.durbin_watson === null ? null : d.durbin_watson_test,
    breusch_pagan: breuschPaganAs(d, spec.varianceTest, n, fit.statistics.rss),
    shapiro_wilk: null,
    jarque_bera: m.jarque_bera,
    reset: null,
    runs: null,
    lack_of_fit: null,
    press: d.influence.press,
    loo_rmse: d.influence.loo_rmse,
    robust: null,
    in_engine: inEngineOf(d, n, p, fit.weighted),
  };
  const findings = [
    ...rowFindings(base.in_engine!, n, p),
    ...findingsOf({ ...base, ...perRow }).map((f) => inOrder(f, d.order_by)),
  ];
  return { result: { ...base, findings }, perRow };
}

/** The record with every number a check reads (_in_engine_moments.ts). */
type Judged =
  & InEngineRecord
  & Required<
    Pick<
      InEngineRecord,
      | "residual_moments"
      | "influence"
      | "vif"
      | "vif_form"
      | "condition_number"
      | "durbin_watson_test"
    >
  >;

function judgedOf(d: InEngineRecord, spec: CheckSpec): Judged {
  if (
    d.residual_moments === undefined || d.influence === undefined || d.vif === undefined ||
    d.vif_form === undefined || d.condition_number === undefined ||
    d.durbin_watson_test === undefined
  ) {
    throw new CellError(
      `Cannot check "${spec.fit}": it was fitted in the database without the sums a check reads (residual moments, influence, collinearity); run the fit again`,
      ["fit"],
    );
  }
  return d as Judged;
}

/** The in-engine part of the result: the sentence, what was judged and what not, the summaries. */
function inEngineOf(d: Judged, n: number, p: number, weighted: boolean): InEngineCheck {
  const engine = ENGINES[d.engine];
  const e = weighted ? "√w·e" : "the residuals";
  const judged = [
    `constant variance: Breusch–Pagan on the model's terms`,
    d.durbin_watson === null
      ? null
      : `independence: Durbin–Watson in the order of "${d.order_by}" (beta approximation to its null law)`,
    `leverage: the largest, and how many rows exceed 2p/n and 3p/n`,
    `outliers and influence: the largest externally studentized residual and Cook's distance, and how many rows exceed ±3 and the cut`,
    `normality: skewness and kurtosis of ${e} (Jarque–Bera)`,
    `collinearity: VIF per term and the condition number`,
    `PRESS and the leave-one-out RMSE`,
  ].filter((s): s is string => s !== null);
  const notJudged = [
    d.durbin_watson === null
      ? `independence (Durbin–Watson): not computed: needs an order column (give the table order_by)`
      : null,
    "the residual plots, Cook's distance by row and the normal Q–Q plot: they draw each row",
    "Shapiro–Wilk: it sorts the residuals",
    "RESET: it refits with ŷ² and ŷ³",
    "the runs test: it reads the residuals' signs one by one",
    "lack of fit: it groups replicate rows",
  ].filter((s): s is string => s !== null);
  return {
    engine: d.engine,
    note: `The ${
      n.toLocaleString("en-US")
    } rows stay in ${engine}, so no panel of rows can be drawn; everything below was judged from sums computed there.`,
    judged,
    not_judged: notJudged,
    order_by: d.order_by,
    kappa: d.kappa,
    leverage: {
      max: d.leverage.max,
      over_2p: d.leverage.over2p,
      over_3p: d.leverage.over3p,
      limit_2p: 2 * p / n,
      limit_3p: 3 * p / n,
    },
    influence: d.influence,
    residual_moments: {
      mean: d.residual_moments.mean,
      m2: d.residual_moments.m2,
      m3: d.residual_moments.m3,
      m4: d.residual_moments.m4,
      skewness: d.residual_moments.skewness,
      kurtosis: d.residual_moments.kurtosis,
    },
  };
}

/** Breusch–Pagan in the form asked, from the form the engine's sums gave (module notes). */
function breuschPaganAs(
  d: Judged,
  variant: CheckSpec["varianceTest"],
  n: number,
  rss: number,
): CheckResult["breusch_pagan"] {
  const b = d.breusch_pagan;
  if (b === null) return null;
  if (b.variant === variant) return { ...b, regressors: "design" };
  const tssF = d.residual_moments.sum_fourth_raw - rss * rss / n;
  const ratio = tssF * n / (2 * rss * rss); // original / Koenker
  if (!(ratio > 0) || !Number.isFinite(ratio)) return null;
  const statistic = variant === "original" ? b.statistic * ratio : b.statistic / ratio;
  return {
    ...b,
    variant,
    statistic,
    p_value: chiSquared(b.df).upper(statistic),
    regressors: "design",
  };
}

/** Findings about rows, counted from the engine's summaries (findings.ts's rules). */
function rowFindings(e: InEngineCheck, n: number, p: number): Finding[] {
  const out: Finding[] = [];
  const add = (code: Finding["code"], message: string) => out.push({ code, rows: [], message });
  const f = e.influence,
    rows = (k: number) => `${k.toLocaleString("en-US")} ${k === 1 ? "row" : "rows"}`;
  const have = (k: number) => (k === 1 ? "has" : "have");
  if (f.leverage_one > 0) {
    add(
      "determined-by-one-row",
      `${cap(rows(f.leverage_one))} ${
        have(f.leverage_one)
      } leverage 1: each alone determines a parameter (the fit passes through it exactly), so its studentized residual and Cook's distance do not exist. ${COUNTED}`,
    );
  }
  if (f.studentized_over_3 > 0) {
    add(
      "outlier",
      `${cap(rows(f.studentized_over_3))} ${
        have(f.studentized_over_3)
      } externally studentized residuals beyond ±3 (common practice); the largest in size is ${
        fmt(f.max_abs_studentized)
      }. ${COUNTED}`,
    );
  }
  if (f.cooks_over_cut > 0 && n > p) {
    const median = fisherF(p, n - p).quantile(0.5);
    add(
      "influential",
      `${cap(rows(f.cooks_over_cut))} ${have(f.cooks_over_cut)} Cook's distance above 4/n = ${
        fmt(4 / n)
      } and the median of F(${p}, ${n - p}) = ${fmt(median)} (common practice); the largest is ${
        fmt(f.max_cooks_distance)
      }. ${COUNTED}`,
    );
  }
  const l = e.leverage;
  const high = l.limit_2p < 1 ? l.over_2p - f.leverage_one : 0;
  if (high > 0) {
    const over3 = l.limit_3p < 1 ? Math.max(0, l.over_3p - f.leverage_one) : 0;
    add(
      "high-leverage",
      `${cap(rows(high))} ${have(high)} leverage above 2p/n = ${
        fmt(l.limit_2p, 2)
      } (common practice)${
        over3 > 0
          ? `, ${over3.toLocaleString("en-US")} of them above 3p/n = ${fmt(l.limit_3p, 2)}`
          : ""
      }; the largest is ${fmt(l.max, 2)}. ${COUNTED}`,
    );
  }
  return out;
}

/** Durbin–Watson's findings say "in row order"; here the order is order_by's. */
function inOrder(f: Finding, order: string | null): Finding {
  if (order === null || !f.message.includes("in row order")) return f;
  return { ...f, message: f.message.replaceAll("in row order", `in the order of "${order}"`) };
}

function cap(s: string): string {
  return s[0].toUpperCase() + s.slice(1);
}
