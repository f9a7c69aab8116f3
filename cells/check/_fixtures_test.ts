/**
 * Test support for the check cell: fit a hand-built table with the real fit
 * kind (cells/predict/_fixtures_test.ts `fitOf`), then parse and run a check
 * cell on it.
 *
 * @module
 */
import type { DocSettings } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { parseContext, SETTINGS } from "../fit/_fixtures_test.ts";
import { checkKind } from "./mod.ts";
import type { CheckResult, Diagnostics } from "./result.ts";

export { fitOf } from "../predict/_fixtures_test.ts";

/** Runs `check judge` with `options` (fit: model) on `fit`; its RUN-JSON result. */
export function check(
  fit: Fit,
  options: Record<string, unknown> = {},
  settings: Partial<DocSettings> = {},
): CheckResult {
  const spec = checkKind.parse({
    ...parseContext("judge", { fit: "model", ...options }),
    kind: "check",
  });
  const out = checkKind.run(spec, {
    name: "judge",
    settings: { ...SETTINGS, ...settings },
    inputs: { model: fit },
    files: {},
    warn: () => {},
    progress: () => {},
  });
  return checkKind.summary(out as Diagnostics, spec); // run is synchronous
}
