/**
 * Findings: plain sentences with the evidence and the threshold used.
 *
 * Every threshold below is common practice, no source beyond the textbooks
 * that popularised it; each message says which rule it used:
 *
 * | code                  | rule                                                                |
 * | --------------------- | ------------------------------------------------------------------- |
 * | determined-by-one-row | leverage 1 (1 − h < 1e-10)                                          |
 * | outlier               | externally studentized residual beyond ±3                           |
 * | influential           | Cook's D > 4/n and > F(0.5; p, n − p), the median of F             |
 * | high-leverage         | h > 2p/n (Belsley, Kuh & Welsch 1980, §2.1), rows with h = 1 aside  |
 * | curvature             | RESET p < α, lack-of-fit p < α, or too few sign runs in x order     |
 * | non-constant-variance | Breusch–Pagan p < α (on ŷ for a nonlinear fit)                      |
 * | non-normal            | Shapiro–Wilk p < α (Jarque–Bera when n is outside 3..5000)          |
 * | autocorrelation       | Durbin–Watson p < α against positive correlation (exact law under   |
 * |                       | the fit's design), or too few sign runs in row order                 |
 * | alternation           | Durbin–Watson p < α against negative correlation, or too many sign  |
 * |                       | runs in row order (neighbouring residuals alternate in sign)        |
 * | collinearity          | VIF > 10                                                            |
 *
 * α is the check's `significance` (default 0.05). For a nonlinear fit the
 * leverage and VIF findings say that these come from the Jacobian at the
 * estimates: local, linearised quantities.
 *
 * @module
 */
import { fisherF } from "../../kernel/stats/mod.ts";
import type { CheckRows, CheckScalars, Finding } from "./result.ts";
import { fmt, fmtVif } from "./_format.ts";
import { formatPPhrase } from "../shared/format.ts";
import { rowsInFull } from "../shared/rows.ts";

/** Every diagnostic but the findings, the per-row fields as the worker keeps them (NaN: none). */
type Base = Omit<CheckScalars, "findings"> & CheckRows;

/**
 * The findings of a check, in order of seriousness.
 *
 * @param r Every diagnostic but the findings.
 * @returns One finding per code that applies (its evidence sentences joined).
 */
export function findingsOf(r: Base): Finding[] {
  const out: Finding[] = [];
  const add = (code: Finding["code"], rows: number[], message: string) => {
    const f = out.find((x) => x.code === code);
    if (f) {
      f.rows = [...new Set([...f.rows, ...rows])].sort((a, b) => a - b);
      f.message += ` ${message}`;
    } else out.push({ code, rows, message });
  };
  rowFindings(r, add);
  testFindings(r, add);
  return out;
}

type Add = (code: Finding["code"], rows: number[], message: string) => void;

function pick(r: Base, test: (i: number) => boolean): number[] {
  const out: number[] = [];
  for (let i = 0; i < r.leverage.length; i++) if (test(i)) out.push(i);
  return out;
}

/** Rows a sentence names with their values; the finding's `rows` keep every one. */
const NAMED_ROWS = 8;

/**
 * The sentence of a finding about many rows (more than {@link NAMED_ROWS}):
 * how many, the rule, then the largest few with their values, largest first.
 * A 10,000-row fit can flag hundreds of rows by a rule of thumb; listing them
 * all in prose helps nobody.
 */
function manyRows(
  r: Base,
  idx: number[],
  size: (i: number) => number,
  show: (i: number) => string,
  what: string,
  rule: string,
): string {
  const top = largest(idx, size, NAMED_ROWS);
  return `${idx.length} rows have ${what} ${rule}; the ${NAMED_ROWS} largest: ${
    top.map((i) => `row ${r.rows[i]} (${show(i)})`).join(", ")
  }.`;
}

/**
 * The k rows of largest size, largest first (ties in row order): one pass
 * keeping the k best in order, so a rule that flags 100,000 rows of a
 * million costs no sort of them.
 */
function largest(idx: readonly number[], size: (i: number) => number, k: number): number[] {
  const top: number[] = [], sizes: number[] = [];
  for (const i of idx) {
    const s = size(i);
    // Rows come in increasing order, so a tie goes after the rows already kept.
    let at = top.length;
    while (at > 0 && sizes[at - 1] < s) at--;
    if (at >= k) continue;
    top.splice(at, 0, i);
    sizes.splice(at, 0, s);
    if (top.length > k) {
      top.pop();
      sizes.pop();
    }
  }
  return top;
}

