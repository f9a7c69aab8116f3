/**
 * Deep expressions (issue 11 #8). Before: 2,000 nested parentheses, 5,000
 * signs or 3,000 nested calls overflowed the parser's call stack, and a sum
 * of 3,000 terms parsed but overflowed code generation, each shown as
 * "Internal error … Maximum call stack size exceeded" at the fence. Now the
 * parser refuses more than 100 nested parentheses, calls or powers at
 * the offending token and a tree deeper than 500 (one level a term of a sum)
 * at the node past the bound; everything within the bounds goes through
 * every pass.
 */
import assert from "node:assert/strict";
import {
  compile,
  compileDD,
  derivative,
  ExprError,
  format,
  freeNames,
  isLinearIn,
  parseColumnExpression,
  parseExpression,
  parseModel,
  simplify,
} from "./mod.ts";
import { MAX_DEPTH, MAX_NESTING } from "./_depth.ts";

function refused(text: string, at: number) {
  try {
    parseExpression(text);
  } catch (e) {
    assert.ok(e instanceof ExprError, String(e));
    assert.equal(e.offset, at, e.message);
    assert.equal(
      e.message,
      `Expression nests more than 100 parentheses, calls or powers at column ${
        at + 1
      }: the limit is 100`,
    );
    return;
  }
  assert.fail(`accepted ${text.slice(0, 40)}…`);
}

Deno.test("parseExpression() refuses 2,000 nested parentheses at the 101st", () => {
  refused("(".repeat(2000) + "a*x" + ")".repeat(2000), 100);
});

Deno.test("parseExpression() refuses 5,000 signs by depth, and 3,000 calls and powers, located", () => {
  // Signs are read in a loop, so only the tree's depth bounds them.
  assert.throws(() => parseExpression("-".repeat(5000) + "x"), (e: Error) => {
    assert.ok(e instanceof ExprError);
    assert.match(
      e.message,
      /^Expression is more than 500 levels deep at column \d+: the limit is 500/,
    );
    return true;
  });
  const fifty = parseExpression("-".repeat(51) + "x");
  assert.equal(format(parseExpression(format(fifty))), format(fifty), "format reads back");
  refused("exp(".repeat(3000) + "x" + ")".repeat(3000), 100 * 4 + 3);
  refused("x^" + Array(3000).fill("a").join("^"), 2 * 101 - 1);
});

Deno.test("parseExpression() refuses a sum of 3,000 terms clearly, not with a stack overflow", () => {
  const text = Array.from({ length: 3000 }, (_, i) => `a${i}*x`).join(" + ");
  assert.throws(() => parseExpression(text), (e: Error) => {
    assert.ok(e instanceof ExprError);
    assert.match(
      e.message,
      /^Expression is more than 500 levels deep at column \d+: the limit is 500/,
    );
    return true;
  });
  assert.throws(() => parseColumnExpression(text, ["x"]), ExprError);
});

Deno.test("parseModel() refuses linear() whose expansion is deeper than the bound", () => {
  const cols = Array.from({ length: 600 }, (_, i) => `x${i}`);
  assert.throws(() => parseModel(`y = linear(${cols.join(", ")})`, ["y", ...cols]), (e: Error) => {
    assert.ok(e instanceof ExprError);
    assert.match(e.message, /^Expression is more than 500 levels deep/);
    return true;
  });
});

Deno.test("every pass works on a sum of 490 terms and 99 nested calls", () => {
  const n = MAX_DEPTH - 10;
  const sum = parseExpression(Array.from({ length: n }, (_, i) => `b*x/${i + 1}`).join(" + "));
  const depth = MAX_NESTING - 1;
  const nest = parseExpression("a*" + "sqrt(".repeat(depth) + "b*x" + ")".repeat(depth));
  for (const e of [sum, nest]) {
    assert.deepEqual([...freeNames(e)].sort(), e === sum ? ["b", "x"] : ["a", "b", "x"]);
    assert.ok(format(simplify(e)).length > depth);
    const d = derivative(e, "b");
    const params = e === sum ? ["b"] : ["a", "b"];
    const values = e === sum ? [2] : [3, 5];
    const y = compile(e, ["x"], params)([[1, 4]], values, 2);
    const dd = compileDD(e, ["x"], params)([[1, 4]], [null], values, null, 2);
    const dy = compile(d, ["x"], params)([[1, 4]], values, 2);
    assert.ok(y.every(Number.isFinite) && dy.every(Number.isFinite));
    assert.ok(Math.abs(dd.hi[1] - y[1]) <= 1e-12 * Math.abs(y[1]));
    assert.equal(isLinearIn(e, ["b"]), e === sum);
  }
  // The harmonic sum H(490) times b*x at x = 4, b = 2.
  let h = 0;
  for (let i = 1; i <= n; i++) h += 1 / i;
  const y = compile(sum, ["x"], ["b"])([[4]], [2], 1)[0];
  assert.ok(Math.abs(y - 8 * h) < 1e-12 * y, `${y} vs ${8 * h}`);
});
