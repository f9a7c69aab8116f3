/**
 * Every kind has both faces and they agree (DESIGN.md §2):
 *
 * - the compute registry (cells/mod.ts) and the page registry (cells/pages.ts)
 *   list the same kinds;
 * - every kind declares its options, and the shared check refuses an
 *   undeclared key with the one message form;
 * - a view renders a kind's page copy (the live page's result, made by
 *   kernel/worker/page_copy.ts) exactly as it renders the complete result;
 * - every kind's add-cell template, given the demo analysis as it stands,
 *   is a cell that computes (the browser test adds them through the page).
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { h } from "preact";
import { renderToString } from "preact-render-to-string";
import { registry } from "../../cells/mod.ts";
import { pages } from "../../cells/pages.ts";
import { CellError } from "../../kernel/errors.ts";
import { DEFAULT_SETTINGS, parseDocument } from "../../kernel/document/mod.ts";
import { insertCell } from "../../kernel/document/mod.ts";
import { templateFor } from "../../kernel/server/templates.ts";
import { type RunReport, Session } from "../../kernel/session/session.ts";
import { pageCopy } from "../../kernel/worker/page_copy.ts";
import { seededRandom } from "../../kernel/random.ts";

const DEMO = new URL("../../examples/fade/fade.md", import.meta.url);
const WORKER = new URL("../../cells/worker.ts", import.meta.url);

async function runDemo(source: string): Promise<RunReport> {
  const session = new Session({ registry, workerUrl: WORKER, dir: new URL(".", DEMO).pathname });
  try {
    return await session.run(source);
  } finally {
    session.close();
  }
}

/** A view's HTML, with the plotting library's running clip-path ids made equal. */
// deno-lint-ignore no-explicit-any
function html(view: any, name: string, result: unknown): string {
  return renderToString(h(view, { name, result })).replace(/plot-clip-\d+/g, "plot-clip-N");
}

Deno.test("the compute and page registries list the same kinds", () => {
  deepEqual([...registry.keys()].sort(), [...pages.keys()].sort());
});

Deno.test("every kind declares its options and refuses an undeclared one by the shared check", () => {
  for (const kind of registry.values()) {
    ok(Object.keys(kind.options).length > 0, `${kind.kind} declares options`);
    for (const [key, d] of Object.entries(kind.options)) {
      ok(
        d.doc.length > 0 && !d.doc.endsWith("."),
        `${kind.kind}.${key}: one line, no final period`,
      );
    }
    try {
      kind.parse({
        name: "c",
        kind: kind.kind,
        body: "",
        settings: DEFAULT_SETTINGS,
        warn() {},
        options: { unheard_of: 1 },
      });
      throw new Error(`${kind.kind} accepted an undeclared option`);
    } catch (e) {
      ok(e instanceof CellError, String(e));
      equal(e.message.split(":")[0], `Unknown option "unheard_of" in ${kind.kind} "c"`);
      deepEqual(e.path, ["unheard_of"]);
    }
  }
});

Deno.test("every kind's view renders its page copy as it renders the complete result", async () => {
  const report = await runDemo(await Deno.readTextFile(DEMO));
  const seen = new Set<string>();
  for (const cell of report.cells) {
    equal(cell.state, "current", `${cell.name}: ${cell.error?.message}`);
    const view = pages.get(cell.kind)!.view;
    const copy = pageCopy(registry.get(cell.kind)!, cell.result);
    const full = html(view, cell.name, cell.result);
    ok(full.length > 100, `${cell.name} renders something`);
    equal(html(view, cell.name, copy.result), full, cell.name);
    seen.add(cell.kind);
  }
  deepEqual([...seen].sort(), [...registry.keys()].sort(), "the demo has a cell of every kind");
});

Deno.test("every kind's template, added to the demo, computes", async () => {
  let source = await Deno.readTextFile(DEMO);
  for (const kind of registry.keys()) {
    const report = await runDemo(source);
    const results = new Map(report.cells.map((c) => [c.name, c.result]));
    const doc = parseDocument(source);
    const body = templateFor(kind, registry, doc, (n) => results.get(n) ?? null);
    ok(body.length > 0, `${kind} has a template`);
    const cells = doc.blocks.filter((b) => b.type === "cell").length;
    source = insertCell(doc, cells - 1, kind, `new-${kind}`, body);
  }
  const report = await runDemo(source);
  for (const kind of registry.keys()) {
    const cell = report.cells.find((c) => c.name === `new-${kind}`)!;
    equal(cell.state, "current", `${kind}: ${cell.error?.message}\n${source.slice(-600)}`);
  }
});

Deno.test("a large check's page copy (charts counted in the worker) renders as its complete result", async () => {
  // Invented data for this test: 6,000 rows of a straight line with seeded normal noise.
  const dir = await Deno.makeTempDir({ prefix: "plumb-faces-" });
  const rnd = seededRandom(7);
  const rows = Array.from(
    { length: 6000 },
    (_, i) => `${i / 100},${(1 + 0.5 * (i / 100) + rnd.normal()).toFixed(4)}`,
  );
  await Deno.writeTextFile(`${dir}/big.csv`, `x,y\n${rows.join("\n")}\n`);
  const source =
    "```table big\nfrom: big.csv\n```\n\n```fit line\non: big\nmodel: y = a + b*x\n```\n\n" +
    "```check judge\nfit: line\n```\n";
  const session = new Session({ registry, workerUrl: WORKER, dir });
  try {
    const cell = (await session.run(source)).cells.find((c) => c.name === "judge")!;
    equal(cell.state, "current", cell.error?.message);
    const copy = pageCopy(registry.get("check")!, cell.result);
    ok("density" in (copy.result as object), "the page copy carries the counted charts");
    ok(!("residuals" in (copy.result as object)), "and not the per-row arrays");
    const view = pages.get("check")!.view;
    equal(html(view, "judge", copy.result), html(view, "judge", cell.result));
  } finally {
    session.close();
    await Deno.remove(dir, { recursive: true });
  }
});
