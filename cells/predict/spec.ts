/**
 * The options of a `predict` cell and their normaliser.
 *
 * ```predict end-of-life
 * fit: power                     # the fit cell to predict from (required)
 * at: { cycle: [500, 1000] }     # values per predictor column, lists paired element by element
 * solve: { capacity: 2000 }      # inverse prediction: which x gives this response (one predictor)
 * level: 0.9                     # interval level (default: the document's confidence)
 * weight: [1, 0.25]             # relative weight of a new observation, one or one per point
 *                                # (fits with weights; default: the fit's weights expression there)
 * sigma: 1.5                     # σ of a new observation, one or one per point
 *                                # (fits with known_sigma; default: the fit's known_sigma there)
 * replicates: 3                  # new observations averaged, for prediction intervals (default 1)
 * robust: hc3                    # heteroscedasticity-consistent covariance for se_fit (optional)
 * search: [0, 2000]              # x range searched by solve (default: fitted range ± 10 %)
 * ```
 *
 * `at` and `solve` are checked against the fit's columns at run time (the
 * fit's model is known only then); here only their shape is checked. A
 * scalar in `at` applies to every point, and so does a list of one value;
 * longer lists must all have the same length (three values per column give
 * three points, not a grid).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import {
  checkOptionKeys,
  type OptionDecls,
  type ParseContext,
  readCellName,
  readChoice,
  shown,
} from "../../kernel/contract/mod.ts";
import type { HCType } from "../../kernel/stats/mod.ts";
import { perPoint } from "./_per_point.ts";

/** The heteroscedasticity-consistent estimators `robust` accepts. */
export const HC_TYPES: readonly HCType[] = ["hc0", "hc1", "hc2", "hc3"];

/** A `predict` cell's normalised options (plain JSON: hashed into the cache key). */
export interface PredictSpec {
  /** Name of the fit cell. */
  fit: string;
  /** Values by column as written, each a list (a scalar becomes a list of one); null without `at`. */
  at: Record<string, number[]> | null;
  /** Inverse prediction: the response key as written and its values; null without `solve`. */
  solve: { response: string; values: number[] } | null;
  /** Interval level, when given (else the document's confidence). */
  level?: number;
  /** Relative weight w₀ of a new observation, when given: one for all, or one per point. */
  weight?: number[];
  /** Standard deviation σ₀ of a new observation, when given: one for all, or one per point. */
  sigma?: number[];
  /** Number of new observations averaged, when given. */
  replicates?: number;
  /** The x range searched by `solve`, when given. */
  search?: [number, number];
  /** Heteroscedasticity-consistent covariance for the mean response, when given. */
  robust?: HCType;
}

/** Options a `predict` cell understands, each declared once. */
export const PREDICT_OPTIONS: OptionDecls = {
  fit: { type: "text", doc: "the fit cell to predict from", required: true, names: "cell" },
  at: {
    type: "mapping",
    doc: "values per predictor column; lists of equal length are paired element by element",
    names: "columns",
  },
  solve: {
    type: "mapping",
    doc: "inverse prediction: { response: value or list }, for fits with one predictor",
  },
  level: { type: "number", doc: "interval level in (0, 1) (default the document's confidence)" },
  weight: {
    type: "number",
    doc:
      "relative weight of a new observation, one or a list with one per point, for fits with weights (default the fit's weights expression at the point)",
  },
  sigma: {
    type: "number",
    doc:
      "standard deviation of a new observation, one or a list with one per point, for fits with known_sigma (default the fit's known_sigma at the point)",
  },
  replicates: {
    type: "whole number",
    doc: "number of new observations averaged, for prediction intervals",
    default: 1,
  },
  search: {
    type: "list",
    doc: "the x range [low, high] that solve searches (default the fitted range ± 10 %)",
  },
  robust: {
    type: "choice",
    doc: "heteroscedasticity-consistent covariance for the mean response's standard error",
    choices: HC_TYPES,
  },
};

/**
 * Checks and normalises a `predict` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For an unknown option, a missing or bad `fit`, neither
 *   `at` nor `solve`, a value that is not a finite number, lists of unequal
 *   length in `at`, a `solve` without exactly one response, a bad
 *   `level`, `weight`, `sigma` (or a list of them that does not match the
 *   points), `replicates`, `search` or `robust`.
 * @example
 * ```ts
 * import { parsePredictSpec } from "./spec.ts";
 * const spec = parsePredictSpec({
 *   name: "eol", kind: "predict", body: "", warn() {},
 *   options: { fit: "power", at: { cycle: [500, 1000], temp: 25 } },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.at?.temp.join() !== "25") throw new Error("a scalar is a list of one");
 * ```
 */
