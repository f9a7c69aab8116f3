import assert from "node:assert/strict";
import { dyadic } from "../../kernel/dd.ts";
import { dec, type Q, q, sub, val } from "./_rational_test.ts";
import { printedLo } from "./_dd_design.ts";

/** A double's exact value as a fraction, from its IEEE 754 fields (kernel/dd.ts `dyadic`). */
function exact(v: number): Q {
  const [m, e] = dyadic(v);
  return e >= 0 ? q(m << BigInt(e)) : q(m, 1n << BigInt(-e));
}

Deno.test("printedLo() gives the printed decimal less its double, as exact rational arithmetic does", () => {
  // Source: exact rational arithmetic (BigInt fractions): lo = decimal − double, rounded once.
  const printed = [
    "0.1",
    "88.2",
    "-6.860120914",
    "0.8116",
    "1e-5",
    "123456.789012345",
    "-0.000123",
  ];
  const lo = printedLo(printed.map(Number))!;
  printed.forEach((s, i) => {
    const want = val(sub(dec(s), exact(Number(s))));
    assert.ok(Math.abs(lo[i] - want) <= 1e-15 * Math.abs(want), `${s}: ${lo[i]} vs ${want}`);
  });
});

Deno.test("printedLo() leaves integers, binary fractions and values of more than 15 digits at 0", () => {
  // 0.30000000000000004 is 0.1 + 0.2 computed, 17 digits: not a printed decimal we can recover.
  assert.equal(printedLo([1947, 0.5, -2.25, 0]), null);
  const lo = printedLo([0.1 + 0.2, 0.3])!;
  assert.equal(lo[0], 0);
  assert.ok(lo[1] !== 0);
});
