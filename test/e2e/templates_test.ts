/**
 * Every kind's add-cell template computes on the demo, added through the
 * page: for each kind the page offers, choose it in the "Add a cell" form at
 * the end of the report, add it, and wait until the new block is current
 * (not failed, not held). The kinds are added in registry order, so later
 * templates see the cells added before them (a fit on the new table, a
 * check of the new fit, and so on). At a phone's width, a half screen and a
 * desktop width, the form is on screen and the new block fits the width.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { registry } from "../../cells/mod.ts";
import { allCurrent, skipWithoutBrowser, withServedBrowser } from "./_harness.ts";

const ignore = skipWithoutBrowser("add-cell templates");

const WIDTHS = [{ width: 390, height: 844 }, { width: 960, height: 900 }, {
  width: 1440,
  height: 900,
}];

Deno.test({
  name: "add a cell: every kind's template computes on the demo, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    await withServedBrowser("fade", "fade.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await allCurrent(page);
      const offered = await page.$$eval(
        "form.pl-add select option",
        (os) => [...new Set(os.map((o) => (o as HTMLOptionElement).value))],
      );
      deepEqual(offered.sort(), [...registry.keys()].sort(), "the page offers every kind");
      for (const [i, kind] of [...registry.keys()].entries()) {
        const viewport = WIDTHS[i % WIDTHS.length];
        await t.step(`${kind} at ${viewport.width} px`, async () => {
          await page.setViewport(viewport);
          const name = `added-${kind}`;
          const form = (await page.$$("form.pl-add")).at(-1)!;
          await form.$eval("select", (s, kind) => {
            const el = s as HTMLSelectElement;
            el.value = kind as string;
            el.dispatchEvent(new Event("change", { bubbles: true }));
          }, kind);
          await form.$eval("input", (el, name) => {
            const input = el as HTMLInputElement;
            input.value = name as string;
            input.dispatchEvent(new Event("input", { bubbles: true }));
          }, name);
          await form.$eval("button[type=submit]", (el) => (el as HTMLButtonElement).click());
          const sel = `[data-block="${name}"]`;
          await page.waitForSelector(sel, { timeout: 10_000 });
          await page.waitForFunction(
            (sel: string) => {
              const s = document.querySelector(sel)?.getAttribute("data-state");
              return s === "current" || s === "failed" || s === "held";
            },
            { timeout: 20_000, polling: 50 },
            sel,
          );
          const state = await page.$eval(sel, (e) => e.getAttribute("data-state"));
          const message = await page.$eval(sel, (e) => e.textContent?.slice(0, 400));
          equal(state, "current", `${kind}: ${message}`);
          const box = await page.$eval(sel, (e) => {
            const r = e.getBoundingClientRect();
            return { left: r.left, right: r.right, scroll: document.documentElement.scrollWidth };
          });
          ok(
            box.left >= 0 && box.right <= viewport.width + 1,
            `${kind} block fits: ${JSON.stringify(box)}`,
          );
          ok(
            box.scroll <= viewport.width + 1,
            `no sideways scroll at ${viewport.width}: ${box.scroll}`,
          );
        });
      }
      deepEqual(b.errors, [], "no console errors");
    });
  },
});