export function parsePredictSpec(ctx: ParseContext): PredictSpec {
  const o = ctx.options;
  checkOptionKeys(ctx, PREDICT_OPTIONS);
  const at = atValues(ctx, o.at);
  const solve = solveValues(ctx, o.solve);
  if (at === null && solve === null) {
    throw new CellError(
      `Predict "${ctx.name}" has neither "at" nor "solve": give predictor values, as in at: { x: [1, 2] }, or a response to solve for, as in solve: { y: 10 }`,
      [],
    );
  }
  const level = optionalNumber(ctx, "level", (v) => v > 0 && v < 1, "a level in (0, 1)");
  const counts = { at: at === null ? 0 : pointCount(at), solve: solve?.values.length ?? 0 };
  const weight = perPoint(ctx, "weight", "a positive weight", counts);
  const sigma = perPoint(ctx, "sigma", "a positive standard deviation", counts);
  const robust = readChoice(ctx, "robust", HC_TYPES);
  const replicates = optionalNumber(
    ctx,
    "replicates",
    (v) => Number.isInteger(v) && v >= 1,
    "a whole number of at least 1",
  );
  const search = searchRange(ctx, o.search);
  return {
    fit: readCellName(ctx, "fit", "fit", "name the fit cell to predict from, as in fit: line"),
    at,
    solve,
    ...(level === undefined ? {} : { level }),
    ...(weight === undefined ? {} : { weight }),
    ...(sigma === undefined ? {} : { sigma }),
    ...(replicates === undefined ? {} : { replicates }),
    ...(search === undefined ? {} : { search }),
    ...(robust === null ? {} : { robust }),
  };
}

/** The number of points `at` gives: its longest list (lists are paired; one value serves all). */
export function pointCount(at: Record<string, number[]>): number {
  return Math.max(1, ...Object.values(at).map((v) => v.length));
}

function isMapping(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

/** A number or a non-empty list of numbers → a list; throws at `path` otherwise. */
function numberList(ctx: ParseContext, v: unknown, path: (string | number)[]): number[] {
  const list = Array.isArray(v) ? v : [v];
  const where = `"${path.join(".")}" of predict "${ctx.name}"`;
  if (list.length === 0) {
    throw new CellError(`Option ${where} is an empty list: expected at least one number`, path);
  }
  list.forEach((x, i) => {
    if (typeof x !== "number" || !Number.isFinite(x)) {
      const at = Array.isArray(v) ? [...path, i] : path;
      throw new CellError(
        `Value "${shown(x)}" in ${where} is not a finite number`,
        at,
      );
    }
  });
  return list as number[];
}

function atValues(ctx: ParseContext, v: unknown): Record<string, number[]> | null {
  if (v === undefined || v === null) return null;
  if (!isMapping(v)) {
    throw new CellError(
      `Option "at" of predict "${ctx.name}" is "${
        shown(v)
      }": expected a mapping of columns to values, as in at: { x: [1, 2, 3] }`,
      ["at"],
    );
  }
  const out: Record<string, number[]> = {};
  let length = 1, longest = "";
  for (const [col, x] of Object.entries(v)) {
    const list = numberList(ctx, x, ["at", col]);
    if (list.length > 1 && length > 1 && list.length !== length) {
      throw new CellError(
        `Lists in "at" of predict "${ctx.name}" differ in length: "${longest}" has ${length} values, "${col}" has ${list.length}: lists are paired element by element, so give each column the same number of values (or one value for all points)`,
        ["at", col],
      );
    }
    if (list.length > 1) [length, longest] = [list.length, col];
    out[col] = list;
  }
  return out;
}

function solveValues(ctx: ParseContext, v: unknown): PredictSpec["solve"] {
  if (v === undefined || v === null) return null;
  const keys = isMapping(v) ? Object.keys(v) : [];
  if (!isMapping(v) || keys.length !== 1) {
    const written = isMapping(v) ? `{ ${keys.join(", ")} }` : shown(v);
    throw new CellError(
      `Option "solve" of predict "${ctx.name}" is "${written}": expected one response and its value(s), as in solve: { y: 10 }`,
      ["solve"],
    );
  }
  const response = keys[0];
  return { response, values: numberList(ctx, v[response], ["solve", response]) };
}

function optionalNumber(
  ctx: ParseContext,
  key: string,
  ok: (v: number) => boolean,
  expected: string,
): number | undefined {
  const v = ctx.options[key];
  if (v === undefined || v === null) return undefined;
  if (typeof v !== "number" || !Number.isFinite(v) || !ok(v)) {
    throw new CellError(
      `Option "${key}" of predict "${ctx.name}" is "${shown(v)}": expected ${expected}`,
      [key],
    );
  }
  return v;
}

function searchRange(ctx: ParseContext, v: unknown): [number, number] | undefined {
  if (v === undefined || v === null) return undefined;
  const ok = Array.isArray(v) && v.length === 2 &&
    v.every((x) => typeof x === "number" && Number.isFinite(x)) && v[0] < v[1];
  if (!ok) {
    throw new CellError(
      `Option "search" of predict "${ctx.name}" is "${
        shown(v)
      }": expected [low, high] with low < high`,
      ["search"],
    );
  }
  return [v[0], v[1]];
}
