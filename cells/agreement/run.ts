/**
 * Running an agreement cell: table → {@link Agreement}.
 *
 * ```
 *  table ─readSamples─▶ rows (x, y), samples (means of replicates)
 *     ─ratio─▶ δ given, or from the replicates (Linnet 1990, 1993)
 *     ─deming─▶ line on the sample means, jackknife SEs (weighted for proportional errors)
 *     ─passingBablok─▶ line, rank limits, cusum test (on the sample means)
 *     ─blandAltman─▶ bias and limits from every row's difference (replicates by ANOVA)
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { AgreementSpec } from "./spec.ts";
import type { Agreement } from "./agreement.ts";
import { readSamples, replicateRatio } from "./_samples.ts";
import { deming, DemingError } from "./deming.ts";
import { passingBablok, PassingBablokError } from "./passing_bablok.ts";
import { blandAltman } from "./bland_altman.ts";

/**
 * Compares the two methods of the spec.
 *
 * @param spec The normalised options.
 * @param ctx Inputs (the table), settings (confidence, seed) and the warning sink.
 * @returns The comparison.
 * @throws {CellError} For bad columns or rows (see `_samples.ts`), or readings
 *   that do not determine a rising line.
 */
export function runAgreement(spec: AgreementSpec, ctx: RunContext): Agreement {
  const s = readSamples(spec, ctx);
  const level = ctx.settings.confidence;
  const replicates = spec.varianceRatio === "replicates" ? replicateRatio(spec, s, ctx.name) : null;
  const ratio = replicates?.ratio ?? (spec.varianceRatio as number);
  if (spec.sample !== null && s.groups.every((g) => g.length === 1)) {
    ctx.warn(
      `Agreement "${ctx.name}": no value of "${spec.sample}" occurs twice, so every row is a sample of its own`,
    );
  }
  const { x: ux, y: uy } = s.units;
  if (ux !== null && uy !== null && ux !== uy) {
    ctx.warn(
      `Agreement "${ctx.name}" compares "${spec.x}" in ${ux} with "${spec.y}" in ${uy}: two methods of one quantity should report it in one unit, and the differences, bias and limits are taken in ${ux}`,
    );
  }
  const n = s.groups.length;
  if (n < 40) {
    ctx.warn(
      `Agreement "${ctx.name}" compares ${n} samples; intervals from so few are wide, and 40 or more is common practice`,
    );
  }
  let dem;
  try {
    dem = deming(s.xMean, s.yMean, ratio, spec.errors === "proportional", level);
  } catch (e) {
    if (!(e instanceof DemingError)) throw e;
    throw new CellError(`Cannot compare methods in "${ctx.name}": ${e.message}`, ["y"]);
  }
  let pb;
  try {
    pb = passingBablok(s.xMean, s.yMean, level);
  } catch (e) {
    if (!(e instanceof PassingBablokError)) throw e;
    throw new CellError(`Cannot compare methods in "${ctx.name}": ${e.message}`, ["y"]);
  }
  const means = Float64Array.from(s.x, (x, i) => (x + s.y[i]) / 2);
  const diffs = Float64Array.from(
    s.x,
    (x, i) => spec.differences === "percent" ? (100 * (s.y[i] - x)) / means[i] : s.y[i] - x,
  );
  const ba = blandAltman(diffs, s.groups, spec.limits, level, ctx.settings.seed);
  return {
    type: "Agreement",
    x: spec.x,
    y: spec.y,
    sample: spec.sample,
    errors: spec.errors,
    differences: spec.differences,
    samples: s,
    ratio,
    replicates,
    deming: dem,
    passingBablok: pb,
    blandAltman: ba,
    means,
    diffs,
    level,
  };
}