function rowFindings(r: Base, add: Add): void {
  const { n, p } = r;
  const one = pick(r, (i) => Number.isNaN(r.studentized_internal[i]) && 1 - r.leverage[i] < 1e-10);
  if (one.length) {
    add(
      "determined-by-one-row",
      one.map((i) => r.rows[i]),
      `${cap(rowsInFull(one.map((i) => r.rows[i])))} ${
        one.length > 1 ? "have" : "has"
      } leverage 1: ${
        one.length > 1 ? "each" : "it"
      } alone determines a parameter (the fit passes through it exactly), so its studentized residuals, Cook's distance and DFFITS do not exist.`,
    );
  }
  // NaN (no residual: leverage 1) compares false: never flagged here.
  const out = pick(r, (i) => Math.abs(r.studentized_external[i]) > 3);
  if (out.length) {
    add(
      "outlier",
      out.map((i) => r.rows[i]),
      out.length > NAMED_ROWS
        ? manyRows(
          r,
          out,
          (i) => Math.abs(r.studentized_external[i]),
          (i) => fmt(r.studentized_external[i]),
          "externally studentized residuals",
          "beyond ±3 (common practice)",
        )
        : `${cap(rowsInFull(out.map((i) => r.rows[i])))} ${
          verb(out)
        } externally studentized residual${out.length > 1 ? "s" : ""} ${
          out.map((i) => fmt(r.studentized_external[i])).join(", ")
        } (beyond ±3, common practice).`,
    );
  }
  if (n > p) {
    const median = fisherF(p, n - p).quantile(0.5);
    const cut = Math.max(4 / n, median);
    const inf = pick(r, (i) => r.cooks_distance[i] > cut);
    if (inf.length) {
      const rule = `above 4/n = ${fmt(4 / n)} and the median of F(${p}, ${n - p}) = ${
        fmt(median)
      } (common practice)`;
      add(
        "influential",
        inf.map((i) => r.rows[i]),
        inf.length > NAMED_ROWS
          ? manyRows(
            r,
            inf,
            (i) => r.cooks_distance[i],
            (i) => fmt(r.cooks_distance[i]),
            "Cook's distance",
            rule,
          )
          : `${cap(rowsInFull(inf.map((i) => r.rows[i])))} ${verb(inf)} Cook's distance ${
            inf.map((i) => fmt(r.cooks_distance[i])).join(", ")
          } (> 4/n = ${fmt(4 / n)} and > the median of F(${p}, ${n - p}) = ${
            fmt(median)
          }, common practice).`,
      );
    }
  }
  const lev = 2 * p / n;
  const high = lev < 1 ? pick(r, (i) => r.leverage[i] > lev && 1 - r.leverage[i] >= 1e-10) : [];
  const local = r.method === "nonlinear" ? `; ${LINEARISED}` : "";
  if (high.length) {
    add(
      "high-leverage",
      high.map((i) => r.rows[i]),
      high.length > NAMED_ROWS
        ? manyRows(
          r,
          high,
          (i) => r.leverage[i],
          (i) => fmt(r.leverage[i], 2),
          "leverage",
          `above 2p/n = ${fmt(lev, 2)} (common practice${local})`,
        )
        : `${cap(rowsInFull(high.map((i) => r.rows[i])))} ${verb(high)} leverage ${
          high.map((i) => fmt(r.leverage[i], 2)).join(", ")
        } (> 2p/n = ${fmt(lev, 2)}, common practice${local}).`,
    );
  }
}

