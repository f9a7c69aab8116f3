/**
 * The pairs an agreement cell compares, read from its table: one x and one
 * y per row, rows grouped into samples by the sample column (each row a
 * sample of its own without one), each sample's mean per method, and the
 * error-variance ratio estimated from the replicates when asked.
 *
 * Every refusal names the rows, columns and values at fault.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { RunContext, Table } from "../../kernel/contract/mod.ts";
import { numberColumnOf } from "../shared/number_column.ts";
import { rowList } from "../shared/rows.ts";
import type { AgreementSpec } from "./spec.ts";
import { MAX_SAMPLES } from "./passing_bablok.ts";

const has = (rows: readonly number[]) => (rows.length === 1 ? "has" : "have");

/** The fewest samples an agreement cell computes with. */
export const MIN_SAMPLES = 5;

/** What the cell compares. */
export interface Samples {
  /** Per used row: the two readings and the source row number. */
  x: Float64Array;
  y: Float64Array;
  rows: Int32Array;
  /** Per sample: its id (as text), its rows (indices into x, y), its means. */
  ids: string[];
  groups: number[][];
  xMean: Float64Array;
  yMean: Float64Array;
  units: { x: string | null; y: string | null };
  /** Source rows left out because both readings are missing. */
  empty: number[];
}

/** The ratio estimated from replicates, with its parts. */
export interface ReplicateRatio {
  ratio: number;
  /** Pooled within-sample variances (of relative deviations with proportional errors). */
  xVariance: number;
  yVariance: number;
  /** Degrees of freedom Σ(mᵢ − 1) of each. */
  df: number;
  /** Samples with two or more rows. */
  samples: number;
}

/**
 * Reads the pairs and samples.
 *
 * @param spec The options.
 * @param ctx Inputs and the warning sink.
 * @returns The samples.
 * @throws {CellError} For an unknown or text column, unpaired rows, missing
 *   sample ids, too few or too many samples, or values the error model
 *   cannot take.
 */
export function readSamples(spec: AgreementSpec, ctx: RunContext): Samples {
  const table = ctx.inputs[spec.on] as Table;
  const cannot = `Cannot compare methods in "${ctx.name}"`;
  const col = (key: "x" | "y") =>
    numberColumnOf(table, spec[key], {
      cannot,
      on: spec.on,
      needs: `the method "${key}" needs numbers`,
      path: [key],
    });
  const cx = col("x"), cy = col("y");
  const n = table.rows.length;
  const onlyX: number[] = [], onlyY: number[] = [], empty: number[] = [];
  const used: number[] = [];
  for (let i = 0; i < n; i++) {
    const hasX = !Number.isNaN(cx.values[i]), hasY = !Number.isNaN(cy.values[i]);
    if (hasX && hasY) used.push(i);
    else if (hasX) onlyX.push(table.rows[i]);
    else if (hasY) onlyY.push(table.rows[i]);
    else empty.push(table.rows[i]);
  }
  if (onlyX.length + onlyY.length > 0) {
    const parts = [
      onlyX.length > 0
        ? `${rowList(onlyX)} of "${spec.on}" ${has(onlyX)} "${spec.x}" but no "${spec.y}"`
        : "",
      onlyY.length > 0
        ? `${rowList(onlyY)} of "${spec.on}" ${has(onlyY)} "${spec.y}" but no "${spec.x}"`
        : "",
    ].filter((p) => p !== "");
    throw new CellError(
      `${cannot}: unpaired samples: ${
        parts.join("; ")
      }. Both methods must measure every sample: fill in the reading, or exclude the row in the table with the reason`,
      [onlyX.length > 0 ? "y" : "x"],
    );
  }
  if (empty.length > 0) {
    ctx.warn(
      `Agreement "${ctx.name}" leaves out ${
        rowList(empty)
      } of "${spec.on}": neither method has a reading there`,
    );
  }
  const { ids, groups } = group(spec, table, used, cannot);
  if (groups.length < MIN_SAMPLES) {
    throw new CellError(
      `${cannot}: ${groups.length} ${
        groups.length === 1 ? "sample" : "samples"
      } with both readings, and a method comparison needs at least ${MIN_SAMPLES} (40 or more is common practice)`,
      ["on"],
    );
  }
  if (groups.length > MAX_SAMPLES) {
    throw new CellError(
      `${cannot}: ${groups.length.toLocaleString("en-US")} samples, more than the ${
        MAX_SAMPLES.toLocaleString("en-US")
      } whose pairwise slopes Passing–Bablok regression takes here`,
      ["on"],
    );
  }
  const x = Float64Array.from(used, (i) => cx.values[i]);
  const y = Float64Array.from(used, (i) => cy.values[i]);
  const rows = Int32Array.from(used, (i) => table.rows[i]);
  const mean = (v: Float64Array, g: number[]) => g.reduce((s, r) => s + v[r], 0) / g.length;
  const out: Samples = {
    x,
    y,
    rows,
    ids,
    groups,
    xMean: Float64Array.from(groups, (g) => mean(x, g)),
    yMean: Float64Array.from(groups, (g) => mean(y, g)),
    units: { x: cx.unit, y: cy.unit },
    empty,
  };
  checkLevels(spec, out, cannot);
  return out;
}

