/**
 * The output of an `agreement` cell: two methods' readings of the same
 * samples, their Deming and Passing–Bablok lines and their agreement.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { ErrorModel } from "./spec.ts";
import type { ReplicateRatio, Samples } from "./_samples.ts";
import type { Deming } from "./deming.ts";
import type { PassingBablok } from "./passing_bablok.ts";
import type { BlandAltman } from "./bland_altman.ts";

/** A method comparison. */
export interface Agreement extends CellOutput {
  type: "Agreement";
  x: string;
  y: string;
  sample: string | null;
  errors: ErrorModel;
  differences: "absolute" | "percent";
  samples: Samples;
  /** δ = σ²(y)/σ²(x) used, given or estimated from the replicates. */
  ratio: number;
  replicates: ReplicateRatio | null;
  deming: Deming;
  passingBablok: PassingBablok;
  blandAltman: BlandAltman;
  /** Per row: the pair's mean and difference (the agreement plot). */
  means: Float64Array;
  diffs: Float64Array;
  level: number;
}
