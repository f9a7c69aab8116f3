/**
 * The live workspace end to end, in headless Chromium against the real
 * `plumb serve` on a temporary copy of examples/fade/ (with one unrelated
 * table and fit added, so that "unaffected cells do not recompute" has
 * something to count): open the demo, new rows on disk, an edit saved from
 * the page, and a save that meets an edit made on disk meanwhile.
 *
 * Recomputations are counted from the server's `run` messages (`ran`), read
 * off the page's WebSocket frames.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import type { RunMessage } from "../../kernel/server/protocol.ts";
import {
  allCurrent,
  ARTIFACTS,
  type Session,
  skipWithoutBrowser,
  withServedBrowser,
} from "./_harness.ts";

const ignore = skipWithoutBrowser("live workspace");

const SIDE = `
## An unrelated calibration

\`\`\`table side
columns: [x, y]
rows:
  - [1, 2.1]
  - [2, 3.9]
  - [3, 6.2]
  - [4, 7.8]
\`\`\`

\`\`\`fit side-fit
on: side
model: y = b0 + b1*x
\`\`\`
`;

/** Every cell of the demo depends on its one table; filled in from the page. */
const AFFECTED: string[] = [];

function runsAfter(b: Session, from: number): RunMessage[] {
  return b.messages.slice(from).filter((m): m is RunMessage => m.type === "run");
}

async function waitFor<T>(what: string, fn: () => T | undefined, ms = 5000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = fn();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

async function runOf(page: Session["page"], name: string): Promise<number> {
  return Number(await page.$eval(`[data-block="${name}"]`, (e) => e.getAttribute("data-computed")));
}

/** Waits until every named cell shows a run above `after` and is current. */
async function updated(page: Session["page"], names: string[], after: Record<string, number>) {
  await page.waitForFunction(
    (names: string[], after: Record<string, number>) =>
      names.every((n) => {
        const e = document.querySelector(`[data-block="${n}"]`);
        return e !== null && e.getAttribute("data-state") === "current" &&
          Number(e.getAttribute("data-computed")) > after[n];
      }),
    { timeout: 2000, polling: 20 },
    names,
    after,
  );
}

async function runsBy(page: Session["page"], names: string[]): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const n of names) out[n] = await runOf(page, n);
  return out;
}

async function setEditorText(page: Session["page"], name: string, text: string) {
  await page.$eval(`[data-editor="${name}"] textarea`, (el, text) => {
    const area = el as HTMLTextAreaElement;
    area.value = text as string;
    area.dispatchEvent(new Event("input", { bubbles: true }));
  }, text);
}

async function saveWithKeys(page: Session["page"], name: string) {
  await page.focus(`[data-editor="${name}"] textarea`);
  await page.keyboard.down("Control");
  await page.keyboard.press("s");
  await page.keyboard.up("Control");
}

