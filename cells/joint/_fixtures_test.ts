/**
 * Test support for the joint kind: invented decay curves (seeded), contexts
 * and a runner. Nothing here was measured.
 *
 * @module
 */
import type { RunContext, Table } from "../../kernel/contract/mod.ts";
import { seededRandom } from "../../kernel/random.ts";
import { makeTable, SETTINGS } from "../fit/_fixtures_test.ts";
import { jointKind } from "./mod.ts";
import type { JointResult } from "./result.ts";
import type { JointFit } from "./joint.ts";

export { makeTable, SETTINGS };

/**
 * Three invented decay curves y = a·exp(−k·t) + b + noise, one per
 * temperature, with the rates given (seeded normal noise, σ = 0.4).
 */
export function decayTables(rates: number[] = [0.21, 0.2, 0.22], seed = 11): Record<string, Table> {
  const random = seededRandom(seed);
  const out: Record<string, Table> = {};
  const amps = [50, 42, 61], bases = [3, 5, 4];
  rates.forEach((k, g) => {
    const t: number[] = [], y: number[] = [];
    for (let i = 0; i < 14; i++) {
      const ti = 0.5 * i + (g === 1 ? 0.25 : 0);
      t.push(ti);
      y.push(amps[g] * Math.exp(-k * ti) + bases[g] + 0.4 * random.normal());
    }
    out[`at-${20 + 10 * g}`] = makeTable({ t, y });
  });
  return out;
}

/** A context with the given tables as inputs, collecting warnings. */
export function jointContext(
  name: string,
  inputs: Record<string, Table>,
): RunContext & { warnings: string[] } {
  const warnings: string[] = [];
  return {
    name,
    settings: SETTINGS,
    inputs,
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
    warnings,
  };
}

/** Parses and runs a joint cell: its output, RUN-JSON result and warnings. */
export function runJointCell(
  options: Record<string, unknown>,
  inputs: Record<string, Table>,
  name = "decay",
): { out: JointFit; result: JointResult; warnings: string[] } {
  const warnings: string[] = [];
  const spec = jointKind.parse({
    name,
    kind: "joint",
    body: "",
    options,
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
  });
  const ctx = jointContext(name, inputs);
  const out = jointKind.run(spec, ctx) as JointFit;
  return { out, result: jointKind.summary(out, spec), warnings: [...warnings, ...ctx.warnings] };
}
