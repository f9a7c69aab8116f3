/**
 * The stability example (examples/stability/): its numbers tell the story
 * its prose tells. The readings were generated as blank + a0·exp(−k·day)
 * with one a0 and one blank for every storage temperature and a rate per
 * temperature (examples/stability/generate.ts, `TRUTH`): the joint fit with
 * a0 and the blank shared converges and both sharings hold, one rate for all
 * three temperatures is rejected, the cold arm alone hardly fixes its rate,
 * and the calc cell's times follow from the joint fit's rates.
 */
import { equal, ok } from "node:assert/strict";
import { plumbRunJson } from "./_plumb_run.ts";
import { TRUTH } from "../../examples/stability/generate.ts";

const DOC = new URL("../../examples/stability/stability.md", import.meta.url).pathname;

interface Parameter {
  name: string;
  parameter: string;
  table: string | null;
  estimate: number;
  std_error: number;
  ci: [number, number];
}
interface Sharing {
  parameters: string[];
  rss_separate: number;
  f: number;
  p_value: number;
  shareable: boolean | null;
}
interface Joint {
  converged: boolean;
  confidence: number;
  rss: number;
  sigma: number;
  parameters: Parameter[];
  sharing: Sharing[];
}

Deno.test("stability: a0 and the blank shared hold, one rate for every temperature is rejected, the cold arm alone says little", async () => {
  const { code, json, stderr } = await plumbRunJson(DOC, "--no-history");
  equal(code, 0, stderr);
  const cells = (json as { cells: { name: string; state: string; result: unknown }[] }).cells;
  const get = (n: string) => {
    const c = cells.find((c) => c.name === n);
    equal(c?.state, "current", n);
    return c!.result;
  };
  const decay = get("decay") as Joint, oneRate = get("one-rate") as Joint;
  equal(decay.converged, true);
  equal(oneRate.converged, true);
  const alpha = 1 - decay.confidence;
  const test = (j: Joint, ...ps: string[]) =>
    j.sharing.find((s) => s.parameters.join() === ps.join())!;

  // The document's level decides: the shared blank and a0 hold, alone and together.
  for (const ps of [["blank"], ["a0"], ["blank", "a0"]]) {
    const s = test(decay, ...ps);
    equal(s.shareable, true, ps.join());
    ok(s.p_value >= alpha, `${ps}: p ${s.p_value}`);
  }
  // One rate is rejected, by far; the fit it is set against is decay's own (the same
  // least-squares problem from another start: equal RSS to 1e-6 relative, common practice,
  // no source).
  const rate = test(oneRate, "k");
  equal(rate.shareable, false);
  ok(rate.p_value < alpha && rate.f > 100, `F ${rate.f}, p ${rate.p_value}`);
  ok(Math.abs(rate.rss_separate - decay.rss) < 1e-6 * decay.rss);
  ok(oneRate.sigma > 10 * decay.sigma, "one rate misses the data many times over");

  // Invented data; the generator's true values: every estimate within four of its standard
  // errors of the value that made the data (loose on purpose: common practice, no source).
  const near = (p: Parameter, truth: number) =>
    ok(Math.abs(p.estimate - truth) < 4 * p.std_error, `${p.name} ${p.estimate} against ${truth}`);
  const byName = (n: string) => decay.parameters.find((p) => p.name === n)!;
  near(byName("a0"), TRUTH.a0);
  near(byName("blank"), TRUTH.blank);
  for (const t of [5, 25, 40]) near(byName(`k[${t}]`), TRUTH.k[t]);

  // The prose: alone, the cold arm's rate has a standard error many times the joint fit's.
  const alone = get("cold-alone") as { parameters: Parameter[] };
  const kAlone = alone.parameters.find((p) => p.name === "k")!;
  ok(kAlone.std_error > 5 * byName("k[5]").std_error, `${kAlone.std_error}`);

  // The calc cell reads the joint fit: ln(1/0.9)/k and the k interval carried through it
  // (exact arithmetic, to rounding).
  const t90 = (get("t90") as {
    value: Record<string, { days: number; lower: number; upper: number }>;
  }).value;
  const loss = Math.log(1 / 0.9);
  for (const t of [5, 25, 40]) {
    const k = byName(`k[${t}]`), got = t90[`at_${t}`];
    ok(Math.abs(got.days - loss / k.estimate) < 1e-12 * got.days);
    ok(Math.abs(got.lower - loss / k.ci[1]) < 1e-12 * got.lower);
    ok(Math.abs(got.upper - loss / k.ci[0]) < 1e-12 * got.upper);
  }
  // Invented data; the generator's true 5 °C time, ln(1/0.9)/0.0006 = 175.6 days, lies within a
  // tenth of the estimate (loose: common practice, no source).
  ok(Math.abs(t90.at_5.days - loss / TRUTH.k[5]) < 0.1 * t90.at_5.days);
});