/** Rows grouped by the sample column (first appearance order), or one row each. */
function group(
  spec: AgreementSpec,
  table: Table,
  used: number[],
  cannot: string,
): { ids: string[]; groups: number[][] } {
  if (spec.sample === null) {
    return { ids: used.map((i) => String(table.rows[i])), groups: used.map((_, k) => [k]) };
  }
  const c = table.columns.find((c) => c.name === spec.sample);
  if (c === undefined) {
    const names = table.columns.map((c) => c.name);
    throw new CellError(
      `${cannot}: unknown column "${spec.sample}"${
        didYouMean(spec.sample, names) ||
        `: table "${spec.on}" has ${names.map((n) => `"${n}"`).join(", ")}`
      }`,
      ["sample"],
    );
  }
  const idOf = (i: number): string | null => {
    const v = c.values[i];
    return v === null || (typeof v === "number" && Number.isNaN(v)) ? null : String(v);
  };
  const missing = used.filter((i) => idOf(i) === null).map((i) => table.rows[i]);
  if (missing.length > 0) {
    throw new CellError(
      `${cannot}: ${rowList(missing)} of "${spec.on}" ${
        missing.length === 1 ? "has" : "have"
      } no "${spec.sample}": every row must name its sample`,
      ["sample"],
    );
  }
  const at = new Map<string, number>();
  const ids: string[] = [], groups: number[][] = [];
  used.forEach((i, k) => {
    const id = idOf(i)!;
    let g = at.get(id);
    if (g === undefined) {
      g = groups.length;
      at.set(id, g);
      ids.push(id);
      groups.push([]);
    }
    groups[g].push(k);
  });
  return { ids, groups };
}

/** Percent differences need a non-zero mean; proportional errors need positive readings. */
function checkLevels(spec: AgreementSpec, s: Samples, cannot: string): void {
  if (spec.differences === "percent") {
    const zero = [...s.rows].filter((_, k) => s.x[k] + s.y[k] === 0);
    if (zero.length > 0) {
      throw new CellError(
        `${cannot}: ${rowList(zero)} of "${spec.on}" ${
          zero.length === 1 ? "has" : "have"
        } a mean of 0, where a percent difference is undefined: use differences: absolute`,
        ["differences"],
      );
    }
  }
  if (spec.errors === "proportional") {
    const bad = [...s.rows].filter((_, k) => !(s.x[k] > 0 && s.y[k] > 0));
    if (bad.length > 0) {
      throw new CellError(
        `${cannot}: ${rowList(bad)} of "${spec.on}" ${
          bad.length === 1 ? "has" : "have"
        } a reading at or below 0, and proportional errors need positive readings: use errors: constant`,
        ["errors"],
      );
    }
  }
}

/**
 * The error-variance ratio from replicates (Linnet 1990, 1993): the pooled
 * within-sample variance of each method, of relative deviations from the
 * sample's mean with proportional errors; δ = s²(y)/s²(x). Every row holds
 * both readings, so a sample's mean has mᵢ readings of each method and the
 * ratio of the means' error variances is δ too.
 *
 * @param spec The options.
 * @param s The samples.
 * @param name The cell's name.
 * @returns The ratio and its parts.
 * @throws {CellError} When no sample is replicated, or one method's replicates agree exactly.
 */
export function replicateRatio(spec: AgreementSpec, s: Samples, name: string): ReplicateRatio {
  let sx = 0, sy = 0, df = 0, samples = 0;
  const rel = spec.errors === "proportional";
  s.groups.forEach((g, k) => {
    if (g.length < 2) return;
    samples++;
    df += g.length - 1;
    for (const r of g) {
      const dx = s.x[r] - s.xMean[k], dy = s.y[r] - s.yMean[k];
      sx += rel ? (dx / s.xMean[k]) ** 2 : dx * dx;
      sy += rel ? (dy / s.yMean[k]) ** 2 : dy * dy;
    }
  });
  if (samples === 0) {
    throw new CellError(
      `Cannot compare methods in "${name}": the variance ratio is to be estimated from replicates, but no value of "${spec.sample}" occurs on two rows: give each sample two or more rows (replicates), or give variance_ratio as a number`,
      ["variance_ratio"],
    );
  }
  const which = sx === 0 ? spec.x : sy === 0 ? spec.y : null;
  if (which !== null) {
    throw new CellError(
      `Cannot compare methods in "${name}": the replicates of "${which}" agree exactly, so its error variance estimates as 0 and the ratio cannot be formed: give variance_ratio as a number`,
      ["variance_ratio"],
    );
  }
  return { ratio: sy / sx, xVariance: sx / df, yVariance: sy / df, df, samples };
}
