/**
 * The options of a `chart` cell and their normaliser.
 *
 * ```chart overview
 * on: cycles               # the table cell whose rows are drawn (required)
 * x: cycle                 # column on the horizontal axis (required)
 * y: capacity              # column on the vertical axis (required)
 * fits: [line, root]       # fit cells drawn as curves over the x range (optional)
 * band: root               # fit whose band is drawn (optional)
 * band_for: mean           # the band of the mean, of a new observation, or both (default mean)
 * band_method: pointwise   # pointwise (delta), scheffe or bootstrap: simultaneous (default pointwise)
 * band_level: 0.95         # the band's level (default: the document's confidence)
 * new_observations: 1      # new observations averaged, for the band of a new observation (default 1)
 * residuals: true          # a residual panel under the chart (default false)
 * log: x                   # logarithmic axis: x, y or both (default none)
 * title: Capacity fade     # a title over the chart (optional)
 * bin_above: 5000          # more rows than this are drawn binned (default 5000)
 * ```
 *
 * Column names are checked in `run`, against the table (the parse step has
 * only the options).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import {
  checkOptionKeys,
  type OptionDecls,
  type ParseContext,
  readBoolean,
  readChoice,
  readNumber,
  shown,
} from "../../kernel/contract/mod.ts";

/** A `chart` cell's normalised options (plain JSON: hashed into the cache key). */
export interface ChartSpec {
  on: string;
  x: string;
  y: string;
  /** Fit cells drawn as curves, in the order written. */
  fits: string[];
  /** The fit whose band is drawn (its curve is drawn too, after `fits`, when not listed there). */
  band: string | null;
  /** Which bands: of the mean, of a new observation, or both. */
  bandFor: BandFor;
  /** Pointwise (delta method) or simultaneous over the plotted range (Scheffé, bootstrap sup-t). */
  bandMethod: BandMethod;
  /** The bands' level; null: the document's confidence. */
  bandLevel: number | null;
  /** m, the new observations averaged in the band of a new observation. */
  newObservations: number;
  residuals: boolean;
  logX: boolean;
  logY: boolean;
  title: string | null;
  /** Rows beyond this count are drawn as a 2-D density. */
  binAbove: number;
}

/** The bands `band_for` can ask. */
export const BAND_FOR = ["mean", "observation", "both"] as const;
export type BandFor = typeof BAND_FOR[number];

/** The band methods `band_method` can ask. */
export const BAND_METHODS = ["pointwise", "scheffe", "bootstrap"] as const;
export type BandMethod = typeof BAND_METHODS[number];

/** Rows beyond which points are binned, unless `bin_above` says otherwise (about 5,000: issue 5). */
export const DEFAULT_BIN_ABOVE = 5000;

/** Options a `chart` cell understands, each declared once. */
export const CHART_OPTIONS: OptionDecls = {
  on: { type: "text", doc: "the table cell whose rows are drawn", required: true, names: "cell" },
  x: { type: "text", doc: "the column on the horizontal axis", required: true, names: "column" },
  y: { type: "text", doc: "the column on the vertical axis", required: true, names: "column" },
  fits: { type: "list", doc: "fit cells drawn as curves over the x range", names: "cells" },
  band: { type: "text", doc: "a fit whose band is drawn", names: "cell" },
  band_for: {
    type: "choice",
    doc: "the band of the mean, of a new observation (prediction band), or both",
    choices: BAND_FOR,
    default: "mean",
  },
  band_method: {
    type: "choice",
    doc: "pointwise (delta method), or simultaneous over the plotted range: scheffe or bootstrap",
    choices: BAND_METHODS,
    default: "pointwise",
  },
  band_level: {
    type: "number",
    doc: "the band's level in (0, 1) (default the document's confidence)",
  },
  new_observations: {
    type: "whole number",
    doc: "new observations averaged, for the band of a new observation",
    default: 1,
  },
  residuals: { type: "boolean", doc: "whether a residual panel is drawn under the chart" },
  log: { type: "choice", doc: "logarithmic axes", choices: ["x", "y", "both"] },
  title: { type: "text", doc: "a title over the chart" },
  bin_above: {
    type: "whole number",
    doc: "rows beyond which points are drawn binned as a density",
  },
};

/**
 * Checks and normalises a `chart` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For a missing `on`, `x` or `y`, a cell or column name
 *   that is not a single word, a bad `fits`, `log`, `residuals`, `title`,
 *   `bin_above` or band option, a band option without `band`, a bootstrap
 *   band of a new observation, or an unknown option.
 * @example
 * ```ts
 * import { parseChartSpec } from "./spec.ts";
 * const spec = parseChartSpec({
 *   name: "overview", kind: "chart", body: "", warn() {},
 *   options: { on: "cycles", x: "cycle", y: "capacity", fits: ["line"], band: "root" },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.fits.join() !== "line" || spec.band !== "root") throw new Error(spec.fits.join());
 * ```
 */
