/**
 * The live page printed, in headless Chromium against the real `plumb
 * serve` on a copy of the demo: under print media the date of printing
 * shows, live-only text (elapsed times, "changed … ago", the connection,
 * the undo notice, edit controls, the add-a-cell form, the rail) is hidden,
 * headings keep with what follows, and the page rule numbers the pages.
 * The PDF goes to test/artifacts/print.pdf for review.
 */
import { equal, ok } from "node:assert/strict";
import { allCurrent, ARTIFACTS, skipWithoutBrowser, withServedBrowser } from "./_harness.ts";

const ignore = skipWithoutBrowser("print");

const LIVE_ONLY = [
  ".pl-live-only",
  ".pl-cell-ms",
  ".pl-cell-actions",
  ".pl-add",
  ".pl-rail",
  ".pl-top-tools",
];

Deno.test({
  name:
    "print: the date of printing and page numbers, no live-only text, headings kept with their text",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await withServedBrowser("fade", "fade.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await allCurrent(page);
      await page.emulateMediaType("print");
      const seen = await page.evaluate((sels: string[]) => {
        const shown = sels.flatMap((s) =>
          [...document.querySelectorAll(s)].filter((e) => (e as HTMLElement).offsetParent !== null)
            .map(() => s)
        );
        const d = new Date();
        const p = (n: number) => String(n).padStart(2, "0");
        const today = `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
        const printed = document.querySelector(".pl-printed") as HTMLElement;
        const h2 = document.querySelector(".pl-prose h2")!;
        const pageRule = [...document.styleSheets].flatMap((s) => [...s.cssRules])
          .some((r) => r.cssText.includes("counter(page)"));
        return {
          shown,
          today,
          printed: printed.offsetParent !== null ? printed.textContent : null,
          text: document.body.innerText,
          h2: getComputedStyle(h2).breakAfter,
          head: getComputedStyle(document.querySelector(".pl-cell-head")!).breakAfter,
          pageRule,
        };
      }, LIVE_ONLY);
      equal(seen.shown.length, 0, `shown in print: ${seen.shown.join(", ")}`);
      ok(seen.printed?.startsWith(`Printed ${seen.today}`), `date of printing: ${seen.printed}`);
      ok(
        !/changed .* ago|just now|not live|disconnected|\bms\b|add below|Add a cell/.test(
          seen.text,
        ),
        "no live-only words in the printed text",
      );
      equal(seen.h2, "avoid-page");
      equal(seen.head, "avoid-page");
      ok(seen.pageRule, "an @page rule numbers the pages");
      const pdf = await page.pdf({ format: "A4" });
      await Deno.writeFile(new URL("print.pdf", ARTIFACTS), pdf);
      const pages = [
        ...new TextDecoder("latin1").decode(pdf).matchAll(/\/Type\s*\/Page(?![a-z])/g),
      ];
      ok(pages.length >= 3 && pages.length <= 40, `A4 pages: ${pages.length}`);
      await page.emulateMediaType("screen");
      ok(b.errors.length === 0, b.errors.join("\n"));
    });
  },
});
