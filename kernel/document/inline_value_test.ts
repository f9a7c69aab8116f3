import assert from "node:assert/strict";
import { formatValue, resolveValue } from "./inline_value.ts";

// A fit-like result with a parameter named like a result field (invented numbers).
const FIT = {
  n: 119,
  r2: 0.9999999904,
  sigma: 1.71,
  parameters: [
    { name: "q0", estimate: 2512.27, ci: [2511.33, 2513.21] },
    { name: "n", estimate: 0.5056, ci: [0.4938, 0.5175] },
  ],
};

Deno.test("resolveValue() refuses a name that is both a field and a parameter, naming both paths", () => {
  const r = resolveValue(FIT, "page", ["n"], 3);
  assert.equal(r.ok, false);
  assert.match(
    (r as { error: string }).error,
    /could mean the result's field "n" \(write @\(page\.result\.n\)\) or parameter "n" \(write @\(page\.parameters\.n\.estimate\)\)/,
  );
  assert.deepEqual(resolveValue(FIT, "page", ["result", "n"], null), { ok: true, text: "119" });
  assert.deepEqual(resolveValue(FIT, "page", ["parameters", "n", "estimate"], 3), {
    ok: true,
    text: "0.506",
  });
});

Deno.test("resolveValue() reads a parameter by name, bare or in the list", () => {
  assert.deepEqual(resolveValue(FIT, "root", ["q0"], 5), { ok: true, text: "2512.3" });
  assert.deepEqual(resolveValue(FIT, "root", ["parameters", "q0", "ci", 1], 6), {
    ok: true,
    text: "2513.21",
  });
  const miss = resolveValue(FIT, "root", ["parameters", "q1", "estimate"], 3);
  assert.match((miss as { error: string }).error, /no entry named "q1".*did you mean "q0"/);
});

Deno.test("formatValue() never rounds a value that is not 1 or 0 to 1 or 0", () => {
  // 0.9999999904 to 6 significant digits would read 1.00000 (the issue's case).
  assert.equal(formatValue(0.9999999904, 6), "0.99999999");
  assert.equal(resolveValue(FIT, "f", ["r2"], 6).ok, true);
  assert.equal((resolveValue(FIT, "f", ["r2"], 6) as { text: string }).text, "0.99999999");
  assert.equal(formatValue(-0.99996, 3), "−0.99996");
  assert.equal(formatValue(1, 4), "1.000");
  assert.equal(formatValue(0.998, 2), "0.998");
  assert.equal(formatValue(0.97, 2), "0.97");
});

Deno.test("resolveValue() reads a per-row field that crossed from the worker as a Float64Array", () => {
  const fit = { n: 3, fitted: new Float64Array([1.5, 2.25, 3]) };
  assert.deepEqual(resolveValue(fit, "line", ["fitted", 1], null), { ok: true, text: "2.25" });
  const whole = resolveValue(fit, "line", ["fitted"], null);
  assert.match((whole as { error: string }).error, /is a list of 3 values: pick one with \[i\]/);
  const past = resolveValue(fit, "line", ["fitted", 3], null);
  assert.match((past as { error: string }).error, /has 3 items: no \[3\]/);
  const named = resolveValue(fit, "line", ["fitted", "x"], null);
  assert.match((named as { error: string }).error, /is a list: pick an item with \[i\]/);
});
