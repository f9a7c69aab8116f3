/**
 * The check's face in the run history: its findings (code, rows, message)
 * and main test statistics; what changed between two records: findings that
 * appeared or went, a finding that now names other rows.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace } from "../../kernel/contract/mod.ts";
import type { CheckSpec } from "./spec.ts";
import type { CheckResult, Diagnostics } from "./result.ts";
import { rowsInWords } from "../shared/row_list.ts";

/** At most this many rows a finding are kept. */
const ROWS_KEPT = 50;

/** What a record keeps of a check. */
export interface CheckKept {
  fit: string;
  n: number;
  findings: { code: string; rows: number[]; message: string }[];
  durbin_watson: number | null;
  breusch_pagan_p: number | null;
  shapiro_wilk_p: number | null;
  condition_number: number | null;
  lack_of_fit_p: number | null;
}

function keep(_out: Diagnostics, _spec: CheckSpec, r: CheckResult): CheckKept {
  return {
    fit: r.fit,
    n: r.n,
    findings: r.findings.map((f) => ({
      code: f.code,
      rows: f.rows.slice(0, ROWS_KEPT),
      message: f.message,
    })),
    durbin_watson: r.durbin_watson,
    breusch_pagan_p: r.breusch_pagan?.p_value ?? null,
    shapiro_wilk_p: r.shapiro_wilk?.p_value ?? null,
    condition_number: r.condition_number,
    lack_of_fit_p: r.lack_of_fit?.p_value ?? null,
  };
}

/** A finding's code in words: `high-leverage` → `high leverage`. */
const words = (code: string) => code.replaceAll("-", " ");

function changes(a: CheckKept, b: CheckKept, ctx: ChangeContext): Change[] {
  const cell = ctx.cell;
  const out: Change[] = [];
  if (!Array.isArray(a?.findings) || !Array.isArray(b?.findings)) return out;
  const before = new Map(a.findings.map((f) => [f.code, f]));
  const after = new Map(b.findings.map((f) => [f.code, f]));
  for (const [code, f] of after) {
    const was = before.get(code);
    if (!was) {
      out.push({
        code: "finding-appeared",
        weight: "notable",
        sentence: `${cell}: new finding, ${words(code)}${
          f.rows.length ? ` (${rowsInWords(f.rows)})` : ""
        }: ${f.message}`,
        numbers: { finding: code, rows: f.rows },
      });
    } else if (was.rows.join(",") !== f.rows.join(",")) {
      out.push({
        code: "finding-rows-changed",
        weight: "minor",
        sentence: `${cell}: ${words(code)} now names ${rowsInWords(f.rows)} (was ${
          rowsInWords(was.rows)
        }).`,
        numbers: { finding: code, before: was.rows, after: f.rows },
      });
    }
  }
  for (const [code, was] of before) {
    if (after.has(code)) continue;
    out.push({
      code: "finding-gone",
      weight: "notable",
      sentence: `${cell}: the finding ${words(code)}${
        was.rows.length ? ` (${rowsInWords(was.rows)})` : ""
      } is gone.`,
      numbers: { finding: code, rows: was.rows },
    });
  }
  return out;
}

/** The check's history face. */
export const checkHistory: HistoryFace<CheckSpec, Diagnostics, CheckResult, CheckKept> = {
  keep,
  changes,
};
