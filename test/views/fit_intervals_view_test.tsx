/**
 * The fit block's intervals by method (cells/fit/_intervals_view.tsx): a
 * nonlinear fit run through a session shows Wald, profile and bootstrap
 * columns, a derived quantity with its disagreement note, an open side as
 * "open" with its note, and folded profile traces as SVG; a linear fit with
 * Wald intervals alone shows no such part.
 */
import { doesNotMatch, match, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { FitView } from "../../cells/fit/view.tsx";
import type { FitResult } from "../../cells/fit/result.ts";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);
const fence = (info: string, body: string) => "```" + info + "\n" + body + "\n```\n\n";

/** Puromycin, treated (Treloar 1974, via Bates & Watts 1988 Appendix A1.3; from memory). */
const PURO = fence(
  "table puro",
  "columns: [conc, rate]\nrows:\n" +
    [
      [0.02, 76],
      [0.02, 47],
      [0.06, 97],
      [0.06, 107],
      [0.11, 123],
      [0.11, 139],
      [0.22, 159],
      [
        0.22,
        152,
      ],
      [0.56, 191],
      [0.56, 201],
      [1.10, 207],
      [1.10, 200],
    ].map(([c, r]) => `  - [${c}, ${r}]`)
      .join("\n"),
);

async function resultsOf(doc: string): Promise<Map<string, FitResult>> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-intervals-view-" });
  const s = new Session({ registry, workerUrl: WORKER, dir, page: true });
  try {
    const report = await s.run(doc);
    return new Map(report.cells.map((c) => [c.name, c.result as FitResult]));
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test("the fit view lists every interval by method, a derived quantity's note and the profile traces", async () => {
  // Invented: a rise that never bends, so a's profile is open above.
  const rise = fence(
    "table flat",
    "columns: [x, y]\nrows:\n" +
      [1, 2, 3, 4, 5, 6, 7, 8].map((x) =>
        `  - [${x}, ${Number((2 * x * (1 - 0.01 * x) + 0.2 * Math.cos(2.3 * x)).toFixed(6))}]`
      ).join("\n"),
  );
  const doc = "# Intervals\n\n" + PURO + rise +
    fence(
      "fit mm",
      "on: puro\nmodel: rate = Vm*conc/(K + conc)\nstart: { Vm: 200, K: 0.1 }\nbootstrap: { resamples: 400 }\nderived:\n  efficiency: Vm/K",
    ) +
    fence("fit open", "on: flat\nmodel: y = a*(1 - exp(-b*x))\nstart: { a: 50, b: 0.05 }") +
    fence("fit line", "on: puro\nmodel: rate = c + d*conc");
  const results = await resultsOf(doc);
  const html = renderToString(h(FitView, { name: "mm", result: results.get("mm")! }));
  match(html, /Intervals at 95% by method/);
  for (
    const heading of [
      "Wald \\(delta method\\)",
      "Profile likelihood",
      "Bootstrap percentile",
      "Bootstrap BCa",
    ]
  ) {
    match(html, new RegExp(`<th scope="col">${heading}</th>`));
  }
  match(html, /bootstrap: 400 residual resamples, seed 1/);
  match(html, /<code>efficiency<\/code>/);
  match(html, /the methods disagree/);
  match(html, /Monte Carlo standard error of the limits/);
  match(html, /Monte Carlo standard error of the bootstrap limits, at most: Vm [0-9.]+, K [0-9.]+/);
  match(html, /<summary>Profile traces<\/summary>/);
  match(html, /aria-label="Profile t of K"/);
  const open = renderToString(h(FitView, { name: "open", result: results.get("open")! }));
  match(open, /… open/);
  match(open, /the profile does not close above/);
  const line = renderToString(h(FitView, { name: "line", result: results.get("line")! }));
  doesNotMatch(line, /by method/);
  ok(!line.includes("Profile traces"));
});

Deno.test("the fit view of a response below a detection limit: rows, method and the substitutions beside ML", async () => {
  // Invented: a decline through a detection limit of 1 (cells below it written "<1").
  const rows = Array.from({ length: 14 }, (_, i) => {
    const v = 4.6 - 0.45 * (i + 1) + 0.25 * Math.sin(2.1 * (i + 1));
    return `  - [${i + 1}, "${v < 1 ? "<1" : v.toFixed(3)}"]`;
  }).join("\n");
  const doc =
    fence("table water", `columns: [day, nitrate]\nbelow_limit: [nitrate]\nrows:\n${rows}`) +
    fence("fit ml", "on: water\nmodel: nitrate = a + b*day") +
    fence("fit half", "on: water\nmodel: nitrate = a + b*day\nsubstitute: 0.5");
  const results = await resultsOf(doc);
  const ml = renderToString(h(FitView, { name: "ml", result: results.get("ml")! }));
  match(ml, /rows lie below their detection limit \(cells of nitrate written &lt;L\)/);
  match(ml, /maximum likelihood, censored normal/);
  for (const label of ["L/2", "L/√2"]) match(ml, new RegExp(`<th scope="row">${label}</th>`));
  const half = renderToString(h(FitView, { name: "half", result: results.get("half")! }));
  match(half, /given 0.5·L and fitted as if measured \(substitution\)/);
});
