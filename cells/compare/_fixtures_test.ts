/**
 * Test support for the compare cell: real fits through the fit kind, and
 * compare cells run on them.
 *
 * @module
 */
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { CellOutput, DocSettings, Table } from "../../kernel/contract/mod.ts";
import { makeTable, parseContext, runContext, SETTINGS } from "../fit/_fixtures_test.ts";
import { compareKind } from "./mod.ts";
import type { CompareResult } from "./result.ts";

export { makeTable, SETTINGS };

/** Fits `model` to `table` through the fit kind (options as in a document). */
export function fitOf(
  name: string,
  model: string,
  table: Table,
  extra: Record<string, unknown> = {},
): Fit {
  const spec = fitKind.parse(parseContext(name, { on: "data", model, ...extra }));
  return fitKind.run(spec, runContext(name, "data", table)) as Fit;
}

/** Parses and runs a compare cell over the given fits; returns the result and warnings. */
export function compare(
  fits: Record<string, CellOutput>,
  options: Record<string, unknown> = {},
  settings: Partial<DocSettings> = {},
): { result: CompareResult; warnings: string[] } {
  const warnings: string[] = [];
  const s = { ...SETTINGS, ...settings };
  const spec = compareKind.parse({
    name: "cmp",
    kind: "compare",
    options: { fits: Object.keys(fits), ...options },
    body: "",
    settings: s,
    warn: (m) => warnings.push(m),
  });
  const out = compareKind.run(spec, {
    name: "cmp",
    settings: s,
    inputs: fits,
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
  });
  if (out instanceof Promise) throw new Error("compare runs synchronously");
  return { result: compareKind.summary(out, spec), warnings };
}

/** n points x = 1…n with a fixed, smooth wiggle as "noise" (deterministic, no generator). */
export function wiggle(n: number, scale: number): Float64Array {
  return Float64Array.from(
    { length: n },
    (_, i) => scale * Math.sin(1.7 * (i + 1) + 0.3 * (i + 1) ** 2),
  );
}
