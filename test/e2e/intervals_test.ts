/**
 * Intervals beyond Wald in the live page (issue 19), in headless Chromium
 * against the real `plumb serve`: a nonlinear fit with bootstrap intervals
 * and a derived quantity, and a fit whose profile is open above.
 *
 * At 390, 960 and 1440 px: the intervals table names every method in its
 * head, shows "open" for the side that does not close with its note, the
 * derived quantity with its disagreement note; opened, the profile traces
 * are drawn (one plot per parameter, visible, inside the block); the page
 * never scrolls sideways and a block's result never does (the intervals
 * table scrolls in itself on a phone). Screenshots:
 * test/artifacts/intervals-*.png.
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import type { Page } from "puppeteer-core";
import {
  ARTIFACTS,
  settled,
  skipWithoutBrowser,
  THREE_WIDTHS,
  withServedBrowser,
} from "./_harness.ts";

const ignore = skipWithoutBrowser("intervals");

const fence = (info: string, body: string) => "```" + info + "\n" + body + "\n```\n\n";

/** Puromycin, treated cells (Treloar 1974, via Bates & Watts 1988 Appendix A1.3; from memory). */
const PURO: [number, number][] = [
  [0.02, 76],
  [0.02, 47],
  [0.06, 97],
  [0.06, 107],
  [0.11, 123],
  [0.11, 139],
  [0.22, 159],
  [0.22, 152],
  [0.56, 191],
  [0.56, 201],
  [1.10, 207],
  [1.10, 200],
];

function doc(): string {
  // Invented: a rise that never bends (its plateau's profile is open above).
  const flat = [1, 2, 3, 4, 5, 6, 7, 8].map((x) =>
    `  - [${x}, ${Number((2 * x * (1 - 0.01 * x) + 0.2 * Math.cos(2.3 * x)).toFixed(6))}]`
  );
  return "# Enzyme rates and a rise without a plateau\n\n" +
    fence(
      "table puro",
      "columns: [conc, rate]\nrows:\n" + PURO.map(([c, r]) => `  - [${c}, ${r}]`).join("\n"),
    ) +
    fence("table flat", "columns: [x, y]\nrows:\n" + flat.join("\n")) +
    fence(
      "fit mm",
      "on: puro\nmodel: rate = Vm*conc/(K + conc)\nstart: { Vm: 200, K: 0.1 }\nbootstrap: { resamples: 1000 }\nderived:\n  efficiency_per_unit_concentration: Vm/K",
    ) +
    fence("fit open", "on: flat\nmodel: y = a*(1 - exp(-b*x))\nstart: { a: 50, b: 0.05 }") +
    // Invented: a decline through a detection limit of 1 (cells below it written "<1").
    fence(
      "table water",
      "columns: [day, nitrate]\nbelow_limit: [nitrate]\nrows:\n" +
        Array.from({ length: 14 }, (_, i) => {
          const v = 4.6 - 0.45 * (i + 1) + 0.25 * Math.sin(2.1 * (i + 1));
          return `  - [${i + 1}, "${v < 1 ? "<1" : v.toFixed(3)}"]`;
        }).join("\n"),
    ) +
    fence("fit censored", "on: water\nmodel: nitrate = a + b*day");
}

const WIDTHS = THREE_WIDTHS;

/** Sideways overflow of the page, of a block past the screen, or of a block's result. */
function overflows(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const bad: string[] = [];
    const vw = document.documentElement.clientWidth;
    if (document.documentElement.scrollWidth > vw) {
      bad.push(`page scrolls sideways: ${document.documentElement.scrollWidth} > ${vw}`);
    }
    for (const name of ["mm", "open", "censored"]) {
      const block = document.querySelector(`[data-block="${name}"]`)!;
      if (block.getBoundingClientRect().right > vw + 1) bad.push(`${name}: past the screen`);
      const result = block.querySelector(".pl-result");
      if (result && result.scrollWidth > result.clientWidth + 1) {
        bad.push(
          `${name}: result scrolls sideways (${result.scrollWidth} > ${result.clientWidth})`,
        );
      }
      for (const fig of block.querySelectorAll(".plumb-fit-trace")) {
        const r = fig.getBoundingClientRect();
        if (r.right > block.getBoundingClientRect().right + 1) {
          bad.push(`${name}: a trace past the block`);
        }
      }
    }
    return bad;
  });
}

Deno.test({
  name:
    "intervals by method in the page: every method named, an open side said, profile traces drawn, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await withServedBrowser("fade", "uncertainty.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await settled(page);
      const head = await page.$$eval(
        '[data-block="mm"] .plumb-fit-interval-table thead th',
        (ths) => ths.map((t) => t.textContent),
      );
      equal(
        head.join(" | "),
        "Quantity | Wald (delta method) | Profile likelihood | Bootstrap percentile | Bootstrap BCa",
      );
      const mm = await page.$eval(
        '[data-block="mm"] .plumb-fit-intervals',
        (e) => e.textContent ?? "",
      );
      match(mm, /bootstrap: 1000 residual resamples, seed 1/);
      match(mm, /efficiency_per_unit_concentration/);
      match(mm, /the methods disagree/);
      const open = await page.$eval(
        '[data-block="open"] .plumb-fit-intervals',
        (e) => e.textContent ?? "",
      );
      match(open, /… open/);
      match(open, /the profile does not close above/);
      const censored = await page.$eval(
        '[data-block="censored"] .plumb-fit-censored',
        (e) => e.textContent ?? "",
      );
      match(censored, /rows lie below their detection limit/);
      match(censored, /maximum likelihood, censored normal/);
      match(censored, /L\/√2/);
      await page.$$eval(".plumb-fit-traces", (ds) => ds.forEach((d) => d.setAttribute("open", "")));
      for (const vp of WIDTHS) {
        await page.setViewport(vp);
        await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
        equal((await overflows(page)).join("\n"), "", `at ${vp.width} px`);
        const sizes = await page.$$eval(
          '[data-block="mm"] .plumb-fit-trace svg',
          (svgs) => svgs.map((s) => s.getBoundingClientRect().width),
        );
        equal(sizes.length, 2, "one trace per parameter");
        ok(sizes.every((w) => w > 100), `traces drawn: ${sizes}`);
        const block = await page.$('[data-block="mm"]');
        await block!.screenshot({
          path: new URL(`intervals-${vp.width}-mm.png`, ARTIFACTS).pathname,
        });
      }
      equal(b.errors.join("\n"), "");
    }, (dir) => {
      Deno.writeTextFileSync(join(dir, "uncertainty.md"), doc());
    });
  },
});
