/**
 * The `check` cell kind: judges a fit with influence measures, residual
 * tests and findings in plain sentences.
 *
 * ```check judge
 * fit: line
 * ```
 *
 * @example
 * ```ts
 * import { checkKind } from "./mod.ts";
 * if (checkKind.kind !== "check" || checkKind.output !== "Diagnostics") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { rowValues } from "../../kernel/arrays.ts";
import type { CellKind } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { type CheckSpec, parseCheckSpec } from "./spec.ts";
import { type CheckResult, type Diagnostics, ROW_FIELDS, type RowField } from "./result.ts";
import { diagnose } from "./diagnose.ts";
import { type CensoredCheck, censoredForCheck } from "./censored.ts";
import { diagnoseInEngine } from "./in_engine.ts";
import { CHECK_OPTIONS } from "./spec.ts";
import { checkHistory } from "./history.ts";
import { type CheckChartInput, checkDensity } from "./density.ts";
import { cellsOf } from "../shared/template_cells.ts";

export type { CheckSpec } from "./spec.ts";
export type { CheckResult, Diagnostics, Finding } from "./result.ts";

type InEngineFit = Fit & { inEngine: NonNullable<Fit["inEngine"]> };

/** The `check` kind record. */
export const checkKind: CellKind<CheckSpec, Diagnostics, CheckResult> = {
  kind: "check",
  body: "yaml",
  output: "Diagnostics",
  description: "judges a fit: leverage, influence, residual tests and findings",
  // A fit computed in its database is judged from the sums it brought back (in_engine.ts).
  readsKept: true,
  parse: parseCheckSpec,
  inputs: (spec) => [{ name: spec.fit, accepts: ["Fit"], path: ["fit"] }],
  run: (spec, ctx) => {
    const fit = ctx.inputs[spec.fit] as Fit | undefined;
    if (!fit || fit.type !== "Fit") {
      throw new CellError(`Cannot check "${spec.fit}": it is not a fit cell`, ["fit"]);
    }
    if (fit.inEngine !== undefined) {
      return { type: "Diagnostics", ...diagnoseInEngine(fit as InEngineFit, spec) };
    }
    if (fit.residuals.length <= fit.design.length) {
      throw new CellError(
        `Cannot check "${spec.fit}": ${fit.residuals.length} rows for ${fit.design.length} parameters leave no residual degrees of freedom`,
        ["fit"],
      );
    }
    if (fit.robust !== undefined) robustFitNote(spec, fit, ctx.warn);
    if (fit.censoring !== undefined && fit.below !== undefined) {
      const c = censoredForCheck(fit as Fit & { below: Uint8Array }, ctx.settings.seed);
      ctx.warn(censoredNote(spec.fit, c.record));
      const d = diagnose(c.fit, spec, ctx.settings.confidence);
      return { type: "Diagnostics", result: { ...d.result, censored: c.record }, perRow: d.perRow };
    }
    return { type: "Diagnostics", ...diagnose(fit, spec, ctx.settings.confidence) };
  },
  summary: summaryOf,
  line: lineOf,
  options: CHECK_OPTIONS,
  history: checkHistory,
  page: {
    omit: ["studentized_external", "dffits"],
    condense: condenseCharts,
    // The output's Float64Arrays (NaN: none) read as the result's arrays (null: none):
    // checkDensity reads them by index and counts finite values only.
    condenseOutput: (out) =>
      condensed(checkDensity({ fit: out.result.fit, ...out.perRow } as unknown as CheckChartInput)),
  },
  rows: ROW_FIELDS,
  template: (ctx) =>
    `fit: ${cellsOf(ctx, "Fit").at(-1)?.name ?? "fit1"}
`,
};

/**
 * A robust fit (cells/fit/_robust.ts) is judged by its residuals as they are;
 * the check says so, and refuses HC covariances, which are made for
 * least-squares residuals (the fit's own covariance is already a sandwich).
 */
