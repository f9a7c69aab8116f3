/**
 * Test support for the predict cell: fit a hand-built table with the real
 * fit kind, then parse and run a predict cell on it.
 *
 * @module
 */
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { makeTable, parseContext, runContext, SETTINGS } from "../fit/_fixtures_test.ts";
import type { DocSettings, RunContext } from "../../kernel/contract/mod.ts";
import { predictKind } from "./mod.ts";
import type { Predictions, PredictResult } from "./result.ts";

export { makeTable };

/** Fits `model` to `cols` (fit options in `fitOptions`, the columns' units in `units`). */
export function fitOf(
  cols: Record<string, ArrayLike<number>>,
  model: string,
  fitOptions: Record<string, unknown> = {},
  units: Record<string, string> = {},
): Fit {
  const spec = fitKind.parse(parseContext("model", { on: "data", model, ...fitOptions }));
  const t = makeTable(cols);
  const table = { ...t, columns: t.columns.map((c) => ({ ...c, unit: units[c.name] ?? null })) };
  return fitKind.run(spec, runContext("model", "data", table)) as Fit;
}

/** A run context with `fit` under "model", collecting warnings. */
export function predictContext(
  fit: Fit,
  settings: Partial<DocSettings> = {},
): RunContext & { warnings: string[] } {
  const warnings: string[] = [];
  return {
    name: "p",
    settings: { ...SETTINGS, ...settings },
    inputs: { model: fit },
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
    warnings,
  };
}

/** Parses `options` (with fit: model) and runs them on `fit`; result and warnings. */
export function predict(
  fit: Fit,
  options: Record<string, unknown>,
  settings: Partial<DocSettings> = {},
): { result: PredictResult; warnings: string[] } {
  const spec = predictKind.parse({
    ...parseContext("p", { fit: "model", ...options }),
    kind: "predict",
  });
  const ctx = predictContext(fit, settings);
  const out = predictKind.run(spec, ctx) as Predictions; // run is synchronous
  return { result: predictKind.summary(out, spec), warnings: ctx.warnings };
}
