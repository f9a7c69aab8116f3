/**
 * Undo, in headless Chromium against the real `plumb serve` on a copy of
 * the demo: a cell removed from the page comes back with Alt+U, and an
 * edit saved from the page is taken back with the notice's undo control;
 * each time the document on disk is byte for byte what it was before.
 */
import { deepEqual, ok } from "node:assert/strict";
import type { Page } from "puppeteer-core";
import { allCurrent, skipWithoutBrowser, withServedBrowser } from "./_harness.ts";

const ignore = skipWithoutBrowser("undo");

async function bytesBecome(path: string, want: Uint8Array, ms = 10_000): Promise<Uint8Array> {
  const end = Date.now() + ms;
  let got = await Deno.readFile(path);
  while (Date.now() < end && !equalBytes(got, want)) {
    await new Promise((r) => setTimeout(r, 50));
    got = await Deno.readFile(path);
  }
  return got;
}

function equalBytes(a: Uint8Array, b: Uint8Array): boolean {
  return a.length === b.length && a.every((x, i) => x === b[i]);
}

function action(page: Page, cell: string, word: string) {
  return page.$$eval(
    `[data-block="${cell}"] .pl-cell-actions button`,
    (bs, word) => (bs.find((x) => x.textContent?.trim() === word) as HTMLButtonElement).click(),
    word,
  );
}

Deno.test({
  name: "undo: a removal (Alt+U) and an edit (the notice) put back the exact bytes",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await withServedBrowser("fade", "fade.md", async (served, b) => {
      const { page } = b;
      await page.setViewport({ width: 900, height: 800 });
      await page.goto(served.url);
      await allCurrent(page);
      const before = await Deno.readFile(served.doc);

      await action(page, "end-of-life", "remove");
      await page.waitForFunction(() => !document.querySelector('[data-block="end-of-life"]'));
      await page.waitForSelector(".pl-undo[data-undo]");
      ok(!equalBytes(await Deno.readFile(served.doc), before), "removed on disk");
      await page.keyboard.down("Alt");
      await page.keyboard.press("KeyU");
      await page.keyboard.up("Alt");
      await page.waitForSelector('[data-block="end-of-life"]', { timeout: 10_000 });
      deepEqual(await bytesBecome(served.doc, before), before, "removal undone to the byte");

      await action(page, "root", "edit");
      await page.waitForSelector('[data-editor="root"] textarea');
      await page.$eval('[data-editor="root"] textarea', (t) => {
        const area = t as HTMLTextAreaElement;
        area.value = area.value.replace("sqrt(cycle)", "sqrt(cycle)  # edited");
        area.dispatchEvent(new Event("input", { bubbles: true }));
      });
      await page.click('[data-editor="root"] .pl-primary');
      await page.waitForFunction(() => !document.querySelector('[data-editor="root"]'));
      ok(new TextDecoder().decode(await Deno.readFile(served.doc)).includes("# edited"), "saved");
      await page.waitForSelector('.pl-undo [data-action="undo"]');
      await page.click('.pl-undo [data-action="undo"]');
      deepEqual(await bytesBecome(served.doc, before), before, "edit undone to the byte");
      await page.waitForFunction(() => !document.querySelector(".pl-undo[data-undo]"));
      ok(b.errors.length === 0, b.errors.join("\n"));
    });
  },
});
