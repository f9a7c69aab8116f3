/**
 * Hostile prose in a real browser (issue 11, defect 6): a document whose
 * prose holds lines that once threw "Maximum call stack size exceeded" in
 * the page (`$` and 3,000 `{`, 20,000 `*`, and their relatives: emphasis,
 * links, brackets and quotes nested thousands deep) must still show every
 * other block, at a phone's, a half screen's and a desktop's width, with
 * no page error; a prose block that cannot be drawn shows its source and
 * the reason in words.
 *
 * Before the fix: the page showed no block at all (the live page was blank
 * and the console held the stack overflow).
 */
import { deepEqual, ok } from "node:assert/strict";
import { allCurrent, ARTIFACTS, skipWithoutBrowser, withServedBrowser } from "./_harness.ts";
import { HOSTILE_PROSE } from "../../ui/testdata/hostile_prose.ts";

const ignore = skipWithoutBrowser("hostile prose");

const F = "```";

/** Each case is one prose block, kept apart from the next by a cell. */
const HOSTILE = HOSTILE_PROSE;

function hostileDocument(): string {
  const parts = [
    "---\ntitle: Hostile prose\n---\n",
    "# Hostile prose\n\nThe first paragraph is harmless.\n",
    `${F}table t\ncolumns: [x, y]\nrows:\n  - [1, 2.1]\n  - [2, 3.9]\n  - [3, 6.2]\n${F}\n`,
  ];
  for (const [name, text] of Object.entries(HOSTILE)) {
    parts.push(`${text}\n`);
    parts.push(`${F}fit f_${name}\non: t\nmodel: y = a + b*x\n${F}\n`);
  }
  parts.push("The last paragraph is harmless too: R² is @(f_open_braces.r2, 3).\n");
  return parts.join("\n");
}

const WIDTHS = [["phone", 375], ["half", 760], ["desktop", 1400]] as const;

Deno.test({
  name: "live page: hostile prose blocks never blank the page, at three widths",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    const write = (dir: string) => Deno.writeTextFileSync(`${dir}/fade.md`, hostileDocument());
    await withServedBrowser("fade", "fade.md", async (served, b) => {
      const { page } = b;
      for (const [label, width] of WIDTHS) {
        await t.step(`${label} (${width} px): every cell and harmless prose shown`, async () => {
          await page.setViewport({ width, height: 900 });
          await page.goto(served.url);
          await allCurrent(page, 60_000);
          const cells = await page.$$eval(
            "[data-block]",
            (els) => els.map((e) => e.getAttribute("data-block")),
          );
          deepEqual(cells, ["t", ...Object.keys(HOSTILE).map((n) => `f_${n}`)]);
          const text = await page.$eval(".pl-main", (e) => e.textContent ?? "");
          ok(text.includes("The first paragraph is harmless."), "first paragraph shown");
          ok(text.includes("The last paragraph is harmless too"), "last paragraph shown");
          const ref = await page.$eval("[data-ref]", (e) => e.textContent ?? "");
          ok(/^0\.\d{3}$/.test(ref), `inline value shown: ${ref}`);
          // A block that could not be drawn shows its source and says why.
          const failed = await page.$$eval(".pl-prose-failed", (els) =>
            els.map((e) => ({
              source: e.querySelector(".pl-prose-source")?.textContent?.length ?? 0,
              why: e.querySelector(".pl-prose-why")?.textContent ?? "",
            })));
          for (const f of failed) {
            ok(f.source > 1000, "the source of a failed block is shown");
            ok(/^This prose could not be drawn: /.test(f.why), f.why);
          }
          // No prose reaches past the page's right edge (cells' own views are their kinds' affair).
          const wide = await page.evaluate(() => {
            const w = document.documentElement.clientWidth;
            return [...document.querySelectorAll(".pl-prose, .pl-prose *")]
              .filter((e) => e.getBoundingClientRect().right > w + 1)
              .slice(0, 3).map((e) => `${e.tagName}.${e.className}`);
          });
          deepEqual(wide, [], `past the right edge: ${wide.join(", ")}`);
          deepEqual(b.errors, []);
          Deno.mkdirSync(ARTIFACTS, { recursive: true });
          await page.screenshot({
            path: new URL(`hostile-prose-${label}.png`, ARTIFACTS).pathname,
          });
        });
      }
    }, write);
  },
});
