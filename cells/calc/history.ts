/**
 * The calc cell's face in the run history: the value's named numbers (a
 * number, or the numbers at the top of a record), a digest-free copy of a
 * short value, or a table's size; what changed between two records; and each
 * named number as a drift series.
 *
 * A calc's value has no uncertainty the kernel knows of, so no change is
 * notable by itself: a named number that moved is a minor sentence with its
 * relative move (the reader judges it; a cell that computes an uncertainty
 * can return it beside the value, and both are drawn).
 *
 * Records of older versions may lack fields: a comparison that needs a
 * missing field is skipped, never made against zero.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace, TrendSample } from "../../kernel/contract/mod.ts";
import { formatNumber } from "../shared/format.ts";
import type { CalcSpec } from "./spec.ts";
import type { CalcOutput, CalcTableOutput } from "./run.ts";
import type { CalcResult } from "./result.ts";

/** What a record keeps of a calc result. */
export interface CalcKept {
  gives: "value" | "table";
  /** The value's named numbers (a bare number is named `value`); at most {@link MAX_NUMBERS}. */
  numbers: Record<string, number>;
  /** The value as JSON text when at most {@link MAX_TEXT} characters; null otherwise. */
  text: string | null;
  /** Rows of the table it gives; null for a value. */
  rows: number | null;
}

/** Named numbers kept per record. */
export const MAX_NUMBERS = 50;
/** A value's JSON text kept when this short (characters). */
export const MAX_TEXT = 2000;

function namedNumbers(v: unknown): Record<string, number> {
  const out: Record<string, number> = {};
  if (typeof v === "number") out.value = v;
  else if (v !== null && typeof v === "object" && !Array.isArray(v)) {
    for (const [k, x] of Object.entries(v)) {
      if (typeof x !== "number") continue;
      if (Object.keys(out).length >= MAX_NUMBERS) break;
      Object.defineProperty(out, k, { value: x, enumerable: true, writable: true });
    }
  }
  return out;
}

function keep(_out: CalcOutput | CalcTableOutput, _spec: CalcSpec, r: CalcResult): CalcKept {
  const text = r.gives === "value" ? JSON.stringify(r.value) ?? "null" : null;
  return {
    gives: r.gives,
    numbers: r.gives === "value" ? namedNumbers(r.value) : {},
    text: text !== null && text.length <= MAX_TEXT ? text : null,
    rows: r.table?.rows_used ?? null,
  };
}

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

function changes(
  before: Partial<CalcKept>,
  after: Partial<CalcKept>,
  ctx: ChangeContext,
): Change[] {
  const out: Change[] = [];
  const was = before.numbers ?? {}, now = after.numbers ?? {};
  for (const [name, v] of Object.entries(now)) {
    if (!Object.hasOwn(was, name)) continue;
    const w = was[name];
    if (!num(w) || !num(v) || w === v) continue;
    const rel = w !== 0 ? (v - w) / Math.abs(w) : null;
    out.push({
      code: "value-moved",
      weight: "minor",
      sentence: `${ctx.cell}: ${name} is ${formatNumber(v, 6)} (was ${formatNumber(w, 6)}${
        rel === null ? "" : `, ${rel > 0 ? "+" : ""}${formatNumber(100 * rel, 2)} %`
      }).`,
      numbers: { name, before: w, after: v, relative: rel },
    });
  }
  const numbersMoved = out.length > 0;
  if (
    !numbersMoved && typeof before.text === "string" && typeof after.text === "string" &&
    before.text !== after.text
  ) {
    out.push({
      code: "value-changed",
      weight: "minor",
      sentence: `${ctx.cell}: its value changed.`,
      numbers: { before: before.text, after: after.text },
    });
  }
  if (num(before.rows) && num(after.rows) && before.rows !== after.rows) {
    out.push({
      code: "value-changed",
      weight: "minor",
      sentence: `${ctx.cell}: the table it gives has ${after.rows} rows (was ${before.rows}).`,
      numbers: { before_rows: before.rows, after_rows: after.rows },
    });
  }
  return out;
}

function trend(kept: Partial<CalcKept>): TrendSample[] {
  return Object.entries(kept.numbers ?? {}).filter(([, v]) => num(v)).map(([series, value]) => ({
    series,
    unit: null,
    value,
    lower: null,
    upper: null,
    n: null,
  }));
}

/** The calc kind's history face. */
export const calcHistory: HistoryFace<
  CalcSpec,
  CalcOutput | CalcTableOutput,
  CalcResult,
  CalcKept
> = {
  keep,
  changes,
  trend,
};
