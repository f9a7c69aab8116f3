/**
 * The fit layers of a chart: which fits can be drawn over the chart's x, and
 * their curves, band and residual series.
 *
 * A fit is drawn as a curve when it was fitted on the chart's table, models
 * the chart's y column (possibly transformed, then back-transformed) and has
 * at most one predictor, the chart's x. A fit with several predictors has no
 * single curve over x: it is refused with a message that says so (its
 * fitted-against-observed picture is the `check` cell's business).
 *
 * @module
 */
import { CellError, type OptionPath } from "../../kernel/errors.ts";
import { quotedList } from "../../kernel/linalg/mod.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import { type ResponseInverse, responseInverse } from "../../kernel/expr/mod.ts";
import type { Fit } from "../fit/fit.ts";
import type { ChartSpec } from "./spec.ts";

/** A fit that passed the checks, with where it was named and how to undo its transform. */
export interface DrawnFit {
  name: string;
  fit: Fit;
  path: OptionPath;
  inverse: ResponseInverse;
  /** Whether the response is the bare y column. */
  plain: boolean;
}

/**
 * The fits to draw: `fits` in order, then `band` when not among them.
 *
 * @param spec The chart's spec.
 * @param ctx Inputs by name; the cell name for messages.
 * @returns The checked fits.
 * @throws {CellError} At the option naming it, for a cell that gives no fit,
 *   a fit on another table, of another response, with another predictor or
 *   several, or with a response transform that cannot be undone.
 */
export function drawnFits(spec: ChartSpec, ctx: RunContext): DrawnFit[] {
  const named: [string, OptionPath][] = spec.fits.map((f, i) => [f, ["fits", i]]);
  if (spec.band !== null && !spec.fits.includes(spec.band)) named.push([spec.band, ["band"]]);
  return named.map(([name, path]) => checkFit(spec, ctx, name, path));
}

function checkFit(spec: ChartSpec, ctx: RunContext, name: string, path: OptionPath): DrawnFit {
  const out = ctx.inputs[name];
  const cannot = `Cannot draw fit "${name}" in chart "${ctx.name}"`;
  if (out === undefined || out.type !== "Fit") {
    throw new CellError(`Cannot chart "${ctx.name}": cell "${name}" gives no fit`, path);
  }
  const fit = out as Fit;
  if (fit.on !== spec.on) {
    throw new CellError(
      `${cannot}: it was fitted on table "${fit.on}", and the chart draws table "${spec.on}"`,
      path,
    );
  }
  const { columns, responseColumn, response } = fit.model;
  if (responseColumn !== spec.y) {
    throw new CellError(
      `${cannot}: it models "${responseColumn}", and the chart's y is "${spec.y}"`,
      path,
    );
  }
  if (columns.length > 1) {
    throw new CellError(
      `${cannot}: it has ${columns.length} predictors ${
        quotedList(columns)
      }, and a curve over "${spec.x}" needs a fit with one predictor`,
      path,
    );
  }
  if (columns.length === 1 && columns[0] !== spec.x) {
    throw new CellError(
      `${cannot}: its predictor is "${columns[0]}", and the chart's x is "${spec.x}"`,
      path,
    );
  }
  const inverse = responseInverse(response, responseColumn);
  if ("reason" in inverse) {
    throw new CellError(`${cannot} on the scale of "${spec.y}": ${inverse.reason}`, path);
  }
  const plain = response.op === "id";
  return { name, fit, path, inverse, plain };
}
