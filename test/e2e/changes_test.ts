/**
 * The "Since the last data" panel in headless Chromium against the real
 * `plumb serve` on a copy of the demo (invented data): no panel before there
 * is a second data revision; after the rows of data/batch7-later.csv are
 * appended to the copy's data/batch7.csv the panel appears without a reload,
 * names the new rows, the change of preferred model and a parameter of `root`
 * outside its previous interval, and draws the drift of the estimates; at a
 * phone's (390 px), a half screen's (960 px) and a desktop's (1440 px) width
 * it stays inside the viewport; the numbers behind a sentence open on a
 * click; a second append (three invented rows) updates the panel in place:
 * the inputs compared and a third revision in the drift charts.
 * Screenshots: test/artifacts/changes-*.png.
 */
import { ok } from "node:assert/strict";
import {
  allCurrent,
  ARTIFACTS,
  skipWithoutBrowser,
  THREE_WIDTHS,
  withServedBrowser,
} from "./_harness.ts";

const ignore = skipWithoutBrowser("changes");

const WIDTHS = THREE_WIDTHS;

Deno.test({
  name: "changes: the panel appears live after a data append and fits at 390, 960 and 1440 px",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    await withServedBrowser("fade", "fade.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await allCurrent(page);
      ok(await page.$(".pl-changes") === null, "no panel with one revision");
      /** Appends rows to the copy's batch7.csv and waits for the panel to say `expect`. */
      const append = async (rows: string, expect: string) => {
        await Deno.writeTextFile(`${served.dir}/data/batch7.csv`, rows, { append: true });
        await page.waitForFunction(
          (want) => document.querySelector(".pl-changes")?.textContent?.includes(want),
          { timeout: 30_000 },
          expect,
        );
      };
      const later = await Deno.readTextFile(`${served.dir}/data/batch7-later.csv`);
      await append(later.split("\n").slice(1).join("\n"), "root-linear");
      const text = await page.$eval(".pl-changes", (e) => e.textContent ?? "");
      ok(text.includes("40 rows added (rows 121–160)"), text);
      ok(/preferred model of fade changed from root to root-linear/.test(text), text);
      ok(/root: a moved from 9\.882 \[9\.828, 9\.936\]/.test(text), text);
      ok(/outside its previous 95% interval/.test(text), text);
      ok(text.includes("data/batch7.csv: 121 → 161 lines (+40)"), text);
      // The preferred model leads the list.
      const first = await page.$eval(
        ".pl-changes-list .pl-change",
        (e) => e.getAttribute("data-code"),
      );
      ok(first === "preferred-changed", `first: ${first}`);
      // The numbers behind the first sentence, on request.
      await page.click(".pl-changes-list .pl-change .pl-change-numbers > summary");
      const numbers = await page.$eval(
        ".pl-changes-list .pl-change .pl-change-numbers table",
        (e) => (e as HTMLElement).offsetHeight > 0 ? e.textContent ?? "" : "",
      );
      ok(numbers.length > 0, "the numbers table shows once asked for");
      // Closed, the disclosure's charts wait undrawn (ui/charts/chart_figure.tsx); opened, they are drawn.
      const waiting = await page.$$eval(".pl-drift-chart [data-pending]", (s) => s.length);
      const early = await page.$$eval(".pl-drift-chart svg.plumb-chart", (s) => s.length);
      ok(waiting >= 7 && early === 0, `closed: ${waiting} waiting, ${early} drawn`);
      await page.click(".pl-drift > summary");
      await page.waitForFunction(
        () => document.querySelectorAll(".pl-drift-chart svg.plumb-chart").length >= 7,
        { timeout: 10_000 },
      );
      const charts = await page.$$eval(".pl-drift-chart svg.plumb-chart", (s) => s.length);
      ok(charts >= 7, `${charts} drift charts (one per fit parameter)`);
      ok(
        await page.$(".pl-drift-chart [data-pending]") === null,
        "no drift chart waits once the disclosure is open",
      );
      const groups = await page.$$eval(".pl-drift-group h3", (hs) => hs.map((h) => h.textContent));
      ok(groups.some((g) => g?.startsWith("root")), `drift groups: ${groups.join(", ")}`);
      for (const vp of WIDTHS) {
        await t.step(`${vp.width} px`, async () => {
          await page.setViewport(vp);
          await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
          const box = await page.$eval(".pl-changes", (e) => {
            const r = e.getBoundingClientRect();
            return {
              right: r.right,
              vw: document.documentElement.clientWidth,
              scroll: document.documentElement.scrollWidth,
              inner: e.scrollWidth <= e.clientWidth + 1,
            };
          });
          ok(
            box.right <= box.vw + 1,
            `panel past the right edge at ${vp.width}: ${JSON.stringify(box)}`,
          );
          ok(box.scroll <= box.vw, `sideways scroll at ${vp.width}: ${JSON.stringify(box)}`);
          ok(box.inner, `panel content wider than the panel at ${vp.width}`);
          const panel = await page.$(".pl-changes");
          await panel!.screenshot({ path: new URL(`changes-${vp.width}.png`, ARTIFACTS).pathname });
        });
      }
      // A second append: the panel updates in place (no reload), now over three revisions.
      await append("805,2199.6,25.1\n810,2198.1,24.9\n815,2196.0,25.2\n", "161 → 164 lines");
      const summary = await page.$eval(".pl-drift > summary", (e) => e.textContent ?? "");
      ok(summary.includes("3 recorded revisions"), summary);
      ok(
        await page.$eval(".pl-drift", (e) => (e as HTMLDetailsElement).open),
        "the drift disclosure stays open across the update",
      );
      ok(
        await page.$(".pl-drift-chart [data-pending]") === null,
        "open, the drift charts are drawn from the new revisions at once",
      );
      ok(b.errors.length === 0, b.errors.join("\n"));
    });
  },
});
