/**
 * In a real browser (headless Chromium): `deno task plumb serve` of a
 * document in another folder, named by a relative path, shows its fit
 * (issue 12). Skips with one line without Chromium (test/e2e/_harness.ts).
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { allCurrent, openBrowser, skipWithoutBrowser } from "../e2e/_harness.ts";
import { inScratch, serving, task } from "./_cli.ts";

const ignore = skipWithoutBrowser("plumb serve from another folder");

Deno.test({
  name: "plumb serve of a relative document from another folder shows its fit in Chromium",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn() {
    await inScratch(async (dir) => {
      await Deno.mkdir(join(dir, "shed"));
      equal((await task(dir, "plumb", "new", "shed/leak.md")).code, 0);
      const served = await serving(dir, "plumb", "serve", "shed/leak.md");
      const b = await openBrowser({ tap: false });
      try {
        equal(served.document, join(dir, "shed", "leak.md"));
        await b.page.goto(served.url);
        await allCurrent(b.page);
        const fit = '[data-block="fraction"]';
        const model = await b.page.$eval(`${fit} .plumb-fit-model code`, (e) => e.textContent);
        equal(model, "log(pressure) = a - k*day");
        const names = await b.page.$$eval(
          `${fit} .plumb-fit-parameters tbody tr`,
          (rows) => rows.map((r) => r.querySelector("th, td")?.textContent?.trim()),
        );
        deepEqual(names, ["a", "k"]);
        const text = await b.page.$eval(fit, (e) => e.textContent ?? "");
        ok(/0\.0[23]\d/.test(text), `the loss a day shown: ${text.slice(0, 300)}`);
        deepEqual(b.errors, []);
      } finally {
        await b.close();
        await served.close();
      }
    });
  },
});
