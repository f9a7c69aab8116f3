/**
 * Fixtures for the chart kind's tests: tables from inline rows and fits run
 * by the real table and fit kinds, and a chart run over them.
 *
 * @module
 */
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import type { CellOutput, DocSettings, RunContext } from "../../kernel/contract/mod.ts";
import { tableKind } from "../table/mod.ts";
import { fitKind } from "../fit/mod.ts";
import { chartKind } from "./mod.ts";
import type { ChartOutput } from "./run.ts";

/** The kernel's default document settings. */
export const SETTINGS: DocSettings = { ...DEFAULT_SETTINGS, title: "test", extra: {} };

function ctx(name: string, inputs: Record<string, CellOutput>, warnings: string[]): RunContext {
  return {
    name,
    settings: SETTINGS,
    inputs,
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
  };
}

/** A park of cell outputs by name, built up by the helpers below. */
export type Cells = Record<string, CellOutput>;

/**
 * Runs a table cell of inline rows into `cells`.
 *
 * @param cells Where outputs are kept.
 * @param name The table's name.
 * @param options The table's options (`columns`, `rows`, `units`, …).
 */
export async function addTable(cells: Cells, name: string, options: Record<string, unknown>) {
  const spec = tableKind.parse({
    name,
    kind: "table",
    body: "",
    options,
    settings: SETTINGS,
    warn: () => {},
  });
  cells[name] = await tableKind.run(spec, ctx(name, cells, []));
}

/**
 * Runs a fit cell into `cells`.
 *
 * @param cells Where outputs are kept (the table must be there).
 * @param name The fit's name.
 * @param on The table's name.
 * @param model The model equation.
 * @param start Start values for nonlinear models.
 */
export async function addFit(
  cells: Cells,
  name: string,
  on: string,
  model: string,
  start?: Record<string, number>,
) {
  const spec = fitKind.parse({
    name,
    kind: "fit",
    body: "",
    options: { on, model, ...(start ? { start } : {}) },
    settings: SETTINGS,
    warn: () => {},
  });
  cells[name] = await fitKind.run(spec, ctx(name, cells, []));
}

/**
 * Runs a fit cell with any options (weights, known_sigma, bootstrap, …) into `cells`.
 *
 * @param cells Where outputs are kept (the table must be there).
 * @param name The fit's name.
 * @param options The fit's options (`on`, `model`, …).
 * @param warnings Where the fit's warnings go (optional).
 */
export async function addFitWith(
  cells: Cells,
  name: string,
  options: Record<string, unknown>,
  warnings: string[] = [],
) {
  const spec = fitKind.parse({
    name,
    kind: "fit",
    body: "",
    options,
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
  });
  cells[name] = await fitKind.run(spec, ctx(name, cells, warnings));
}

/**
 * Parses and runs a chart cell named "c".
 *
 * @param cells The outputs it may read.
 * @param options The chart's options.
 * @returns The output and the warnings.
 */
export async function runChartCell(
  cells: Cells,
  options: Record<string, unknown>,
): Promise<{ out: ChartOutput; warnings: string[] }> {
  const warnings: string[] = [];
  const spec = chartKind.parse({
    name: "c",
    kind: "chart",
    body: "",
    options,
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
  });
  const out = await chartKind.run(spec, ctx("c", cells, warnings));
  return { out, warnings };
}

/**
 * Seeded uniform numbers in [0, 1): Park–Miller minimal standard (Park &
 * Miller 1988, CACM 31(10); multiplier 16807, modulus 2³¹ − 1).
 *
 * @param seed A positive integer.
 * @returns The generator.
 */
export function lcg(seed: number): () => number {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}
