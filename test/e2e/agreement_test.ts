/**
 * The agreement block in the live page (issue 20 item 1), in headless
 * Chromium against the real `plumb serve` of the glucose example: at 390,
 * 960 and 1440 px the verdict and both lines are shown, both plots are drawn
 * inside the block (the agreement plot with its three named rules), the page
 * never scrolls sideways and no block's result does. Screenshots:
 * test/artifacts/agreement-*.png.
 */
import { equal, match, ok } from "node:assert/strict";
import type { Page } from "puppeteer-core";
import {
  ARTIFACTS,
  settled,
  skipWithoutBrowser,
  THREE_WIDTHS,
  withServedBrowser,
} from "./_harness.ts";

const ignore = skipWithoutBrowser("agreement");

const WIDTHS = THREE_WIDTHS;
const BLOCKS = ["meter", "one-run"];

/** Sideways overflow of the page, of a block past the screen, of a result, of a plot past its block. */
function overflows(page: Page): Promise<string[]> {
  return page.evaluate((names: string[]) => {
    const bad: string[] = [];
    const vw = document.documentElement.clientWidth;
    if (document.documentElement.scrollWidth > vw) {
      bad.push(`page scrolls sideways: ${document.documentElement.scrollWidth} > ${vw}`);
    }
    for (const name of names) {
      const block = document.querySelector(`[data-block="${name}"]`)!;
      const edge = block.getBoundingClientRect().right;
      if (edge > vw + 1) bad.push(`${name}: past the screen`);
      const result = block.querySelector(".pl-result");
      if (result && result.scrollWidth > result.clientWidth + 1) {
        bad.push(
          `${name}: result scrolls sideways (${result.scrollWidth} > ${result.clientWidth})`,
        );
      }
      for (const fig of block.querySelectorAll(".plumb-agreement-plot")) {
        if (fig.getBoundingClientRect().right > edge + 1) {
          bad.push(`${name}: a plot past the block`);
        }
      }
    }
    return bad;
  }, BLOCKS);
}

Deno.test({
  name:
    "agreement in the page: verdict, lines and both plots, nothing overflowing, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await withServedBrowser("glucose", "glucose.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await settled(page);
      const text = await page.$eval(
        '[data-block="meter"] .plumb-agreement',
        (e) => e.textContent ?? "",
      );
      match(text, /At the 95% level: a constant difference/);
      match(text, /Passing–Bablok ranks/);
      match(text, /Cusum test of linearity/);
      for (const vp of WIDTHS) {
        await page.setViewport(vp);
        await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
        equal((await overflows(page)).join("\n"), "", `at ${vp.width} px`);
        const sizes = await page.$$eval(
          '[data-block="meter"] .plumb-agreement-plot svg',
          (svgs) => svgs.map((s) => s.getBoundingClientRect().width),
        );
        equal(sizes.length, 2, "the agreement plot and the methods plot");
        ok(sizes.every((w) => w > 250), `plots drawn: ${sizes}`);
        const labels = await page.$$eval(
          '[data-block="meter"] .plumb-agreement-plot:first-of-type text',
          (ts) => ts.map((t) => t.textContent),
        );
        for (const l of ["upper limit", "bias", "lower limit"]) ok(labels.includes(l), l);
        const block = await page.$('[data-block="meter"]');
        await block!.screenshot({ path: new URL(`agreement-${vp.width}.png`, ARTIFACTS).pathname });
      }
      equal(b.errors.join("\n"), "");
    });
  },
});