function robustFitNote(spec: CheckSpec, fit: Fit, warn: (m: string) => void): void {
  const b = fit.robust!;
  if (spec.robust !== null) {
    throw new CellError(
      `Cannot give robust: ${spec.robust} for "${spec.fit}": it is an M-estimate (loss ${b.loss}), whose standard errors already come from Huber's sandwich; HC covariances are made for least-squares residuals: remove robust`,
      ["robust"],
    );
  }
  let down = 0;
  for (const u of b.scaled) if (Math.abs(u) > b.tuning) down++;
  warn(
    `"${spec.fit}" is a robust fit (${b.loss} loss, tuning ${b.tuning}, ${down} ${
      down === 1 ? "row" : "rows"
    } down-weighted): its residuals are judged as they are, with least-squares leverage, Cook's distance and tests; rows the loss down-weighted stand out here by design`,
  );
}

/** What the check says of a fit with rows below a detection limit. */
function censoredNote(name: string, c: CensoredCheck): string {
  const rows = `${c.rows_below} ${c.rows_below === 1 ? "row" : "rows"} below a detection limit`;
  return c.residuals === "substituted"
    ? `"${name}" substituted a fraction of the limit in its ${rows}: those values are judged here as if they had been measured, which flatters or hides what the limit hides; fit by maximum likelihood (leave out substitute) to judge them as censored`
    : `"${name}" is a censored fit (${rows}): those rows enter with randomized quantile residuals (Dunn & Smyth 1996), drawn below each limit from the fitted normal with the document's seed ${c.seed}; the tests of the residuals keep their meaning, while Cook's distance and the studentized residuals are least-squares formulas at the ML estimates, so read them as a guide`;
}

/**
 * The RUN-JSON `check` object: the per-row fields asked for made plain arrays
 * (NaN: null), placed after `sigma_unit` as they always were.
 */
function summaryOf(
  out: Diagnostics,
  _spec: CheckSpec,
  leaveOut?: ReadonlySet<string>,
): CheckResult {
  const { fit, n, p, method, weighted, significance, sigma_unit, ...rest } = out.result;
  const rows: Partial<Record<RowField, (number | null)[]>> = {};
  for (const f of ROW_FIELDS) if (!leaveOut?.has(f)) rows[f] = rowValues(out.perRow[f], true);
  return {
    fit,
    n,
    p,
    method,
    weighted,
    significance,
    sigma_unit,
    ...rows,
    ...rest,
  } as CheckResult;
}

function lineOf(r: CheckResult): string {
  if (r.findings.length === 0) return "no findings";
  const parts = r.findings.map((f) => {
    const label = f.code.replaceAll("-", " ");
    if (f.rows.length === 0) return label;
    const shown = f.rows.slice(0, 3).join(", ") + (f.rows.length > 3 ? ", …" : "");
    return `${label} (row${f.rows.length > 1 ? "s" : ""} ${shown})`;
  });
  return `${r.findings.length} finding${r.findings.length > 1 ? "s" : ""}: ${parts.join(", ")}`;
}

/** The per-row arrays the residual charts read, replaced by their counts on a large check. */
const CHART_ARRAYS = [
  "rows",
  "fitted",
  "residuals",
  "studentized_internal",
  "leverage",
  "cooks_distance",
];

/** A large check's charts counted once (`density`) instead of five per-row arrays. */
function condenseCharts(r: CheckResult) {
  const fields = r as unknown as Record<string, unknown>;
  // Typed arrays too: a complete result read back on the main thread has its long
  // per-row fields as Float64Array (kernel/worker/protocol.ts, packRows).
  const list = (v: unknown) => Array.isArray(v) || ArrayBuffer.isView(v);
  if (!CHART_ARRAYS.every((f) => list(fields[f]))) return null;
  return condensed(checkDensity(r as unknown as CheckChartInput));
}

function condensed(density: ReturnType<typeof checkDensity>) {
  return density === null ? null : { add: { density }, omit: CHART_ARRAYS };
}
