/**
 * The calc block's page face rendered to a string (cells/calc/view.tsx):
 * named values with the inline value's number formatting and the inline
 * form beside each, a list of records as rows, other data as indented JSON,
 * a table the cell gives as its size and columns, and what the code printed
 * in a closed disclosure. Results are written by hand in the shape of
 * `CalcResult` (cells/calc/result.ts); the last test takes one from a real
 * run of the demo's calc cell.
 */
import { doesNotMatch, equal, match, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { CalcView } from "../../cells/calc/view.tsx";
import type { CalcResult } from "../../cells/calc/mod.ts";
import type { TableResult } from "../../cells/table/summary.ts";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";

function result(value: unknown, more: Partial<CalcResult> = {}): CalcResult {
  return { value, gives: "value", table: null, console: "", console_cut: 0, run_ms: 12, ...more };
}

function render(name: string, r: CalcResult): string {
  return renderToString(h(CalcView, { name, result: r }));
}

/** The text of each body row of the block's first table, cells joined by " | ". */
function rowsOf(html: string): string[] {
  const body = /<tbody>(.*?)<\/tbody>/s.exec(html)?.[1] ?? "";
  return [...body.matchAll(/<tr>(.*?)<\/tr>/gs)].map((m) =>
    [...m[1].matchAll(/<t[hd][^>]*>(.*?)<\/t[hd]>/gs)]
      .map((c) => c[1].replace(/<[^>]+>/g, "").replace(/&amp;/g, "&").trim())
      .join(" | ")
  );
}

Deno.test("CalcView shows named numbers as prose shows them, the full value as the title", () => {
  const html = render(
    "crossing",
    result({ threshold: 2300, cycle: 461.20584359661876, u: 0.923551458372678, tiny: -3.2e-7 }),
  );
  // Six significant digits, as an inline value with no digits asked for (formatValue):
  // 461.20584… → 461.206, 0.92355145… → 0.923551 (exact arithmetic of rounding); a negative
  // below 1e-4 with a true minus and the power of ten written out.
  equal(
    rowsOf(html).join("\n"),
    [
      "threshold | 2300 | @(crossing.value.threshold)",
      "cycle | 461.206 | @(crossing.value.cycle)",
      "u | 0.923551 | @(crossing.value.u)",
      "tiny | −3.20000 × 10⁻⁷ | @(crossing.value.tiny)",
    ].join("\n"),
  );
  match(html, /<span title="461.20584359661876">461.206<\/span>/);
  match(html, /<section class="plumb-calc" aria-label="Calc crossing">/);
  doesNotMatch(html, /<details/, "nothing printed: no disclosure");
});

Deno.test("CalcView shows a single value under the cell's own inline form", () => {
  equal(rowsOf(render("answer", result(42))).join("\n"), "value | 42 | @(answer)");
  equal(rowsOf(render("ok", result(true))).join("\n"), "value | true | @(ok)");
  equal(rowsOf(render("nothing", result(null))).join("\n"), "value | — | @(nothing)");
});

Deno.test("CalcView gives no inline form for a field prose cannot name, and folds a field of many values", () => {
  const html = render(
    "eol",
    result({ "cycle at 80%": 700, ci: [690.5, 711.25], note: "<b>late</b>" }),
  );
  equal(
    rowsOf(html).join("\n"),
    [
      "cycle at 80% | 700 | —",
      "ci | [690.5,711.25] | —",
      "note | &lt;b>late&lt;/b> | @(eol.value.note)",
    ].join("\n"),
  );
  doesNotMatch(html, /<b>late/, "text from the code is escaped");
});

Deno.test("CalcView draws a list of records as rows, the first 100, with the inline form of the first", () => {
  const value = Array.from(
    { length: 150 },
    (_, i) => ({ cycle: 100 * (i + 1), capacity: 2500 - i / 3 }),
  );
  const html = render("grid", result(value));
  match(html, /<th scope="col">cycle<\/th><th scope="col">capacity<\/th>/);
  const rows = rowsOf(html);
  equal(rows.length, 100);
  // 2500 − 1/3 = 2499.666…, six significant digits: 2499.67 (exact arithmetic of rounding).
  equal(rows[1], "1 | 200 | 2499.67");
  match(html, /The first 100 of 150 rows\. In prose: <code>@\(grid\.value\[0\]\.cycle\)<\/code>/);
});

Deno.test("CalcView shows other data as indented JSON, cut past 20,000 characters with a note", () => {
  const nested = { fit: { a: [1, 2], b: { c: "d" } } };
  const html = render("deep", result(nested));
  ok(
    html.includes(
      `<pre class="plumb-calc-json">${
        JSON.stringify(nested, null, 2).replace(/"/g, "&quot;")
      }</pre>`,
    ),
    html,
  );
  const big = render("big", result({ list: Array.from({ length: 5000 }, (_, i) => ({ i })) }));
  const text = JSON.stringify({ list: Array.from({ length: 5000 }, (_, i) => ({ i })) }, null, 2);
  match(big, new RegExp(`Shown in part: ${text.length.toLocaleString("en")} characters in all`));
});

Deno.test("CalcView shows a table the cell gives: its size and its columns, not 'inline rows'", () => {
  const table: TableResult = {
    rows_read: 5,
    rows_used: 5,
    excluded: [],
    columns: [
      { name: "x", type: "number", unit: null, missing: 0 },
      { name: "y2", type: "number", unit: "mV", missing: 1 },
    ],
    sha256: null,
    source: null,
    rows_filtered: 0,
    rows_missing: [3],
  };
  const html = render("doubled", result(null, { gives: "table", table }));
  match(
    html,
    /A table of 5 rows and 2 columns for other cells to read \(<code>on: doubled<\/code>\)/,
  );
  equal(rowsOf(html).join("\n"), "x | — | 0\ny2 | mV | 1");
  doesNotMatch(html, /Inline rows/);
});

Deno.test("CalcView folds what the code printed in a closed disclosure, counting lines and those not kept", () => {
  const html = render("p", result(1, { console: "first\nsecond <i>\n", console_cut: 3 }));
  match(
    html,
    /<details class="plumb-calc-console"><summary>Printed by the code \(2 lines, 3 more lines not kept\)<\/summary><pre>first\nsecond &lt;i>\n<\/pre><\/details>/,
  );
  doesNotMatch(html, /<details[^>]* open/);
  match(render("q", result(1, { console: "one\n" })), /Printed by the code \(1 line\)/);
});

Deno.test("CalcView renders the demo's crossing from a real run", async () => {
  const demo = new URL("../../examples/fade/", import.meta.url);
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir: demo.pathname,
    page: true,
  });
  try {
    const report = await session.run(await Deno.readTextFile(new URL("fade.md", demo)));
    const c = report.cells.find((x) => x.name === "crossing")!;
    equal(c.state, "current", c.error?.message);
    const rows = rowsOf(render("crossing", c.result as CalcResult));
    equal(rows.map((r) => r.split(" | ")[0]).join(" "), "threshold cycle u u_without_correlation");
    // The cycle to six significant digits (formatValue): no more digits than that.
    match(rows[1], /^cycle \| \d{3}\.\d{3} \| @\(crossing\.value\.cycle\)$/);
  } finally {
    session.close();
  }
});
