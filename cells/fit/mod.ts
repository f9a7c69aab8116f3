/**
 * The `fit` cell kind: fits a model equation to a table cell.
 *
 * ```fit root
 * on: cycles
 * model: capacity = q0 - a*sqrt(cycle)
 * ```
 *
 * Models linear in their parameters are solved directly by pivoted QR least
 * squares (kernel/linalg; `solve_linear.ts`, in double-double from the data
 * as printed when small or ill-conditioned); nonlinear models by
 * Levenberg–Marquardt (kernel/optim; `solve_nonlinear.ts`) with exact
 * derivatives, multi-start when start values are missing, and parameter
 * ranges. Rows with a missing value in a column the model uses are left
 * out, with a warning that counts them.
 *
 * @example
 * ```ts
 * import { fitKind } from "./mod.ts";
 * if (fitKind.kind !== "fit" || fitKind.output !== "Fit") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind } from "../../kernel/contract/mod.ts";
import { type FitSpec, parseFitSpec } from "./spec.ts";
import type { Fit } from "./fit.ts";
import { type FitResult, summarizeFit } from "./result.ts";
import { runFit } from "./run.ts";
import { FIT_OPTIONS } from "./spec.ts";
import { fitHistory } from "./history.ts";
import type { RobustResult } from "./_robust_result.ts";
import type { TemplateContext } from "../../kernel/contract/mod.ts";
import { numberColumns, tableFor } from "../shared/template_cells.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatR2,
  formatUncertainty,
  withUnit,
} from "../shared/format.ts";

export type { FitSpec } from "./spec.ts";
export type { Fit } from "./fit.ts";
export type { FitParameterResult, FitResult } from "./result.ts";
export type { FitProblem, FitSolution } from "./problem.ts";
export { refit, refitProblem } from "./refit.ts";
export {
  fitBasis,
  fitFactor,
  fitLeverage,
  fitRobust,
  leverageKnown,
  preciseAt,
  rememberLeverage,
} from "./fit_leverage.ts";
export { type Likelihood, likelihood } from "./_likelihood.ts";
export { parseRange } from "./_parse_limits.ts";

/** The `fit` kind record. */
export const fitKind: CellKind<FitSpec, Fit, FitResult> = {
  kind: "fit",
  body: "yaml",
  output: "Fit",
  description: "fits a model equation to a table by least squares",
  parse: parseFitSpec,
  inputs: (spec) => [{ name: spec.on, accepts: ["Table"], path: ["on"] }],
  // A table kept in its database: a linear fit computes its sums there (_in_engine.ts).
  readsKept: true,
  run: runFit,
  summary: (out, _spec, leaveOut) => summarizeFit(out, leaveOut),
  line: (r) =>
    `${r.model} · n ${r.n} · R² ${formatR2(r.r2)} · ${r.robust ? "s" : "σ"} ${
      withUnit(formatNumber(r.sigma, 3), r.sigma_unit)
    }${r.robust ? ` · ${robustLine(r.robust)}` : ""}`,
  details: fitDetails,
  options: FIT_OPTIONS,
  page: { omit: ["fitted", "residuals", "rows", "rows_missing"] },
  rows: ["fitted", "residuals", "rows", "rows_missing"],
  history: fitHistory,
  template: fitTemplate,
};

/**
 * A fit's estimates for the CLI summary, one line each, rounded as the page
 * rounds them (GUM §7.2.6): `q0 = 2446.9, u 2.0 mAh, 95% 2442.9 … 2450.9`.
 */
function fitDetails(r: FitResult): string[] {
  const level = `${Math.round(r.confidence * 1000) / 10}%`;
  const lines = r.parameters.map((p) => {
    const u = p.std_error;
    const unit = p.unit ? ` ${p.unit}` : "";
    if (u === null) {
      return `${p.name} = ${formatEstimate(p.estimate, null)}${unit} (${
        p.at_bound ? "held at its limit" : "no standard uncertainty"
      })`;
    }
    return `${p.name} = ${formatEstimate(p.estimate, u)}, u ${
      formatUncertainty(u)
    }${unit}, ${level} ${intervalsText(p.ci, p.intervals ?? [], u, p.estimate, "Wald")}`;
  });
  for (const d of r.derived ?? []) {
    const u = d.std_error;
    if (d.estimate === null) {
      lines.push(`${d.name} = ${d.expression}: not finite at the estimates`);
      continue;
    }
    const w = d.intervals[0];
    const ci: [number, number] | null = w.lower === null || w.upper === null
      ? null
      : [w.lower, w.upper];
    lines.push(
      u === null
        ? `${d.name} = ${formatEstimate(d.estimate, null)} (${d.expression})`
        : `${d.name} = ${formatEstimate(d.estimate, u)}, u ${
          formatUncertainty(u)
        } (${d.expression}), ${level} ${intervalsText(ci, d.intervals, u, d.estimate, "delta")}`,
    );
    if (d.note) lines.push(`  note: ${d.note}`);
  }
  if (r.robust !== undefined) lines.push(...robustDetails(r.robust));
  return lines;
}

/** `Huber loss, 3 rows down-weighted` for the one-line summary. */
function robustLine(b: RobustResult): string {
  const k = b.down_weighted.length;
  return `${b.loss_name} loss, ${k} ${k === 1 ? "row" : "rows"} down-weighted`;
}

/** The robust fit in the CLI details: loss, scale, covariance, the rows down-weighted. */
function robustDetails(b: RobustResult): string[] {
  const rows = b.down_weighted.map((d) => `${d.row} (weight ${formatNumber(d.weight, 2)})`);
  return [
    `robust: ${b.loss_name} loss, tuning ${b.tuning}; scale s = ${
      formatNumber(b.scale, 4)
    } (normalised MAD); ${b.covariance_form} covariance; ${b.iterations} reweighted fits from ${b.start}`,
    `  down-weighted (|r|/s > ${b.tuning}): ${rows.length === 0 ? "none" : rows.join(", ")}`,
  ];
}

/** The Wald interval, then every other method's, each named. */
function intervalsText(
  ci: [number, number] | null,
  intervals: readonly { method: string; lower: number | null; upper: number | null }[],
  u: number,
  estimate: number,
  first: string,
): string {
  const wald = formatIntervalAt(ci, u, estimate, { open: "", sep: " … ", close: "" });
  const others = intervals.filter((i) => i.method !== "wald").map((i) =>
    `${METHOD_WORDS[i.method]} ${side(i.lower, u, estimate)} … ${side(i.upper, u, estimate)}`
  );
  return `${others.length > 0 ? `${first} ` : ""}${wald}${others.map((o) => `; ${o}`).join("")}`;
}

/** How each interval method is named in the CLI summary. */
const METHOD_WORDS: Record<string, string> = {
  wald: "Wald",
  profile: "profile",
  "bootstrap-percentile": "bootstrap percentile",
  "bootstrap-bca": "bootstrap BCa",
};

/** One end of an interval at the estimate's digits; "open" for a side that is not bounded. */
function side(v: number | null, u: number, estimate: number): string {
  if (v === null) return "open";
  return formatIntervalAt([v, v], u, estimate, { open: "", sep: "|", close: "" }).split("|")[0];
}

/** A new fit: a straight line through the last table's last two number columns. */
function fitTemplate(ctx: TemplateContext): string {
  const table = tableFor(ctx, 2);
  const cols = numberColumns(table);
  const [x, y] = cols.length >= 2 ? cols.slice(-2) : ["x", "y"];
  return `on: ${table?.name ?? "table1"}\nmodel: ${y} = a + b*${x}\n`;
}
