/**
 * Which uncertainty sets the digits of a prediction (shared by the view and
 * the CLI line, so both round alike; GUM, JCGM 100:2008, §7.2.6).
 *
 * @module
 */
import type { PredictSolveResult } from "./result.ts";

/**
 * The uncertainty that sets an estimate's digits: its standard error when
 * on the estimate's scale, else a quarter of its interval's width (an
 * interval of ±2 standard uncertainties; our rule, in the spirit of GUM §7.2.6).
 */
export function digitsFrom(
  se: number | null,
  interval: [number, number] | null,
  sameScale: boolean,
): number | null {
  return sameScale && se !== null && se > 0 ? se : quarterWidth(interval);
}

/** A quarter of an interval's width, or null when it has none. */
export function quarterWidth(ci: readonly [number | null, number | null] | null): number | null {
  if (ci === null || ci[0] === null || ci[1] === null) return null;
  const w = (ci[1] - ci[0]) / 4;
  return Number.isFinite(w) && w > 0 ? w : null;
}

/** An inverse prediction has no standard error of its own (Fieller's interval or the band's). */
export function solveUncertainty(s: PredictSolveResult): number | null {
  return quarterWidth(s.ci);
}
