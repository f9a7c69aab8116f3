/**
 * Test support for the history faces of compare, check and predict: the fade
 * example's cells (examples/fade/fade.md, invented data) run through the real
 * table, fit, compare, check and predict kinds, on batch7.csv alone and with
 * the rows of batch7-later.csv appended, as a data append between two runs.
 *
 * @module
 */
import type { CellKind, ChangeContext, RunContext, Table } from "../../kernel/contract/mod.ts";
import { tableKind } from "../table/mod.ts";
import { parseCtx, runCtx } from "../table/_testing.ts";
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { parseContext, runContext, SETTINGS } from "../fit/_fixtures_test.ts";

const DATA = new URL("../../examples/fade/data/", import.meta.url);

/** The fade example's fits, as its document writes them. */
export const FADE_FITS: Record<string, Record<string, unknown>> = {
  line: { model: "capacity = q0 + a*cycle" },
  root: { model: "capacity = q0 - a*sqrt(cycle)" },
  "root-linear": { model: "capacity = q0 - a*sqrt(cycle) - b*cycle" },
  power: { model: "capacity = q0 - a*cycle^b", start: { q0: 2500, a: 10, b: 0.5 } },
};

/** The fade example's table and fits; `later` appends batch7-later.csv's rows to batch7.csv. */
export async function fadeRun(
  later: boolean,
): Promise<{ table: Table; fits: Record<string, Fit> }> {
  let csv = await Deno.readTextFile(new URL("batch7.csv", DATA));
  if (later) {
    const more = await Deno.readTextFile(new URL("batch7-later.csv", DATA));
    csv = csv.replace(/\n?$/, "\n") + more.split("\n").slice(1).join("\n");
  }
  const spec = tableKind.parse(parseCtx({
    from: "data/batch7.csv",
    units: { cycle: "cycles", capacity: "mAh", temperature: "°C" },
    exclude: [{ rows: [41], why: "thermocouple came loose during cycle 205; the chamber ran hot" }],
  }));
  const table = await tableKind.run(spec, runCtx({ "data/batch7.csv": csv })) as Table;
  const fits: Record<string, Fit> = {};
  for (const [name, options] of Object.entries(FADE_FITS)) {
    const s = fitKind.parse(parseContext(name, { on: "cycles", ...options }));
    fits[name] = await fitKind.run(s, runContext(name, "cycles", table)) as Fit;
  }
  return { table, fits };
}

/**
 * Parses and runs a cell of `kind` (named `name`, options as in a document)
 * on `inputs`: its RUN-JSON result and what the run history keeps of it.
 */
export async function cellRun<R, H>(
  kind: CellKind,
  name: string,
  options: Record<string, unknown>,
  inputs: RunContext["inputs"],
): Promise<{ result: R; kept: H }> {
  const spec = kind.parse({ ...parseContext(name, options), kind: kind.kind });
  const out = await kind.run(spec, {
    name,
    settings: SETTINGS,
    inputs,
    files: {},
    warn: () => {},
    progress: () => {},
  });
  const result = kind.summary(out, spec) as R;
  return { result, kept: kind.history!.keep(out, spec, result) as H };
}

/** A context for `changes`: the cell's name, the level 0.95, and the row changes given. */
export function changeContext(cell: string, rows: ChangeContext["rows"] = null): ChangeContext {
  return { cell, level: 0.95, rows };
}
