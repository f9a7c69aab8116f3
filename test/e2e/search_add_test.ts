/**
 * The `search` cell on the live page, in headless Chromium against the real
 * `plumb serve` on a copy of the demo, at a phone, a half-screen and a
 * desktop width: each listed model has its "add as fit" button, and one
 * click puts a `fit` cell of that model below the search, in the document
 * on disk and on the page, computed.
 */
import { ok } from "node:assert/strict";
import { allCurrent, skipWithoutBrowser, withServedBrowser } from "./_harness.ts";

const ignore = skipWithoutBrowser("search add as fit");

const WIDTHS = [390, 960, 1440];

Deno.test({
  name: "search: a listed model becomes a fit cell below the search, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    for (const width of WIDTHS) {
      await withServedBrowser("fade", "fade.md", async (served, b) => {
        const { page } = b;
        await page.setViewport({ width, height: 900 });
        await page.goto(served.url);
        await allCurrent(page);
        const button = '[data-block="fade-terms"] .plumb-search button.pl-link';
        await page.waitForSelector(button, { timeout: 30_000 });
        const buttons = await page.$$(button);
        ok(buttons.length >= 2, `${width} px: a button per listed model (${buttons.length})`);
        // The page itself never scrolls sideways; a table wider than a phone scrolls in its
        // own box (ui/style.ts, `.pl-result table`), where the click scrolls the button into view.
        const wide = await page.evaluate(() => document.documentElement.scrollWidth);
        ok(wide <= width, `${width} px: the page is ${wide} px wide`);
        // Scrolled to the middle of the view, as a reader would (the page's top bar stays over
        // whatever is scrolled just under it), and nothing else over it there.
        await buttons[0].evaluate((el) => el.scrollIntoView({ block: "center" }));
        const hit = await buttons[0].evaluate((el) => {
          const r = el.getBoundingClientRect();
          const top = document.elementFromPoint(r.x + r.width / 2, r.y + r.height / 2);
          return top === el || el.contains(top) ? "" : `${top?.tagName}.${top?.className}`;
        });
        ok(hit === "", `${width} px: the button is under ${hit}`);
        await buttons[0].click();
        await page.waitForSelector('[data-block="fade-terms-fit"]', { timeout: 30_000 }).catch(
          async (e) => {
            const status = await page.$eval('[data-block="fade-terms"]', (el) => el.textContent);
            throw new Error(
              `${width} px: no new fit (${e}); the search says: ${status?.slice(-300)}; errors: ${
                b.errors.join(" | ")
              }`,
            );
          },
        );
        await allCurrent(page);
        const text = await Deno.readTextFile(served.doc);
        const at = text.indexOf("```fit fade-terms-fit");
        ok(
          at > text.indexOf("```search fade-terms"),
          `${width} px: the new fit follows the search`,
        );
        ok(
          /```fit fade-terms-fit\non: cycles\nmodel: capacity = /.test(text),
          text.slice(at, at + 120),
        );
        const state = await page.$eval(
          '[data-block="fade-terms-fit"]',
          (el) => el.getAttribute("data-state"),
        );
        ok(state === "current", `${width} px: the new fit computed (${state})`);
        ok(b.errors.length === 0, b.errors.join("\n"));
      });
    }
  },
});
