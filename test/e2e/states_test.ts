/**
 * States that agree, in headless Chromium against the real `plumb serve` on
 * a copy of the demo: the ledger says what the comparison's verdict says; a
 * fit broken on disk fails, the cells reading it are held, say why once
 * (no "Held: Held:") and fold their earlier results away as of an earlier
 * run; the ledger then says held or failed, never "not computed yet"; and
 * when the server is killed the top bar says the page is not live instead
 * of "all 9 current". Screenshot: test/artifacts/states-held.png.
 */
import { equal, ok } from "node:assert/strict";
import type { Page } from "puppeteer-core";
import { allCurrent, ARTIFACTS, openBrowser, serve, skipWithoutBrowser } from "./_harness.ts";

const ignore = skipWithoutBrowser("states");

function stateOf(page: Page, name: string, state: string) {
  return page.waitForFunction(
    (n: string, s: string) =>
      document.querySelector(`[data-block="${n}"]`)?.getAttribute("data-state") === s,
    { timeout: 20_000, polling: 50 },
    name,
    state,
  );
}

const text = (page: Page, sel: string) => page.$eval(sel, (e) => e.textContent ?? "");

async function edit(doc: string, from: string, to: string) {
  const src = await Deno.readTextFile(doc);
  ok(src.includes(from), from);
  await Deno.writeTextFile(doc, src.replace(from, to));
}

Deno.test({
  name: "states: held and failed cells, the ledger and the top bar say the same as the cells",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    const served = await serve("fade", "fade.md");
    let closed = false;
    const b = await openBrowser();
    try {
      const { page } = b;
      await page.goto(served.url);
      await allCurrent(page);
      const ledger = await text(page, '[data-ledger="fade"] .pl-ledger-text');
      const verdict = await page.$eval(".plumb-compare-verdict", (e) => e.textContent ?? "");
      const line = ledger.trim();
      ok(line.length > 10 && verdict.includes(line), `ledger "${line}" is the verdict's words`);

      await edit(served.doc, "a*sqrt(cycle)\n```", "a*sqrt(cyclez)\n```");
      await stateOf(page, "root", "failed");
      await stateOf(page, "root-residuals", "held");
      await stateOf(page, "fade", "held");
      const held = await text(page, '[data-block="root-residuals"]');
      ok(!/held:\s*held/i.test(held), held.slice(0, 300));
      ok(held.includes('input "root"'), held.slice(0, 300));
      const shown = await page.$eval('[data-block="root-residuals"]', (e) => ({
        bare: e.querySelectorAll(":scope > .pl-result").length,
        folded: e.querySelectorAll(":scope > details.pl-earlier:not([open])").length,
      }));
      equal(shown.bare, 0, "no earlier result shown as if current");
      equal(shown.folded, 1, "the earlier result is folded as of an earlier run");
      const heldLedger = await text(page, '[data-ledger="fade"]');
      ok(/held: input "root"/.test(heldLedger), heldLedger);
      ok(!heldLedger.includes("not computed yet"), heldLedger);
      equal(await page.$eval("[data-overall]", (e) => e.getAttribute("data-overall")), "failed");
      await page.screenshot({ path: new URL("states-held.png", ARTIFACTS).pathname });

      await edit(served.doc, "a*sqrt(cyclez)\n```", "a*sqrt(cycle)\n```");
      await edit(served.doc, "by: aicc", "by: aiccc");
      await stateOf(page, "fade", "failed");
      const failed = await text(page, '[data-ledger="fade"]');
      ok(failed.includes("failed:") && !failed.includes("not computed yet"), failed);

      await served.close();
      closed = true;
      await page.waitForSelector('.pl-top[data-connection="closed"]', { timeout: 10_000 });
      const bar = await text(page, ".pl-top");
      ok(bar.includes("not live"), bar);
      ok(!/all \d+ current/.test(bar), `a lost page claims nothing current: ${bar}`);
      await new Promise((r) => setTimeout(r, 1500)); // a retry or two: still not live, no flicker
      equal(await page.$eval(".pl-top", (e) => e.getAttribute("data-connection")), "closed");
      await page.screenshot({ path: new URL("states-offline.png", ARTIFACTS).pathname });
    } finally {
      await b.close();
      if (!closed) await served.close();
    }
  },
});
