/**
 * The check's face in the run history: its findings (code, rows, message)
 * and main test statistics; what changed between two records: findings that
 * appeared or went, a finding that now names other rows, and a test whose
 * p-value crossed the check's significance level without a finding saying
 * so (the lack-of-fit test, when RESET or the runs test keep the curvature
 * finding either way).
 *
 * Records of older versions may lack fields: a comparison that needs a
 * missing field is skipped, never made against zero.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace } from "../../kernel/contract/mod.ts";
import type { CheckSpec } from "./spec.ts";
import type { CheckResult, Diagnostics, Finding } from "./result.ts";
import { rowsInWords } from "../shared/row_list.ts";
import { formatNumber, formatP } from "../shared/format.ts";

/** At most this many rows of a finding are kept (the history stays small). */
export const ROWS_KEPT = 50;

/** What a record keeps of one finding. */
export interface FindingKept {
  code: string;
  /** The rows it names, the first {@link ROWS_KEPT}. */
  rows: number[];
  /** How many rows it names in all. */
  row_count: number;
  message: string;
}

/** What a record keeps of a check. */
export interface CheckKept {
  fit: string;
  n: number;
  /** The level at which the check's tests make findings. */
  significance: number;
  findings: FindingKept[];
  durbin_watson: number | null;
  /** P(d ≤ observed): the Durbin–Watson test against positive correlation. */
  durbin_watson_p: number | null;
  breusch_pagan_p: number | null;
  shapiro_wilk_p: number | null;
  condition_number: number | null;
  lack_of_fit_p: number | null;
}

function keep(_out: Diagnostics, _spec: CheckSpec, r: CheckResult): CheckKept {
  return {
    fit: r.fit,
    n: r.n,
    significance: r.significance,
    findings: r.findings.map((f) => ({
      code: f.code,
      rows: f.rows.slice(0, ROWS_KEPT),
      row_count: f.rows.length,
      message: f.message,
    })),
    durbin_watson: r.durbin_watson,
    durbin_watson_p: r.durbin_watson_test?.p_value ?? null,
    breusch_pagan_p: r.breusch_pagan?.p_value ?? null,
    shapiro_wilk_p: r.shapiro_wilk?.p_value ?? null,
    condition_number: r.condition_number,
    lack_of_fit_p: r.lack_of_fit?.p_value ?? null,
  };
}

/** A finding's code in words, where the code alone reads badly. */
const NAMES: Partial<Record<Finding["code"], string>> = {
  "determined-by-one-row": "rows that alone determine a parameter",
  "high-leverage": "high leverage",
  "non-constant-variance": "non-constant variance",
  "non-normal": "non-normal residuals",
};
const words = (code: string) => NAMES[code as Finding["code"]] ?? code.replaceAll("-", " ");

/**
 * The tests whose p-value a record keeps, and the finding each one feeds
 * (findings.ts): a crossing is said only when that finding did not appear
 * or go in the same comparison.
 */
const TESTS = [
  { key: "breusch_pagan_p", name: "Breusch–Pagan test", finding: "non-constant-variance" },
  { key: "shapiro_wilk_p", name: "Shapiro–Wilk test", finding: "non-normal" },
  { key: "lack_of_fit_p", name: "lack-of-fit F test", finding: "curvature" },
  {
    key: "durbin_watson_p",
    name: "Durbin–Watson test against positive correlation",
    finding: "autocorrelation",
  },
] as const;

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
const isRows = (x: unknown): x is number[] => Array.isArray(x) && x.every(num);

/** The findings of a kept value by code; null when it kept none (an older record). */
function findingsOf(k: Partial<CheckKept> | null): Map<string, Partial<FindingKept>> | null {
  if (!Array.isArray(k?.findings)) return null;
  const kept = k.findings.filter((f) => typeof f?.code === "string");
  return new Map(kept.map((f) => [f.code, f]));
}

/** The rows a finding names, in words; "" when the record did not keep them. */
function named(f: Partial<FindingKept>): string {
  if (!isRows(f.rows) || f.rows.length === 0) return "";
  const all = num(f.row_count) && f.row_count > f.rows.length ? `, ${f.row_count} rows in all` : "";
  return `${rowsInWords(f.rows)}${all}`;
}

