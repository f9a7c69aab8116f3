/**
 * Fixtures for the search kind's tests: invented, seeded tables built in
 * memory, contexts, and a brute-force ranking that fits every subset with
 * the real `fit` kind and scores it as `compare` does (the independent route
 * the search must agree with).
 *
 * @module
 */
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { seededRandom } from "../../kernel/random.ts";
import type { DocSettings, ParseContext, RunContext, Table } from "../../kernel/contract/mod.ts";
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { looRmse } from "../compare/loo.ts";
import { originalScale } from "../compare/original_scale.ts";
import { searchKind } from "./mod.ts";
import type { SearchResult } from "./result.ts";
import type { SearchCriterion } from "./spec.ts";

/** The kernel's default document settings. */
export const SETTINGS: DocSettings = { ...DEFAULT_SETTINGS, title: "test", extra: {} };

/**
 * A table of number columns (rows numbered 1…n); NaN is a missing value.
 *
 * @param columns Values by column name, in table order.
 * @returns The table.
 */
export function tableOf(columns: Record<string, ArrayLike<number>>): Table {
  const entries = Object.entries(columns);
  const n = entries[0][1].length;
  return {
    type: "Table",
    columns: entries.map(([name, v]) => {
      const values = Float64Array.from(v);
      const missing = values.filter((x) => Number.isNaN(x)).length;
      return { name, type: "number" as const, unit: null, values, lo: null, missing };
    }),
    rows: Int32Array.from({ length: n }, (_, i) => i + 1),
    rowsRead: n,
    excluded: [],
    sha256: null,
    source: null,
  };
}

/**
 * Invented data: `c` standard-normal candidates x1…xc (x2 partly follows
 * x1), y = 3 + 2·x1 − 1.5·x3 + 0.8·x4 + N(0, 1) noise, seeded.
 *
 * @param n Rows.
 * @param c Candidates (at least 4).
 * @param seed The seed.
 * @returns Columns by name, y last.
 */
export function invented(n: number, c: number, seed: number): Record<string, Float64Array> {
  const rnd = seededRandom(seed);
  const out: Record<string, Float64Array> = {};
  for (let j = 1; j <= c; j++) out[`x${j}`] = Float64Array.from({ length: n }, () => rnd.normal());
  for (let i = 0; i < n; i++) out.x2[i] = 0.6 * out.x1[i] + 0.8 * out.x2[i];
  out.y = Float64Array.from(
    { length: n },
    (_, i) => 3 + 2 * out.x1[i] - 1.5 * out.x3[i] + 0.8 * out.x4[i] + rnd.normal(),
  );
  return out;
}

/** A parse context for a search cell named "s". */
export function parseCtx(options: Record<string, unknown>): ParseContext {
  return { name: "s", kind: "search", body: "", options, settings: SETTINGS, warn() {} };
}

/** A run context with the table under "t", collecting warnings and progress. */
export function runCtx(
  table: Table,
): RunContext & { warnings: string[]; fractions: number[] } {
  const warnings: string[] = [], fractions: number[] = [];
  return {
    name: "s",
    settings: SETTINGS,
    inputs: { t: table },
    files: {},
    warn: (m) => void (warnings.includes(m) || warnings.push(m)),
    progress: (f) => void fractions.push(f),
    warnings,
    fractions,
  };
}

/**
 * Parses and runs a search over table "t".
 *
 * @param table The table.
 * @param options The cell's options besides `on: t`.
 * @returns The result and the run's warnings.
 */
export async function search(
  table: Table,
  options: Record<string, unknown>,
): Promise<{ result: SearchResult; warnings: string[]; fractions: number[] }> {
  const spec = searchKind.parse(parseCtx({ on: "t", ...options }));
  const ctx = runCtx(table);
  const out = await searchKind.run(spec, ctx);
  return {
    result: searchKind.summary(out, spec),
    warnings: ctx.warnings,
    fractions: ctx.fractions,
  };
}

/** One subset fitted by the fit kind and scored as compare scores it. */
export interface Brute {
  chosen: string[];
  /** Criterion values by name; null when the fit refused (aliased) or the value does not exist. */
  values: Record<SearchCriterion, number | null>;
  aliased: boolean;
  k: number | null;
}

/**
 * Every subset of `candidates`, each fitted from scratch by the `fit` kind
 * (the project's certified least squares) and scored as `compare` scores a
 * fit: its AIC, AICc, BIC and adjusted R² as the fit reports them, LOO RMSE
 * by compare's PRESS route.
 *
 * @param table The table under "t".
 * @param response The response column.
 * @param candidates The candidates.
 * @param always Columns in every model.
 * @param intercept Whether the models have an intercept.
 * @returns One entry per subset (the empty subset included when it is a model).
 */
export async function bruteForce(
  table: Table,
  response: string,
  candidates: string[],
  always: string[] = [],
  intercept = true,
): Promise<Brute[]> {
  const out: Brute[] = [];
  for (let mask = 0; mask < 2 ** candidates.length; mask++) {
    const chosen = candidates.filter((_, j) => (mask >> j) & 1);
    const terms = [...always, ...chosen];
    if (!intercept && terms.length === 0) continue;
    // Written out term by term, not by the search's own model writer.
    const slopes = terms.map((t) => `s_${t}*${t}`);
    const model = `${response} = ${[...(intercept ? ["a0"] : []), ...slopes].join(" + ")}`;
    const ctx = runCtx(table);
    let fit: Fit;
    try {
      fit = await fitKind.run({ on: "t", model, start: {} }, ctx);
    } catch (e) {
      if (!(e instanceof CellError) || !/linear combination|multiple/.test(e.message)) throw e;
      const none = { bic: null, aic: null, aicc: null, adj_r2: null, loo: null };
      out.push({ chosen, values: none, aliased: true, k: null });
      continue;
    }
    const r = fitKind.summary(fit, { on: "t", model, start: {} });
    const loo = looRmse({ name: "f", fit, scale: originalScale(fit, "c", []) }, 10, 1);
    out.push({
      chosen,
      aliased: false,
      k: r.k,
      values: { bic: r.bic, aic: r.aic, aicc: r.aicc, adj_r2: r.adj_r2, loo: loo.rmse },
    });
  }
  return out;
}

/**
 * The brute-force ranking of one size (or of all, `size` null) by a criterion.
 *
 * @param all The brute-force fits.
 * @param by The criterion.
 * @param size Candidates chosen, or null for every size.
 * @returns The estimable subsets, best first.
 */
export function bruteRanking(all: Brute[], by: SearchCriterion, size: number | null): Brute[] {
  const sign = by === "adj_r2" ? -1 : 1;
  return all.filter((b) => !b.aliased && b.values[by] !== null)
    .filter((b) => size === null || b.chosen.length === size)
    .sort((a, b) => sign * (a.values[by]! - b.values[by]!));
}
