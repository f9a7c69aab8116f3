/**
 * The glucose example (examples/glucose/): its numbers tell the story its
 * prose tells. The meter's readings were generated as 0.15 + 1.04·level
 * with a CV of 4 % against the analyser's 2 % (examples/glucose/generate.ts):
 * the replicate analysis finds both differences and its intervals hold the
 * generating values; one run with an assumed ratio finds neither.
 */
import { equal, ok } from "node:assert/strict";
import { plumbRunJson } from "./_plumb_run.ts";

const DOC = new URL("../../examples/glucose/glucose.md", import.meta.url).pathname;

interface Estimated {
  estimate: number;
  intervals: { method: string; lower: number; upper: number }[];
}
interface Result {
  variance_ratio: { value: number; source: string };
  deming: { weighted: boolean; intercept: Estimated; slope: Estimated };
  passing_bablok: { slope: Estimated; linearity: { linear: boolean } };
  agreement: { unit: string; bias: Estimated };
  verdict: {
    constant: { deming: boolean; passing_bablok: boolean };
    proportional: { deming: boolean; passing_bablok: boolean };
  };
}

Deno.test("glucose: the replicates show a proportional and a constant difference; one run shows neither", async () => {
  const { code, json, stderr } = await plumbRunJson(DOC);
  equal(code, 0, stderr);
  const cells = (json as { cells: { name: string; result: Result }[] }).cells;
  const get = (n: string) => cells.find((c) => c.name === n)!.result;
  const meter = get("meter"), one = get("one-run");
  equal(meter.variance_ratio.source, "replicates");
  // The generator's ratio of squared CVs is (0.04/0.02)² = 4; 48 df put the estimate within a
  // factor of 1.6 of it (χ² spread, common practice, no source).
  ok(meter.variance_ratio.value > 4 / 1.6 && meter.variance_ratio.value < 4 * 1.6);
  equal(meter.deming.weighted, true);
  const holds = (e: Estimated, v: number) => e.intervals[0].lower < v && v < e.intervals[0].upper;
  ok(holds(meter.deming.slope, 1.04), "the slope's interval holds the generator's 1.04");
  ok(holds(meter.deming.intercept, 0.15), "the intercept's interval holds the generator's 0.15");
  equal(meter.verdict.proportional.deming && meter.verdict.proportional.passing_bablok, true);
  equal(meter.verdict.constant.deming && meter.verdict.constant.passing_bablok, true);
  equal(meter.passing_bablok.linearity.linear, true);
  equal(meter.agreement.unit, "%");
  // One run, ratio assumed, constant errors: neither difference shows (the prose says so).
  equal(one.verdict.proportional.deming || one.verdict.constant.deming, false);
  equal(one.verdict.proportional.passing_bablok || one.verdict.constant.passing_bablok, false);
});
