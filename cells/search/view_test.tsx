import { deepEqual, equal, ok } from "node:assert/strict";
import { h } from "preact";
import { renderToString } from "preact-render-to-string";
import { parseHTML } from "linkedom";
import { SearchView } from "./view.tsx";
import { searchDetails, searchLine } from "./line.ts";
import { addFitCell, fitBody } from "./add_fit.ts";
import { invented, search, tableOf } from "./_testing.ts";

async function result(by = "bic") {
  const table = tableOf(invented(40, 5, 12));
  return (await search(table, { response: "y", by, keep: 2 })).result;
}

Deno.test("SearchView shows the best models overall and per size, and the criterion chart", async () => {
  const r = await result();
  const html = renderToString(h(SearchView, { name: "drivers", result: r }));
  ok(html.includes("Best by BIC: x1 + x3 + x4"), html.slice(0, 400));
  ok(html.includes("<caption>Best overall</caption>"));
  ok(html.includes("<caption>Best by number of candidates</caption>"));
  ok(html.includes("candidates in the model"), "the chart's x axis");
  ok(html.includes('aria-label="BIC of the best models by number of candidates"'));
  // Two header rows, then one row per listed model: 2 overall; per size 1 of 0 and of 5
  // candidates (one subset each), 2 of 1–4.
  equal(html.match(/<tr/g)!.length, 2 + 2 + 1 + 2 * 4 + 1);
  ok(!html.includes("add as fit"), "no buttons where no script runs (the record, tests)");
  ok(html.includes("Every model holds an intercept; candidates: x1, x2, x3, x4, x5."));
});

Deno.test("SearchView names adjusted R² and LOO by their own columns", async () => {
  const adj = renderToString(h(SearchView, { name: "s", result: await result("adj_r2") }));
  ok(
    adj.includes("Best by adjusted R²") && adj.includes("LOO RMSE") &&
      adj.includes("(Δ adjusted R² "),
  );
  const loo = renderToString(h(SearchView, { name: "s", result: await result("loo") }));
  ok(loo.includes("Δ LOO RMSE") && loo.includes("adjusted R²"));
});

Deno.test("searchLine() and searchDetails() give the best model and the best of each size", async () => {
  const r = await result("aicc");
  const line = searchLine(r);
  ok(
    /^best by AICc: x1 \+ [x\d +]+ \(k \d, AICc [\d.]+\) · 32 subsets of 5 candidates$/.test(line),
    line,
  );
  const details = searchDetails(r);
  equal(details.length, 6);
  ok(details[0].startsWith("0 candidates: intercept only, AICc "), details[0]);
});

Deno.test("addFitCell() posts a fit of the model below the search, at the page's version", async () => {
  const r = await result();
  const { document } = parseHTML(
    `<div class="pl-page" data-version="v7"><section data-block="drivers"><button>x</button>` +
      `</section><section data-block="drivers-fit"></section></div>`,
  );
  const seen: unknown[] = [];
  const saved = globalThis.fetch;
  globalThis.fetch = (_url: unknown, init?: RequestInit) => {
    seen.push(JSON.parse(String(init!.body)));
    return Promise.resolve(Response.json({ version: "v8" }));
  };
  try {
    const body = fitBody(r, r.best[0]);
    equal(body, "on: t\nmodel: y = linear(x1, x3, x4)\n");
    const said = await addFitCell(document.querySelector("button") as HTMLElement, "drivers", body);
    equal(said, 'Added fit "drivers-fit-2" below this search');
    deepEqual(seen, [{ after: "drivers", kind: "fit", name: "drivers-fit-2", base: "v7", body }]);
  } finally {
    globalThis.fetch = saved;
  }
});
