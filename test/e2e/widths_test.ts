/**
 * The page at a phone's width (390 px), a half screen (900 px) and a
 * desktop (1400 px), in headless Chromium against the real `plumb serve` on
 * a copy of the demo with a wide table added: at each width and at several
 * scroll positions no point of the screen shows the rail and the report on
 * top of each other (hit-tested with `elementsFromPoint` on a grid), the
 * stuck rail sits under the top bar, the page does not scroll sideways, a
 * table wider than its block scrolls inside itself, and a chart takes the
 * column's width (down to 30rem). Screenshots: test/artifacts/widths-*.png.
 */
import { ok } from "node:assert/strict";
import type { Page } from "puppeteer-core";
import { allCurrent, ARTIFACTS, skipWithoutBrowser, withServedBrowser } from "./_harness.ts";

const ignore = skipWithoutBrowser("widths");

const COLS = Array.from({ length: 14 }, (_, i) => `measured_quantity_${i + 1}`);
const WIDE = `
\`\`\`table wide
columns: [${COLS.join(", ")}]
rows:
  - [${COLS.map((_, i) => 1000.123 + i).join(", ")}]
  - [${COLS.map((_, i) => 2000.456 + i).join(", ")}]
\`\`\`
`;

const WIDTHS = [{ width: 390, height: 844 }, { width: 900, height: 800 }, {
  width: 1400,
  height: 900,
}];

/** Points where the rail and the report are both under the pointer, and where the bar hides the rail. */
function overlaps(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const bad: string[] = [];
    const rail = document.querySelector(".pl-rail")!;
    const main = document.querySelector(".pl-main")!;
    const top = document.querySelector(".pl-top")!;
    for (let y = 2; y < innerHeight; y += 37) {
      for (let x = 2; x < innerWidth; x += 29) {
        const stack = document.elementsFromPoint(x, y);
        const inRail = stack.some((e) => rail.contains(e));
        const inMain = stack.some((e) => main.contains(e));
        if (inRail && inMain) bad.push(`rail and report at ${x},${y}`);
        const stuck = getComputedStyle(rail).position === "sticky";
        if (stuck && inRail && stack.some((e) => top.contains(e))) {
          bad.push(`bar on rail at ${x},${y}`);
        }
      }
    }
    return bad;
  });
}

function layout(page: Page) {
  return page.evaluate(() => {
    const vw = document.documentElement.clientWidth;
    const cells = [...document.querySelectorAll(".pl-cell")].map((c) => c.getBoundingClientRect())
      .filter((r) => r.right > vw + 1).length;
    const tables = [...document.querySelectorAll(".pl-result table")].map((t) => {
      const block = t.closest(".pl-cell")!.getBoundingClientRect();
      const r = t.getBoundingClientRect();
      return {
        fits: r.right <= block.right + 1,
        scrolls: t.scrollWidth <= t.clientWidth + 1 || getComputedStyle(t).overflowX === "auto",
        wide: t.scrollWidth > t.clientWidth + 1,
      };
    });
    // Outermost SVGs only: a figure of panels (the check's) nests one SVG per panel.
    const outer = [...document.querySelectorAll(".pl-result figure svg")].filter((s) =>
      s.parentElement?.closest("svg") === null
    );
    const charts = outer.map((s) => {
      const fig = s.closest("figure")!;
      const svg = s as SVGSVGElement;
      const natural = svg.viewBox.baseVal?.width || svg.width.baseVal.value;
      const scrolls = getComputedStyle(fig).overflowX === "auto";
      return { svg: s.getBoundingClientRect().width, column: fig.clientWidth, natural, scrolls };
    });
    return { scroll: document.documentElement.scrollWidth, vw, cells, tables, charts };
  });
}

Deno.test({
  name: "widths: at 390, 900 and 1400 px nothing covers the rail or the report, no sideways scroll",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    await withServedBrowser(
      "fade",
      "fade.md",
      async (served, b) => {
        const { page } = b;
        await page.goto(served.url);
        await allCurrent(page);
        for (const vp of WIDTHS) {
          await t.step(`${vp.width} px`, async () => {
            await page.setViewport(vp);
            await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
            const height = await page.evaluate(() => document.documentElement.scrollHeight);
            for (const f of [0, 0.2, 0.45, 0.7, 1]) {
              await page.evaluate((y) => scrollTo(0, y), Math.round(f * height));
              await new Promise((r) => setTimeout(r, 120));
              const bad = await overlaps(page);
              ok(bad.length === 0, `${vp.width} px at ${f}: ${bad.slice(0, 5).join("; ")}`);
            }
            await page.evaluate(() => scrollTo(0, 0));
            const l = await layout(page);
            ok(l.scroll <= l.vw, `no sideways scroll at ${vp.width}: ${l.scroll} > ${l.vw}`);
            ok(l.cells === 0, `${l.cells} blocks wider than the screen`);
            ok(l.tables.every((x) => x.fits && x.scrolls), JSON.stringify(l.tables));
            if (vp.width === 390) {
              ok(l.tables.some((x) => x.wide), "the wide table scrolls in itself");
            }
            ok(l.charts.length > 0, "charts drawn");
            for (const c of l.charts) {
              // Legible: never drawn smaller than 30rem (or its own size); within the column or scrolling.
              ok(c.svg >= Math.min(c.natural, 480) * 0.97, `chart too small ${JSON.stringify(c)}`);
              ok(c.svg <= c.column + 2 || c.scrolls, `chart cut off ${JSON.stringify(c)}`);
            }
            await page.screenshot({ path: new URL(`widths-${vp.width}.png`, ARTIFACTS).pathname });
          });
        }
        ok(b.errors.length === 0, b.errors.join("\n"));
      },
      (dir) =>
        Deno.writeTextFileSync(`${dir}/fade.md`, Deno.readTextFileSync(`${dir}/fade.md`) + WIDE),
    );
  },
});