Deno.test({
  name: "live page: demo opens current, follows new rows, saves edits, shows conflicts",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    const addSide = (dir: string) => {
      Deno.writeTextFileSync(`${dir}/fade.md`, SIDE, { append: true });
    };
    await withServedBrowser("fade", "fade.md", async (served, b) => {
      const { page } = b;
      const s = served;

      await t.step("open: every cell reaches current, no console errors, screenshot", async () => {
        await page.goto(s.url);
        await allCurrent(page);
        const names = await page.$$eval(
          "[data-block]",
          (els) => els.map((e) => e.getAttribute("data-block")),
        );
        deepEqual(names.slice(-2), ["side", "side-fit"]);
        AFFECTED.push(...(names.slice(0, -2) as string[]));
        for (const n of ["cycles", "line", "root", "fade-overview"]) ok(AFFECTED.includes(n), n);
        const ref = await page.$eval("[data-ref]", (e) => e.textContent);
        ok(/^0\.\d{4}$/.test(ref ?? ""), `inline R² shown with 4 digits: ${ref}`);
        Deno.mkdirSync(ARTIFACTS, { recursive: true });
        // Blocks off screen skip rendering (content-visibility: auto): a viewport as tall
        // as the page brings every block on screen for the picture.
        const height = await page.evaluate(() => document.documentElement.scrollHeight);
        await page.setViewport({ width: 1280, height });
        await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
        await page.screenshot({
          path: new URL("live-demo.png", ARTIFACTS).pathname,
          fullPage: true,
        });
        await page.setViewport({ width: 1280, height: 900 });
        deepEqual(b!.errors, []);
      });

      await t.step(
        "new rows on disk: affected cells update within 2 s, others do not rerun",
        async () => {
          const before = await runsBy(page, [...AFFECTED, "side", "side-fit"]);
          const chartOf = () =>
            page.$eval('[data-block="fade-overview"] svg.plumb-chart', (e) => e.outerHTML);
          const chartBefore = await chartOf();
          const from = b!.messages.length;
          const csv = `${s.dir}/data/batch7.csv`;
          const rows = "605,2260.4,25.0\n610,2259.1,25.1\n615,2257.9,24.9\n";
          const t0 = performance.now();
          await Deno.writeTextFile(csv, rows, { append: true });
          await updated(page, AFFECTED, before);
          const ms = performance.now() - t0;
          ok(ms < 2000, `updated in ${ms} ms`);
          // Charts off screen keep their drawing until their block comes near the
          // screen; scrolled to, the overview is drawn from the new rows.
          // The check's residual figure: one SVG of panels.
          ok(await page.$$eval(".plumb-check svg.plumb-chart", (e) => e.length) >= 1);
          await page.$eval('[data-block="fade-overview"]', (e) => e.scrollIntoView());
          await page.waitForFunction(
            () => document.querySelector('[data-block="fade-overview"] [data-pending]') === null,
            { timeout: 2000, polling: 20 },
          );
          ok((await chartOf()) !== chartBefore, "the overview chart was redrawn");
          await page.evaluate(() => scrollTo(0, 0));
          const runs = await waitFor("the run message", () => {
            const r = runsAfter(b!, from);
            return r.some((m) => m.ran.includes("cycles")) ? r : undefined;
          });
          const ran = new Set(runs.flatMap((r) => r.ran));
          for (const n of AFFECTED) ok(ran.has(n), `${n} recomputed`);
          ok(!ran.has("side") && !ran.has("side-fit"), `unaffected cells reran: ${[...ran]}`);
          deepEqual(await runsBy(page, ["side", "side-fit"]), {
            side: before.side,
            "side-fit": before["side-fit"],
          });
          const line = await page.$eval(".pl-data", (e) => e.textContent);
          ok(line?.includes("123 rows"), `data line counts the new rows: ${line}`);
        },
      );

      await t.step(
        "edit a fit's model in the page: only that cell changes on disk, dependents update",
        async () => {
          const original = await Deno.readFile(s.doc);
          const text = new TextDecoder().decode(original);
          const oldBody = "on: cycles\nmodel: capacity = q0 - a*sqrt(cycle)\n";
          const newBody = "on: cycles\nmodel: capacity = q0 - a*cycle^0.5\n";
          equal(text.split(oldBody).length, 2, "the root cell's body occurs once");
          const before = await runsBy(page, ["root", "fade-overview", "line"]);
          const from = b!.messages.length;
          await page.click('[data-block="root"] [data-action="edit"]');
          await setEditorText(page, "root", newBody);
          await saveWithKeys(page, "root");
          await waitFor("the file to change", () => {
            const now = Deno.readFileSync(s.doc);
            return now.length !== original.length ? now : undefined;
          });
          deepEqual(
            Deno.readFileSync(s.doc),
            new TextEncoder().encode(text.replace(oldBody, newBody)),
          );
          await updated(page, ["root", "fade-overview"], before);
          equal(await runOf(page, "line"), before.line, "line is not a dependent");
          const runs = await waitFor("the run message", () => {
            const r = runsAfter(b!, from);
            return r.some((m) => m.ran.includes("root")) ? r : undefined;
          });
          const ran = new Set(runs.flatMap((r) => r.ran));
          ok(
            !ran.has("line") && !ran.has("cycles"),
            `only root and its dependents reran: ${[...ran]}`,
          );
          equal(await page.$('[data-editor="root"]'), null, "the editor closed after saving");
        },
      );

      await t.step(
        "a save meeting an edit on disk shows a conflict and writes nothing",
        async () => {
          await page.click('[data-block="line"] [data-action="edit"]');
          const version = await page.$eval(".pl-page", (e) => e.getAttribute("data-version"));
          const onDisk = Deno.readTextFileSync(s.doc).replace(
            "A straight line is the simplest candidate.",
            "A straight line is the simplest candidate (edited in another editor).",
          );
          Deno.writeTextFileSync(s.doc, onDisk);
          await page.waitForFunction(
            (v: string | null) =>
              document.querySelector(".pl-page")?.getAttribute("data-version") !== v,
            { timeout: 5000 },
            version,
          );
          await setEditorText(
            page,
            "line",
            "on: cycles\nmodel: capacity = q0 + a*cycle + 0*cycle^2\n",
          );
          await page.click('[data-editor="line"] .pl-primary');
          await page.waitForSelector('[data-editor="line"] .pl-conflict', { timeout: 5000 });
          const disk = await page.$eval(".pl-conflict-disk", (e) => e.textContent);
          const yours = await page.$eval(".pl-conflict-yours", (e) => e.textContent);
          equal(disk, "on: cycles\nmodel: capacity = q0 + a*cycle\n");
          ok(yours?.includes("0*cycle^2"), `yours shown: ${yours}`);
          equal(Deno.readTextFileSync(s.doc), onDisk, "the disk keeps the on-disk edit");
          await page.screenshot({ path: new URL("live-conflict.png", ARTIFACTS).pathname });
          deepEqual(b!.errors.filter((e) => !e.includes("409")), []);
        },
      );
    }, addSide);
  },
});
