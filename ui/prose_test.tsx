/**
 * Hostile prose (issue 11, defect 6): the Markdown reader, the math
 * typesetter and the prose block never throw for one absurd line; a block
 * that cannot be drawn shows its source and why, others are drawn as usual.
 * Rendered to a string (as a record or server-side rendering would) and
 * into a linkedom document (as the page does).
 *
 * Before the fix: `renderToString(Prose)` threw "RangeError: Maximum call
 * stack size exceeded" for `*` ×6,000 `x` `*` ×6,000 and for `$` with 3,000
 * `{` closed by `$`, and the live page showed no block at all.
 *
 * @module
 */
import { equal, ok, throws } from "node:assert/strict";
import { parseHTML } from "linkedom";
import { type ComponentChild, h, render } from "preact";
import { renderToString } from "preact-render-to-string";
import { headingsOf, MAX_NESTING, parseProse, ProseError } from "./markdown.ts";
import { MAX_TEX_NESTING, Prose } from "./prose.tsx";
import { HOSTILE_PROSE } from "./testdata/hostile_prose.ts";

const refs = (r: { cell: string }, key: number) => h("span", { key, "data-ref": "" }, r.cell);
const draw = (text: string) => renderToString(h(Prose, { text, line: 7, refs }));

const HOSTILE = HOSTILE_PROSE;

Deno.test("Prose draws every hostile line without throwing", () => {
  for (const [name, text] of Object.entries(HOSTILE)) {
    const html = draw(text);
    ok(html.startsWith('<div class="pl-prose'), `${name}: ${html.slice(0, 80)}`);
  }
});

Deno.test("parseProse() refuses emphasis nested thousands deep with a ProseError", () => {
  throws(
    () => parseProse(HOSTILE.emphasis),
    (e: unknown) =>
      e instanceof ProseError &&
      e.message === `it nests 3,001 levels deep (at most ${MAX_NESTING})`,
  );
  // A second call answers from the cache with the same refusal.
  throws(() => parseProse(HOSTILE.emphasis), ProseError);
  // Nesting up to the bound is drawn.
  const fine = "*".repeat(2 * 40) + "x" + "*".repeat(2 * 40);
  ok(parseProse(fine).length > 0);
});

Deno.test("Prose shows a refused block's source and the reason, with its lines", () => {
  const text = `intro\n\n${HOSTILE.emphasis}\n`;
  const html = draw(text);
  ok(html.includes('class="pl-prose pl-prose-failed"'), html.slice(0, 200));
  ok(html.includes("This prose could not be drawn: it nests 3,001 levels deep (at most 100)"));
  ok(html.includes("(lines 7–9)"), "the document lines of the block");
  ok(html.includes(HOSTILE.emphasis), "the source as written");
  ok(!html.includes("<em>"), "nothing of it interpreted");
});

Deno.test("headingsOf() gives no headings for a block that cannot be drawn", () => {
  equal(headingsOf(`# Title\n\n${HOSTILE.underscores}`, 1).length, 0);
  equal(headingsOf("# Title\n\ntext", 1).length, 1);
});

Deno.test("Prose shows math nested too deep as its TeX and the reason, the rest drawn", () => {
  const html = draw(`Before @(fit.r2) ${HOSTILE.closed_braces} and $x^2$ after.`);
  ok(html.includes('class="pl-math-error"'), html.slice(0, 300));
  ok(html.includes(`(math not drawn: its braces nest 3,000 deep (at most ${MAX_TEX_NESTING}))`));
  ok(html.includes("<math"), "the other formula is typeset");
  ok(html.includes("data-ref"), "the inline value is drawn");
  ok(html.includes("Before") && html.includes("after."));
  const deepest = "$" + "{".repeat(MAX_TEX_NESTING) + "x" + "}".repeat(MAX_TEX_NESTING) + "$";
  ok(!draw(deepest).includes("pl-math-error"), "braces up to the bound are typeset");
  ok(draw("$\\{" + "\\{".repeat(200) + "$").includes("<math"), "escaped braces do not count");
});

Deno.test("Prose catches what an inline value's view throws while the page draws it", async () => {
  const { document } = parseHTML("<!doctype html><html><body><div id=app></div></body></html>");
  const g = globalThis as unknown as Record<string, unknown>;
  const saved = g.document;
  g.document = document;
  try {
    const root = document.getElementById("app")! as unknown as Element;
    const Broken = (): ComponentChild => {
      throw new TypeError("x is undefined");
    };
    const broken = (_: unknown, key: number) => h(Broken, { key });
    render(
      h("div", null, [
        h(Prose, { key: 1, text: "First @(a.b).", line: 1, refs: broken }),
        h(Prose, { key: 2, text: "Second *fine*.", line: 3, refs }),
      ]),
      root,
    );
    await new Promise((r) => setTimeout(r, 0));
    const failed = root.querySelector(".pl-prose-failed");
    ok(failed !== null, root.innerHTML);
    equal(
      failed.querySelector(".pl-prose-why")!.textContent,
      "This prose could not be drawn: the page failed to draw it; its source is shown as written",
    );
    equal(failed.querySelector(".pl-prose-source")!.textContent, "First @(a.b).");
    ok(root.innerHTML.includes("Second <em>fine</em>."), "the other block is drawn");
    ok(!root.innerHTML.includes("x is undefined"), "no internal message reaches the page");
    render(null, root);
  } finally {
    g.document = saved;
  }
});
