/**
 * Test support for the fit cell: fake contexts and hand-built tables.
 *
 * @module
 */
import assert from "node:assert/strict";
import type {
  Column,
  DocSettings,
  ParseContext,
  RunContext,
  Table,
} from "../../kernel/contract/mod.ts";
import { fitKind } from "./mod.ts";
import type { Fit } from "./fit.ts";

export const SETTINGS: DocSettings = {
  title: "test",
  confidence: 0.95,
  seed: 1,
  criterion: "aicc",
  maxFileBytes: 1 << 20,
  extra: {},
};

/** A table from columns (numbers with NaN for missing, or strings), rows numbered 1.. unless given. */
export function makeTable(
  cols: Record<string, ArrayLike<number> | (string | null)[]>,
  rows?: number[],
): Table {
  const columns: Column[] = Object.entries(cols).map(([name, v]) => {
    if (Array.isArray(v) && typeof v[0] !== "number") {
      const values = v as (string | null)[];
      return {
        name,
        type: "text",
        unit: null,
        values,
        missing: values.filter((x) => x === null).length,
      };
    }
    const values = Float64Array.from(v as ArrayLike<number>);
    return {
      name,
      type: "number",
      unit: null,
      values,
      lo: null,
      missing: values.filter(Number.isNaN).length,
    };
  });
  const m = columns[0].values.length;
  return {
    type: "Table",
    columns,
    rows: Int32Array.from(rows ?? Array.from({ length: m }, (_, i) => i + 1)),
    rowsRead: m,
    excluded: [],
    sha256: null,
    source: null,
  };
}

/** A parse context for `options`, collecting warnings. */
export function parseContext(
  name: string,
  options: Record<string, unknown>,
): ParseContext & { warnings: string[] } {
  const warnings: string[] = [];
  return {
    name,
    kind: "fit",
    options,
    body: "",
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
    warnings,
  };
}

/** A run context with the table under `on`, collecting warnings. */
export function runContext(
  name: string,
  on: string,
  table: Table,
): RunContext & { warnings: string[] } {
  const warnings: string[] = [];
  return {
    name,
    settings: SETTINGS,
    inputs: { [on]: table },
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
    warnings,
  };
}

/** Parses and runs fit `name` of `model` on `table` (as cell "data"): its RUN-JSON result and warnings. */
export function fitResult(
  name: string,
  model: string,
  table: Table,
  extra: Record<string, unknown> = {},
) {
  const spec = fitKind.parse(parseContext(name, { on: "data", model, ...extra }));
  const ctx = runContext(name, "data", table);
  const out = fitKind.run(spec, ctx) as Fit;
  return { result: fitKind.summary(out, spec), warnings: ctx.warnings };
}

/** Asserts `got` agrees with `want` to `digits` significant digits (absolute when want is 0). */
export function assertDigits(got: number | null, want: number, digits: number, what: string) {
  assert.ok(got !== null, `${what}: null`);
  const err = Math.abs(got - want) / (want === 0 ? 1 : Math.abs(want));
  assert.ok(err <= 10 ** -digits, `${what}: ${got} vs ${want} (relative error ${err})`);
}