function changes(a: CheckKept, b: CheckKept, ctx: ChangeContext): Change[] {
  const before = findingsOf(a), after = findingsOf(b);
  if (before === null || after === null) return [];
  const cell = ctx.cell;
  if (typeof a.fit === "string" && typeof b.fit === "string" && a.fit !== b.fit) {
    return [{
      code: "fit-changed",
      weight: "notable",
      sentence: `${cell} now checks ${b.fit} (was ${a.fit}); its findings are not compared.`,
      numbers: { before: a.fit, after: b.fit },
    }];
  }
  const out: Change[] = [];
  for (const [code, f] of after) {
    const was = before.get(code);
    if (!was) {
      out.push({
        code: "finding-appeared",
        weight: "notable",
        sentence: `${cell}: new finding, ${words(code)}. ${f.message ?? ""}`.trimEnd(),
        numbers: { finding: code, rows: isRows(f.rows) ? f.rows : null },
      });
    } else if (isRows(was.rows) && isRows(f.rows) && !sameRows(was, f)) {
      out.push({
        code: "finding-rows-changed",
        weight: "minor",
        sentence: `${cell}: the finding of ${words(code)} now names ${named(f) || "no rows"} (was ${
          named(was) || "no rows"
        }).`,
        numbers: { finding: code, before: was.rows, after: f.rows },
      });
    }
  }
  for (const [code, was] of before) {
    if (after.has(code)) continue;
    const rows = named(was);
    out.push({
      code: "finding-gone",
      weight: "notable",
      sentence: `${cell}: the finding of ${words(code)}${
        rows ? ` (${rows})` : ""
      } is no longer made.`,
      numbers: { finding: code, rows: isRows(was.rows) ? was.rows : null },
    });
  }
  const covered = new Set(
    [...after.keys(), ...before.keys()].filter((c) => before.has(c) !== after.has(c)),
  );
  return [...out, ...testsCrossed(a, b, ctx, covered)];
}

function sameRows(a: Partial<FindingKept>, b: Partial<FindingKept>): boolean {
  if (num(a.row_count) && num(b.row_count) && a.row_count !== b.row_count) return false;
  return a.rows!.join(",") === b.rows!.join(",");
}

/**
 * Tests whose p crossed the level, read at the check's own `significance`
 * (the level its findings use), or at 1 − the document's confidence level
 * when the record kept none; skipped when the finding it feeds appeared or
 * went (`covered`), which says the same.
 */
function testsCrossed(
  a: CheckKept,
  b: CheckKept,
  ctx: ChangeContext,
  covered: ReadonlySet<string>,
): Change[] {
  const alpha = num(b.significance) ? b.significance : 1 - ctx.level;
  const out: Change[] = [];
  for (const t of TESTS) {
    const was = a[t.key], now = b[t.key];
    if (!num(was) || !num(now) || (was < alpha) === (now < alpha)) continue;
    if (covered.has(t.finding)) continue;
    const below = now < alpha;
    out.push({
      code: "test-crossed",
      weight: "notable",
      sentence: `${ctx.cell}: the ${t.name} is ${
        below ? "now significant" : "no longer significant"
      } at ${formatNumber(alpha, 2)} (p = ${formatP(was)} before, ${formatP(now)} now).`,
      numbers: { test: t.key, before: was, after: now, level: alpha, finding: t.finding },
    });
  }
  return out;
}

/**
 * The check's history face.
 *
 * @example
 * ```ts
 * import { checkHistory } from "./history.ts";
 * const kept = (rows: number[]) => ({
 *   fit: "root", n: 20, significance: 0.05, durbin_watson: null, durbin_watson_p: null,
 *   breusch_pagan_p: null, shapiro_wilk_p: null, condition_number: null, lack_of_fit_p: null,
 *   findings: rows.length ? [{ code: "outlier", rows, row_count: rows.length, message: "" }] : [],
 * });
 * const [c] = checkHistory.changes(kept([]), kept([17]), { cell: "c", level: 0.95, rows: null });
 * if (c.code !== "finding-appeared" || c.weight !== "notable") throw new Error(c.sentence);
 * ```
 */
export const checkHistory: HistoryFace<CheckSpec, Diagnostics, CheckResult, CheckKept> = {
  keep,
  changes,
};
