/**
 * The agreement block (cells/agreement/view.tsx), from the glucose example
 * run through a session with page copies: the verdict first, both lines
 * with the method of their intervals, the cusum test in words, the
 * agreement plot as SVG with one ring per row and the bias and both limits
 * named at their rules (shape and words, not colour alone), the methods
 * plot with the line of identity, and no script.
 */
import { equal, match, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { AgreementView } from "../../cells/agreement/view.tsx";
import type { AgreementResult } from "../../cells/agreement/result.ts";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);
const DOC = new URL("../../examples/glucose/glucose.md", import.meta.url);

async function results(): Promise<Map<string, AgreementResult>> {
  const s = new Session({
    registry,
    workerUrl: WORKER,
    dir: new URL(".", DOC).pathname,
    page: true,
  });
  try {
    const report = await s.run(await Deno.readTextFile(DOC));
    return new Map(report.cells.map((c) => [c.name, c.result as AgreementResult]));
  } finally {
    s.close();
  }
}

Deno.test("agreement view: verdict, both lines, cusum, the agreement plot and the methods plot", async () => {
  const r = (await results()).get("meter")!;
  const html = renderToString(h(AgreementView, { name: "meter", result: r }));
  match(html, /<p class="plumb-agreement-verdict">At the 95% level: a constant difference/);
  match(html, /<th scope="row">Deming, weighted<\/th>/);
  match(html, /<th scope="row">Passing–Bablok<\/th>/);
  match(html, /jackknife t \(46 df\)/);
  match(html, /Passing–Bablok ranks/);
  match(html, /Cusum test of linearity: .*a straight line holds/);
  match(html, /estimated from 48 replicated samples/);
  // The agreement plot: one ring per row (96), three named rules, bands behind them.
  const plots = html.split("<figure").slice(1);
  equal(plots.length, 2);
  equal((plots[0].match(/<circle /g) ?? []).length, 96);
  for (const label of ["upper limit", "bias", "lower limit"]) {
    ok(plots[0].includes(`>${label}</text>`), label);
  }
  equal((plots[0].match(/fill-opacity="0.1"/g) ?? []).length, 3, "three interval bands");
  match(plots[0], /difference, % of mean/);
  // The methods plot: one ring per sample (48), identity and both lines in the key.
  equal((plots[1].match(/<circle /g) ?? []).length, 48);
  for (const label of ["y = x", "Deming", "Passing–Bablok"]) {
    ok(plots[1].includes(`>${label}</text>`), label);
  }
  ok(!/<script|\son[a-z]+=/i.test(html), "no script, no handler");
});

Deno.test("agreement view: absolute differences carry the unit; a given ratio says so", async () => {
  const r = (await results()).get("one-run")!;
  const html = renderToString(h(AgreementView, { name: "one-run", result: r }));
  match(html, /meter − analyser \(mmol\/L\)/);
  match(html, /Ratio of error variances, y's over x's: 4 \(given\)/);
  match(html, /<th scope="row">Deming<\/th>/);
  match(html, /no constant difference shown/);
});
