/**
 * CellBlock's rendering budget: a state-only message (queued, computing,
 * current reused from the cache) redraws the header, never the kind's view;
 * a new result object redraws the view once. Views are counted with
 * Preact's `options.diffed` hook on a linkedom document.
 *
 * @module
 */
import { equal } from "node:assert/strict";
import { parseHTML } from "linkedom";
import { options, render } from "preact";
import { CellBlock } from "./cell_block.tsx";
import { GenericView } from "./generic_view.tsx";
import { LiveStore } from "./store.ts";

const settle = () => new Promise((r) => setTimeout(r, 0));

Deno.test("CellBlock redraws its view only for a new result object", async () => {
  const { document } = parseHTML("<!doctype html><html><body><div id=app></div></body></html>");
  const g = globalThis as unknown as Record<string, unknown>;
  const saved = g.document;
  g.document = document;
  let views = 0;
  const before = options.diffed;
  options.diffed = (v) => {
    if (v.type === GenericView) views++;
    before?.(v);
  };
  try {
    const store = new LiveStore(() => 0);
    const block = { type: "cell" as const, name: "p", kind: "probe", line: 1, body: "" };
    store.apply({
      type: "document",
      version: "v1",
      path: "a.md",
      title: "A",
      source: "",
      blocks: [block],
      data: [],
    });
    const cell = (state: "queued" | "computing" | "current", run: number, result?: unknown) =>
      store.apply({ type: "cell", version: "v1", name: "p", kind: "probe", state, run, result });
    const root = document.getElementById("app")!;
    const noop = () => {};
    render(
      <CellBlock store={store} block={block} version="v1" onRemove={noop} onAddBelow={noop} />,
      root as unknown as Element,
    );
    cell("current", 1, { rows_used: 3 });
    await settle();
    equal(views, 1); // the first result: drawn once
    cell("queued", 2);
    await settle();
    cell("computing", 2);
    await settle();
    cell("current", 2); // reused from the cache: no result in the message
    await settle();
    equal(views, 1); // three state-only messages: the view is not redrawn
    equal(root.querySelector("[data-block]")!.getAttribute("data-run"), "2");
    cell("current", 3, { rows_used: 4 });
    await settle();
    equal(views, 2); // a new result object: drawn once more
    render(null, root as unknown as Element);
  } finally {
    options.diffed = before;
    g.document = saved;
  }
});
