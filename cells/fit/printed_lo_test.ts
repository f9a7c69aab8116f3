import assert from "node:assert/strict";
import { dyadic } from "../../kernel/dd.ts";
import { mulberry32Uint } from "../../kernel/random.ts";
import { dec, type Q, q, sub, val } from "./_rational_test.ts";
import { PrintedColumn, printedLo } from "./_printed_lo.ts";

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

Deno.test("printedLo() recovers decimals of 1 to 15 digits to 22 decimals, as exact rational arithmetic does", () => {
  // Source: exact rational arithmetic (BigInt fractions), as above; seeded decimals d·10^−k.
  const next = mulberry32Uint(16);
  const printed: string[] = [];
  for (let i = 0; i < 2000; i++) {
    const digits = 1 + (next() % 15);
    const mantissa = String(1 + (next() % 9)) + String(next()).padStart(10, "0").repeat(2);
    const m = mantissa.slice(0, digits);
    const point = next() % 23; // up to 22 decimals (10^22 is the largest exact power of ten)
    const sign = next() % 2 ? "-" : "";
    const s = point === 0 ? `${sign}${m}.5` : `${sign}${m}e-${point}`;
    printed.push(digits < 15 || point > 0 ? s : `${sign}${m}`);
  }
  const values = printed.map(Number);
  const lo = printedLo(values) ?? new Float64Array(values.length);
  printed.forEach((s, i) => {
    const v = values[i];
    if (Number.isInteger(v) || Math.abs(v) >= 1e15 || !Object.is(Number(String(v)), v)) return;
    // Only decimals of at most 15 digits that are the shortest form of their double are recovered.
    if (String(v).replace(/^-|\.|e.*$/g, "").replace(/^0+/, "").length > 15) return;
    const want = val(sub(dec(String(v)), exact(v)));
    assert.ok(Math.abs(lo[i] - want) <= 1e-15 * Math.abs(want), `${s} (${v}): ${lo[i]} vs ${want}`);
  });
});

Deno.test("PrintedColumn.block() gives the whole column's corrections, a block at a time", () => {
  // Source: the same function value by value (each correction is independent of its neighbours).
  const next = mulberry32Uint(7);
  const hi = Float64Array.from({ length: 1000 }, () => (next() % 1e7) / 10 ** (next() % 9));
  const whole = printedLo(hi)!;
  const buf = new Float64Array(64);
  const lazy = new PrintedColumn(hi);
  for (let start = 0; start < hi.length; start += 64) {
    const len = Math.min(64, hi.length - start);
    const block = lazy.block(start, len, buf);
    for (let i = 0; i < len; i++) {
      assert.ok(Object.is(block[i], whole[start + i]), `row ${start + i}`);
    }
  }
  assert.deepEqual(lazy.lo, whole);
  assert.equal(new PrintedColumn(Float64Array.of(1, 2, 0.5)).lo, null);
});

Deno.test("the corrections in WebAssembly are correction()'s, bit for bit, for every kind of value", async () => {
  // Exact: the JavaScript `correction` is the reference (same IEEE operations, same order).
  const { correction } = await import("./_printed_lo.ts");
  const { wasmCorrections } = await import("../../kernel/csv/printed_lo.ts");
  const next = mulberry32Uint(1205);
  const values: number[] = [
    0,
    -0,
    1,
    -7,
    0.1,
    88.2,
    1e15,
    999999999999999.9,
    9.999999999999999e14,
    1e-8,
    9.9e-9,
    1e-9,
    0.30000000000000004,
    2.5,
    -2.5,
    0.5,
    -0.5,
    1e22,
    1e-300,
    5e-324,
    NaN,
    Infinity,
    -Infinity,
    123456.789012345,
    0.8116,
    1e14 - 0.5,
    99.99999999999999,
    0.09999999999999999,
  ];
  while (values.length < 40_000) {
    const digits = 1 + (next() % 17);
    const m = Number(String(next()).padEnd(digits, "7").slice(0, digits));
    const v = m / 10 ** (next() % 24) * (next() % 2 ? -1 : 1);
    values.push(next() % 5 === 0 ? Math.fround(v) : v);
  }
  const hi = Float64Array.from(values);
  const out = new Float64Array(hi.length);
  const some = wasmCorrections(hi, 0, hi.length, out);
  assert.ok(some > 1000, "WebAssembly available and most values have a correction");
  hi.forEach((v, i) => {
    const want = correction(v);
    if (!Object.is(out[i], want)) assert.fail(`${v}: ${out[i]} against ${want}`);
  });
  // A block not at the start.
  const part = new Float64Array(777);
  wasmCorrections(hi, 12_345, 777, part);
  for (let i = 0; i < 777; i++) assert.ok(Object.is(part[i], correction(hi[12_345 + i])));
});
