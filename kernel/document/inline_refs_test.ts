import assert from "node:assert/strict";
import { LocatedError } from "../errors.ts";
import { findInlineRefs, parseDocument, type ProseBlock } from "./mod.ts";

const F = "`".repeat(3);

function refsIn(src: string, index = 0) {
  const doc = parseDocument(src);
  const prose = doc.blocks.filter((b): b is ProseBlock => b.type === "prose")[index];
  return { src, ...findInlineRefs(prose) };
}

Deno.test("findInlineRefs() reads names, fields, indexes and digits with positions", () => {
  const { src, refs, errors } = refsIn(
    "Fit: @(root.r2, 3) and @(power.coef.q0)\nthen @( fade.rows[2].aicc ,  4 ) and @(ratio).\n",
  );
  assert.deepEqual(errors, []);
  assert.deepEqual(
    refs.map(({ cell, path, digits, line, column }) => ({ cell, path, digits, line, column })),
    [
      { cell: "root", path: ["r2"], digits: 3, line: 1, column: 6 },
      { cell: "power", path: ["coef", "q0"], digits: undefined, line: 1, column: 24 },
      { cell: "fade", path: ["rows", 2, "aicc"], digits: 4, line: 2, column: 6 },
      { cell: "ratio", path: [], digits: undefined, line: 2, column: 38 },
    ],
  );
  assert.equal(src.slice(refs[0].start, refs[0].end), "@(root.r2, 3)");
  assert.equal(src.slice(refs[2].start, refs[2].end), "@( fade.rows[2].aicc ,  4 )");
  assert.equal("digits" in refs[1], false);
});

Deno.test("findInlineRefs() skips code spans, fenced blocks and escaped @(", () => {
  const src = [
    "Use `@(a.b)` or ``code with ` and @(c.d)`` but \\@(e.f) is literal.",
    "",
    `${F}python`,
    "@(inside.fence)",
    F,
    "Unclosed `tick then @(real.one, 2)",
    "",
  ].join("\n");
  const { refs, errors } = refsIn(src);
  assert.deepEqual(errors, []);
  assert.deepEqual(refs.map((r) => [r.cell, r.line, r.column]), [["real", 6, 21]]);
});

Deno.test("findInlineRefs() reports a malformed reference at its @", () => {
  const { refs, errors } = refsIn("ok @(a.b)\nbad @(root r2) and @(x.y, 3d) end\n");
  assert.equal(refs.length, 1);
  assert.ok(errors.every((e) => e instanceof LocatedError));
  assert.deepEqual(errors.map((e) => [e.message, e.pos]), [
    ['Malformed inline reference "@(root r2)": write @(cell.field) or @(cell.field, digits)', {
      line: 2,
      column: 5,
    }],
    ['Malformed inline reference "@(x.y, 3d)": write @(cell.field) or @(cell.field, digits)', {
      line: 2,
      column: 20,
    }],
  ]);
});

Deno.test("findInlineRefs() gives document offsets and lines for prose after a cell", () => {
  const src = `---\ntitle: T\n---\n${F}fit a\non: t\n${F}\n\nR² = @(a.r2, 3) 😀 @(a.n)\n`;
  const { refs } = refsIn(src);
  assert.deepEqual(refs.map((r) => [r.line, r.column, src.slice(r.start, r.end)]), [
    [8, 6, "@(a.r2, 3)"],
    [8, 20, "@(a.n)"],
  ]);
});

Deno.test("findInlineRefs() stays linear in code-span runs that never close", () => {
  // Before: each unclosed run scanned to the paragraph's end; one line of
  // "`a``" 40,000 times took 1.5-3 s (fuzz fixture document-hang-code-spans).
  const text = "`a``".repeat(100_000) + " @(fit.r2)\n\n`x` @(b.c) ``y`` `` @(d.e)\n";
  const doc = parseDocument(text);
  const prose = doc.blocks[0];
  if (prose.type !== "prose") throw new Error("expected prose");
  const { refs, errors } = findInlineRefs(prose);
  assert.deepEqual(errors, []);
  // The runs are 1, then 3s (`` + ` merge), then 2: none closes, so no span
  // hides @(fit.r2); in the next paragraph `x` and ``y`` close and "``" does not.
  assert.deepEqual(refs.map((r) => r.cell), ["fit", "b", "d"]);
});
