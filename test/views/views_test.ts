/**
 * Every kind's view renders its own result to HTML (the same components
 * serve the live page and the static record), here for the demo analysis.
 */
import { match, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { registry } from "../../cells/mod.ts";
import { pages } from "../../cells/pages.ts";
import { Session } from "../../kernel/session/session.ts";

const DEMO = new URL("../../examples/fade/fade.md", import.meta.url);

Deno.test("views render the demo's table and fit results to HTML", async () => {
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir: new URL(".", DEMO).pathname,
  });
  try {
    const report = await session.run(await Deno.readTextFile(DEMO));
    for (const cell of report.cells) {
      ok(cell.state === "current", `${cell.name}: ${cell.error?.message}`);
      const view = pages.get(cell.kind)!.view;
      const html = renderToString(h(view, { name: cell.name, result: cell.result }));
      ok(html.length > 100, `${cell.name} renders something`);
      if (cell.kind === "table" && cell.name === "cycles") {
        match(html, /capacity/);
        match(html, /thermocouple came loose/);
      }
      if (cell.kind === "fit") match(html, /q0/);
    }
  } finally {
    session.close();
  }
});