function testFindings(r: Base, add: Add): void {
  const a = r.significance, at = `(< ${a}, the check's significance level)`;
  if (r.reset && r.reset.p_value < a) {
    add(
      "curvature",
      [],
      `Ramsey's RESET finds curvature the model misses: F = ${
        fmt(r.reset.f)
      } on ${r.reset.df1} and ${r.reset.df2} df, ${formatPPhrase(r.reset.p_value)} ${at}.`,
    );
  }
  if (r.lack_of_fit && r.lack_of_fit.p_value < a) {
    const l = r.lack_of_fit;
    add(
      "curvature",
      [],
      `The lack-of-fit test against replicate rows finds the model misses the mean: F = ${
        fmt(l.f)
      } on ${l.df1} and ${l.df2} df, ${formatPPhrase(l.p_value)} ${at}.`,
    );
  }
  if (r.runs && r.runs.p_value < a && (r.runs.z < 0 || r.runs.order !== "x")) {
    const where = r.runs.order === "x" ? "in order of the predictor" : "in row order";
    const few = r.runs.z < 0;
    add(
      !few ? "alternation" : r.runs.order === "x" ? "curvature" : "autocorrelation",
      [],
      `Residual signs ${where} form ${few ? "too few" : "too many"} runs: ${r.runs.runs} where ${
        fmt(r.runs.expected)
      } are expected (runs test, ${formatPPhrase(r.runs.p_value)} ${at}).`,
    );
  }
  if (r.breusch_pagan && r.breusch_pagan.p_value < a) {
    const b = r.breusch_pagan;
    const [what, on] = b.regressors === "fitted"
      ? ["the fitted values", ", on ŷ"]
      : ["the predictors", ""];
    add(
      "non-constant-variance",
      [],
      `The residual variance changes with ${what}: Breusch–Pagan (${b.variant}${on}) statistic ${
        fmt(b.statistic)
      } on ${b.df} df, ${formatPPhrase(b.p_value)} ${at}.`,
    );
  }
  normality(r, add, at);
  durbinWatsonFindings(r, add, at, a);
  collinearity(r, add);
}

/** Said of leverage and VIF of a nonlinear fit. */
const LINEARISED = "from the Jacobian at the estimates, a local, linearised measure";

function collinearity(r: Base, add: Add): void {
  const vif = Object.entries(r.vif).filter(([, v]) => v === null || v > 10);
  if (vif.length === 0) return;
  const names = vif.map(([k]) => `"${k}"`).join(", ");
  const values = vif.map(([, v]) => fmtVif(v)).join(", ");
  const form = r.vif_form === "uncentred" ? "uncentred, the model has no intercept; " : "";
  add(
    "collinearity",
    [],
    r.method === "nonlinear"
      ? `At the estimates the model's derivatives by ${names} are nearly combinations of the others: VIF ${values} (${form}${LINEARISED}; > 10, common practice).`
      : `The terms of ${names} are nearly combinations of the others: VIF ${values} (${form}> 10, common practice).`,
  );
}

function normality(r: Base, add: Add, at: string): void {
  const a = r.significance;
  if (r.shapiro_wilk) {
    if (r.shapiro_wilk.p_value < a) {
      add(
        "non-normal",
        [],
        `The residuals do not look normal: Shapiro–Wilk W = ${fmt(r.shapiro_wilk.w, 4)}, ${
          formatPPhrase(r.shapiro_wilk.p_value)
        } ${at}.`,
      );
    }
  } else if (r.jarque_bera && r.jarque_bera.p_value < a) {
    add(
      "non-normal",
      [],
      `The residuals do not look normal: Jarque–Bera ${fmt(r.jarque_bera.statistic)}, ${
        formatPPhrase(r.jarque_bera.p_value)
      } ${at}.`,
    );
  }
}

function verb(rows: number[]): string {
  return rows.length > 1 ? "have" : "has";
}

function cap(s: string): string {
  return s[0].toUpperCase() + s.slice(1);
}

/** Durbin–Watson in either direction: d low (positive correlation) or high (alternation). */
function durbinWatsonFindings(
  r: Base,
  add: Add,
  at: string,
  a: number,
): void {
  const t = r.durbin_watson_test;
  if (!t) return;
  const law = t.distribution === "exact" ? "exact law for this design" : "beta approximation";
  const says = (p: number) =>
    `Durbin–Watson ${fmt(r.durbin_watson)} where ${fmt(t.expected)} is expected without ` +
    `correlation (one-sided, ${law}, ${formatPPhrase(p)} ${at})`;
  if (t.p_value < a) {
    add(
      "autocorrelation",
      [],
      `Neighbouring residuals in row order are positively correlated: ${says(t.p_value)}.`,
    );
  } else if (t.p_value_negative < a) {
    add(
      "alternation",
      [],
      `Neighbouring residuals in row order alternate in sign (negative correlation): ${
        says(t.p_value_negative)
      }.`,
    );
  }
}
