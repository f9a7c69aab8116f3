/**
 * The calc cell in the live page, in headless Chromium against the real
 * `plumb serve` on a short document over the demo's data (a table, the
 * power law and a calc reading it): the calc's value shows; its code edited
 * through the page to a misspelled field shows the type error in words, at
 * its line, with the checker's "did you mean", and the line marked in the
 * source; the fit keeps its result; at 390, 960 and 1440 px neither state
 * makes the page scroll sideways or the block wider than the screen.
 * Screenshots: test/artifacts/calc-*.png.
 */
import { equal, match, ok } from "node:assert/strict";
import type { Page } from "puppeteer-core";
import type { CellMessage } from "../../kernel/server/protocol.ts";
import {
  allCurrent,
  ARTIFACTS,
  skipWithoutBrowser,
  THREE_WIDTHS,
  withServedBrowser,
} from "./_harness.ts";

const ignore = skipWithoutBrowser("calc");

const fence = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n\n";

const CODE = "const { q0, a, b } = power.estimates;\n" +
  "return { cycle: Math.pow((q0 - 2000) / a, 1 / b) };";
const TYPO = "const { q0, a, b } = power.estimats;\n" +
  "return { cycle: Math.pow((q0 - 2000) / a, 1 / b) };";

const DOC = "---\ntitle: Crossing of 2,000 mAh\n---\n\n" +
  "_Invented data: the demo's batch 7._\n\n" +
  fence("table", "cycles", "from: data/batch7.csv\nunits: { cycle: cycles, capacity: mAh }") +
  fence(
    "fit",
    "power",
    "on: cycles\nmodel: capacity = q0 - a*cycle^b\nstart: { q0: 2500, a: 10, b: 0.5 }",
  ) +
  fence("calc", "crossing", `reads: power\n---\n${CODE}`);

const WIDTHS = THREE_WIDTHS;

/** At each width: no sideways scroll, the calc block inside the screen; a screenshot. */
async function fitsEveryWidth(page: Page, state: string): Promise<void> {
  for (const vp of WIDTHS) {
    await page.setViewport(vp);
    await page.$eval('[data-block="crossing"]', (e) => e.scrollIntoView());
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
    const l = await page.evaluate(() => {
      const vw = document.documentElement.clientWidth;
      const block = document.querySelector('[data-block="crossing"]')!.getBoundingClientRect();
      return { scroll: document.documentElement.scrollWidth, vw, right: block.right };
    });
    ok(l.scroll <= l.vw, `${state} at ${vp.width} px: the page scrolls sideways (${l.scroll})`);
    ok(l.right <= l.vw + 1, `${state} at ${vp.width} px: the block ends at ${l.right}`);
    await page.screenshot({ path: new URL(`calc-${state}-${vp.width}.png`, ARTIFACTS).pathname });
  }
}

Deno.test({
  name: "calc in the page: its value shows; a misspelled field shows the type error at its line",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    await withServedBrowser("fade", "crossing.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await allCurrent(page);

      await t.step(
        "the value shows, as the code computes it from the fit's estimates",
        async () => {
          const fit = b.messages.findLast((m): m is CellMessage =>
            m.type === "cell" && m.name === "power" && m.result !== undefined
          )!;
          const est = Object.fromEntries(
            (fit.result as { parameters: { name: string; estimate: number }[] }).parameters
              .map((p) => [p.name, p.estimate]),
          );
          // The calc's own formula, evaluated here on the estimates the page was sent (exact
          // arithmetic: the same double operations).
          const expected = Math.pow((est.q0 - 2000) / est.a, 1 / est.b);
          const cell = await page.$eval(
            '[data-block="crossing"] .plumb-calc-named tbody tr',
            (tr) => ({
              text: tr.textContent,
              title: tr.querySelector("td span[title]")?.getAttribute("title") ?? "",
            }),
          );
          equal(Number(cell.title), expected);
          // Shown to six significant digits, as an inline value shows it.
          equal(cell.text, `cycle${Number(expected.toPrecision(6))}@(crossing.value.cycle)`);
          await fitsEveryWidth(page, "value");
        },
      );

      await t.step(
        "a misspelled field, saved from the page, fails at its line with the near miss",
        async () => {
          await page.setViewport({ width: 1280, height: 900 });
          await page.click('[data-block="crossing"] [data-action="edit"]');
          await page.$eval('[data-editor="crossing"] textarea', (el, text) => {
            const area = el as HTMLTextAreaElement;
            area.value = text as string;
            area.dispatchEvent(new Event("input", { bubbles: true }));
          }, `reads: power\n---\n${TYPO}\n`);
          await page.click('[data-editor="crossing"] .pl-primary');
          await page.waitForSelector('[data-block="crossing"][data-state="failed"] .pl-error', {
            timeout: 20_000,
          });
          const error = await page.$eval('[data-block="crossing"] .pl-error', (e) => e.textContent);
          const onDisk = Deno.readTextFileSync(served.doc).split("\n");
          const line = onDisk.indexOf("const { q0, a, b } = power.estimats;") + 1;
          ok(line > 0, "the edit reached the file");
          match(error ?? "", /Type error: Property 'estimats' does not exist/);
          match(error ?? "", /Did you mean 'estimates'\?/);
          const column = "const { q0, a, b } = power.".length + 1;
          ok(error?.includes(`(line ${line}, column ${column})`), `${error} names line ${line}`);
          const marked = await page.$eval(
            '[data-block="crossing"] .pl-src-error',
            (e) => e.getAttribute("data-line"),
          );
          equal(Number(marked), line, "the source listing marks the line");
          equal(
            await page.$eval('[data-block="power"]', (e) => e.getAttribute("data-state")),
            "current",
            "the fit keeps its result",
          );
          await fitsEveryWidth(page, "error");
        },
      );
      equal(b.errors.join("\n"), "");
    }, (dir) => Deno.writeTextFileSync(`${dir}/crossing.md`, DOC));
  },
});
