/**
 * Censored and robust fits in the live page (issue 20 items 2 and 3), in
 * headless Chromium against the real `plumb serve` of the calibration and
 * extrusion examples: at 390, 960 and 1440 px the censored fit's line and its
 * table of substitutions, the substituted fit's warning, the check of the
 * censored fit saying how the rows below the limit were judged, and the
 * robust fit's block with its down-weighted rows are shown; the page never
 * scrolls sideways and no block sticks out of the screen (a wide table scrolls
 * inside its own box). Screenshots: test/artifacts/special-*.png.
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

const ignore = skipWithoutBrowser("special fits");

const WIDTHS = THREE_WIDTHS;

/** Sideways overflow of the page, and blocks past the screen. */
function overflows(page: Page, names: string[]): Promise<string[]> {
  return page.evaluate((names: string[]) => {
    const bad: string[] = [];
    const vw = document.documentElement.clientWidth;
    if (document.documentElement.scrollWidth > vw) {
      bad.push(`page scrolls sideways: ${document.documentElement.scrollWidth} > ${vw}`);
    }
    for (const name of names) {
      const block = document.querySelector(`[data-block="${name}"]`);
      if (!block) {
        bad.push(`${name}: no block`);
        continue;
      }
      if (block.getBoundingClientRect().right > vw + 1) bad.push(`${name}: past the screen`);
    }
    return bad;
  }, names);
}

const text = (page: Page, name: string) =>
  page.$eval(`[data-block="${name}"]`, (e) => e.textContent ?? "");

async function atWidths(page: Page, names: string[], tag: string): Promise<void> {
  for (const vp of WIDTHS) {
    await page.setViewport(vp);
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
    equal((await overflows(page, names)).join("\n"), "", `${tag} at ${vp.width} px`);
    const block = await page.$(`[data-block="${names[0]}"]`);
    await block!.screenshot({
      path: new URL(`special-${tag}-${vp.width}.png`, ARTIFACTS).pathname,
    });
  }
}

Deno.test({
  name:
    "censored fits and their check in the page: ML line, substitutions, the check's account, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await withServedBrowser("calibration", "nitrite.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await settled(page);
      const trend = await text(page, "river-trend");
      match(trend, /4 of 12 rows lie below their detection limit/);
      match(trend, /maximum likelihood, censored normal/);
      for (const label of ["L/2", "L/√2"]) ok(trend.includes(label), label);
      const halved = await text(page, "river-halved");
      match(halved, /fitted as if measured \(substitution\)/);
      const judged = await text(page, "river-trend-check");
      match(judged, /randomized quantile residuals/);
      const cells = await page.$$eval(
        '[data-block="river-trend"] .plumb-fit-interval-table tbody tr',
        (rows) => rows.length,
      );
      equal(cells, 5, "maximum likelihood and four substitutions");
      await atWidths(page, ["river-trend", "river-halved", "river-trend-check"], "censored");
      equal(b.errors.join("\n"), "");
    });
  },
});

Deno.test({
  name: "a robust fit in the page: loss, scale, the down-weighted rows, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await withServedBrowser("extrusion", "extrusion.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await settled(page);
      const robust = await page.$eval(
        '[data-block="by-throughput-robust"] .plumb-fit-robust',
        (e) => e.textContent ?? "",
      );
      match(robust, /Robust fit: Huber loss, tuning constant c = 1\.345/);
      match(robust, /down-weighted/);
      const rows = await page.$$eval(
        '[data-block="by-throughput-robust"] .plumb-fit-robust-rows tbody tr',
        (r) => r.length,
      );
      ok(rows >= 1, `${rows} down-weighted rows listed`);
      await atWidths(page, ["by-throughput-robust", "pressure-against-throughput"], "robust");
      equal(b.errors.join("\n"), "");
    });
  },
});