export function parseChartSpec(ctx: ParseContext): ChartSpec {
  const o = ctx.options;
  checkOptionKeys(ctx, CHART_OPTIONS);
  const fits = fitList(ctx, o.fits);
  const band = o.band === undefined || o.band === null ? null : word(ctx, "band", o.band, ["band"]);
  const log = logAxes(ctx, o.log);
  return {
    on: required(ctx, "on", "the table cell to draw, as in on: cycles"),
    x: required(ctx, "x", "the column on the horizontal axis, as in x: cycle"),
    y: required(ctx, "y", "the column on the vertical axis, as in y: capacity"),
    fits,
    band,
    ...bandOptions(ctx, band, fits),
    residuals: readBoolean(ctx, "residuals", false),
    logX: log.x,
    logY: log.y,
    title: titleText(ctx, o.title),
    binAbove: binAbove(ctx, o.bin_above),
  };
}

/** The band options, refused without `band` and in the one combination with no method. */
function bandOptions(ctx: ParseContext, band: string | null, fits: string[]) {
  const keys = ["band_for", "band_method", "band_level", "new_observations"] as const;
  const given = keys.filter((k) => ctx.options[k] !== undefined && ctx.options[k] !== null);
  if (band === null && given.length > 0) {
    throw new CellError(
      `Option "${
        given[0]
      }" of chart "${ctx.name}" needs "band": name the fit whose band is drawn, as in band: ${
        fits[0] ?? "line"
      }`,
      [given[0]],
    );
  }
  const bandFor = readChoice(ctx, "band_for", BAND_FOR) ?? "mean";
  const bandMethod = readChoice(ctx, "band_method", BAND_METHODS) ?? "pointwise";
  if (bandMethod === "bootstrap" && bandFor !== "mean") {
    throw new CellError(
      `Option "band_method" of chart "${ctx.name}" is "bootstrap", and the bootstrap band is of the mean only (the refits give curves, not new observations): use band_method: scheffe for a simultaneous band of a new observation`,
      ["band_method"],
    );
  }
  const bandLevel = ctx.options.band_level === undefined || ctx.options.band_level === null
    ? null
    : readNumber(ctx, "band_level", NaN, (v) => v > 0 && v < 1, "a level in (0, 1), such as 0.95");
  const newObservations = readNumber(
    ctx,
    "new_observations",
    1,
    (v) => Number.isInteger(v) && v >= 1,
    "a whole number of new observations, 1 or more",
  );
  if (newObservations !== 1 && bandFor === "mean") {
    throw new CellError(
      `Option "new_observations" of chart "${ctx.name}" applies to the band of a new observation: add band_for: observation (or both)`,
      ["new_observations"],
    );
  }
  return { bandFor, bandMethod, bandLevel, newObservations };
}

function required(ctx: ParseContext, key: "on" | "x" | "y", what: string): string {
  const v = ctx.options[key];
  if (v === undefined || v === null) {
    throw new CellError(`Missing "${key}" in chart "${ctx.name}": name ${what}`, []);
  }
  return word(ctx, key, v, [key]);
}

function word(ctx: ParseContext, key: string, v: unknown, path: (string | number)[]): string {
  const text = typeof v === "number" ? String(v) : v;
  if (typeof text !== "string" || text.trim() === "" || /\s/.test(text.trim())) {
    throw new CellError(
      `Option "${key}" of chart "${ctx.name}" is "${shown(v)}": expected one name`,
      path,
    );
  }
  return text.trim();
}

function fitList(ctx: ParseContext, v: unknown): string[] {
  if (v === undefined || v === null) return [];
  const list = Array.isArray(v) ? v : [v];
  const out: string[] = [];
  list.forEach((item, i) => {
    const name = word(ctx, "fits", item, Array.isArray(v) ? ["fits", i] : ["fits"]);
    if (out.includes(name)) {
      throw new CellError(
        `Fit "${name}" is listed twice in "fits" of chart "${ctx.name}"`,
        Array.isArray(v) ? ["fits", i] : ["fits"],
      );
    }
    out.push(name);
  });
  return out;
}

function logAxes(ctx: ParseContext, v: unknown): { x: boolean; y: boolean } {
  if (v === undefined || v === null || v === "none") return { x: false, y: false };
  if (v === "x") return { x: true, y: false };
  if (v === "y") return { x: false, y: true };
  if (v === "both" || v === "xy") return { x: true, y: true };
  throw new CellError(
    `Option "log" of chart "${ctx.name}" is "${shown(v)}": expected x, y, both or none`,
    ["log"],
  );
}

function titleText(ctx: ParseContext, v: unknown): string | null {
  if (v === undefined || v === null) return null;
  if (typeof v !== "string" && typeof v !== "number") {
    throw new CellError(
      `Option "title" of chart "${ctx.name}" is "${shown(v)}": expected a line of text`,
      ["title"],
    );
  }
  return String(v);
}

function binAbove(ctx: ParseContext, v: unknown): number {
  if (v === undefined || v === null) return DEFAULT_BIN_ABOVE;
  if (typeof v !== "number" || !Number.isInteger(v) || v < 0) {
    throw new CellError(
      `Option "bin_above" of chart "${ctx.name}" is "${
        String(v)
      }": expected a whole number of rows, 0 or more`,
      ["bin_above"],
    );
  }
  return v;
}
