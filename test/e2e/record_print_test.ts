/**
 * The static record in a real browser with JavaScript off: it shows
 * without console errors and without a single request beyond itself, and
 * prints on A4 and on Letter to a page count in the expected range.
 */
import { equal, ok } from "node:assert/strict";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import { gatherRecord, renderRecord } from "../../ui/record/mod.ts";
import { openBrowser, skipWithoutBrowser } from "./_harness.ts";

const DEMO = new URL("../../examples/fade/fade.md", import.meta.url);

async function demoRecord(): Promise<string> {
  const bytes = await Deno.readFile(DEMO);
  const source = new TextDecoder().decode(bytes);
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir: new URL(".", DEMO).pathname,
  });
  try {
    const report = await session.run(source);
    return renderRecord(
      await gatherRecord({
        path: "examples/fade/fade.md",
        bytes,
        source,
        report,
        startedMs: 0,
        durationMs: 0,
        sourceDateEpoch: "1767225600",
      }),
    );
  } finally {
    session.close();
  }
}

/** Pages of a PDF: its page objects (`/Type /Page`, not `/Pages`). */
function pdfPages(pdf: Uint8Array): number {
  const text = new TextDecoder("latin1").decode(pdf);
  return [...text.matchAll(/\/Type\s*\/Page(?![a-z])/g)].length;
}

Deno.test({
  name: "record: opens with JavaScript off, no console error, no request, prints on A4 and Letter",
  ignore: skipWithoutBrowser("record print"),
  fn: async () => {
    const dir = await Deno.makeTempDir({ prefix: "plumb-record-" });
    const file = `${dir}/record.html`;
    await Deno.writeTextFile(file, await demoRecord());
    const s = await openBrowser({ tap: false });
    try {
      await s.page.setJavaScriptEnabled(false);
      const requests: string[] = [];
      s.page.on("request", (r) => requests.push(r.url()));
      await s.page.goto(`file://${file}`, { waitUntil: "load" });
      equal(s.errors.length, 0, s.errors.join("\n"));
      equal(requests.length, 1, requests.join("\n"));
      const svgs = await s.page.$$eval("figure svg", (e) => e.length);
      ok(svgs >= 1, "charts drawn");
      const a4 = pdfPages(await s.page.pdf({ format: "A4" }));
      const letter = pdfPages(await s.page.pdf({ format: "Letter" }));
      // Measured 2026-12: the demo's record prints to a handful of pages; the range guards
      // against a broken print (one page, or a page per element), not the exact layout.
      ok(a4 >= 4 && a4 <= 30, `A4 pages ${a4}`);
      ok(letter >= 4 && letter <= 30, `Letter pages ${letter}`);
      console.log(`record print: A4 ${a4} pages, Letter ${letter} pages`);
    } finally {
      await s.close();
      await Deno.remove(dir, { recursive: true });
    }
  },
});
