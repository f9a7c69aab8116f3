import { mulberry32 } from "../random.ts";
import assert from "node:assert/strict";
import { DecimalParser, parseDecimal } from "./decimal_parser.ts";

/** x = num · 2^exp2 exactly (x finite). */
function toBinaryFraction(x: number): [bigint, number] {
  if (x === 0) return [0n, 0];
  const dv = new DataView(new ArrayBuffer(8));
  dv.setFloat64(0, x);
  const bits = dv.getBigUint64(0);
  const sign = bits >> 63n ? -1n : 1n;
  const be = Number((bits >> 52n) & 0x7ffn);
  const frac = bits & 0xfffffffffffffn;
  return be === 0 ? [sign * frac, -1074] : [sign * (frac | (1n << 52n)), be - 1075];
}

/** The exact decimal value of a plain decimal string as num / den. */
function decimalFraction(text: string): [bigint, bigint] {
  const m = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(text)!;
  const frac = m[3] ?? "";
  const k = Number(m[4] ?? "0") - frac.length;
  let num = BigInt((m[2] + frac) || "0") * (m[1] === "-" ? -1n : 1n);
  let den = 1n;
  if (k >= 0) num *= 10n ** BigInt(k);
  else den = 10n ** BigInt(-k);
  return [num, den];
}

/**
 * |decimal − (hi + lo)| · 2^bits ≤ |decimal|, checked in exact rational
 * arithmetic: hi + lo agrees with the decimal to `bits` bits, relative.
 */
function agreesTo(text: string, hi: number, lo: number, bits: number): boolean {
  const [n, d] = decimalFraction(text);
  const [hn, he] = toBinaryFraction(hi);
  const [ln, le] = toBinaryFraction(lo);
  const e = Math.min(he, le);
  const s = hn * (1n << BigInt(he - e)) + ln * (1n << BigInt(le - e)); // hi + lo = s · 2^e
  // decimal − s·2^e over the common denominator d · 2^-e (or d when e ≥ 0)
  const [errNum, scaleNum] = e >= 0
    ? [n - s * d * (1n << BigInt(e)), n]
    : [n * (1n << BigInt(-e)) - s * d, n * (1n << BigInt(-e))];
  const abs = (v: bigint) => (v < 0n ? -v : v);
  return abs(errNum) * (1n << BigInt(bits)) <= abs(scaleNum);
}

const rng = mulberry32;

function randomDecimal(r: () => number): string {
  const digits = 1 + Math.floor(r() * (r() < 0.7 ? 15 : 30));
  let m = "";
  for (let i = 0; i < digits; i++) m += String(Math.floor(r() * 10));
  const point = Math.floor(r() * (digits + 1));
  let s = (r() < 0.3 ? "-" : "") + m.slice(0, point) + (point < digits ? "." + m.slice(point) : "");
  if (s.endsWith(".") || s === "-" || s === "") s += "0";
  if (r() < 0.5) {
    const big = r() < 0.2;
    const ex = Math.floor((r() - 0.5) * (big ? 640 : 60));
    s += "e" + ex;
  }
  return s;
}

Deno.test("DecimalParser.parse() matches Number() on 200,000 random decimals", () => {
  // Number() is correctly rounded by ECMA-262 (StringToNumber, round to nearest,
  // ties to even); random long mantissas and large exponents (common practice, no source).
  const r = rng(12345);
  const p = new DecimalParser({ wantLo: false });
  const enc = new TextEncoder();
  for (let i = 0; i < 200_000; i++) {
    const s = randomDecimal(r);
    const b = enc.encode(s);
    const got = p.parse(b, 0, b.length);
    if (!Object.is(got, Number(s))) assert.fail(`"${s}": got ${got}, Number() gives ${Number(s)}`);
  }
});

Deno.test("DecimalParser.parse() rounds well-known hard cases correctly", () => {
  // Halfway and near-halfway cases from memory (Paxson 1991 style tests; values
  // checked against Number(), which ECMA-262 requires to be correctly rounded).
  const cases = [
    "9007199254740993", // 2^53 + 1: ties to even → 2^53
    "9007199254740995", // 2^53 + 3: ties to even → 2^53 + 4
    "2.2250738585072011e-308",
    "2.2250738585072012e-308",
    "4.9406564584124654e-324",
    "1.7976931348623157e308",
    "0.1",
    "1e23",
    "8.41e21",
    "5e-324",
    "123456789012345678901234567890e-30",
    "0.30000000000000004",
  ];
  for (const s of cases) assert.equal(parseDecimal(s)[0], Number(s), s);
});

Deno.test("DecimalParser.parse() keeps the sign of zero and accepts signs, bare points and spaces", () => {
  assert.ok(Object.is(parseDecimal("-0")[0], -0));
  assert.equal(parseDecimal("+2.5")[0], 2.5);
  assert.equal(parseDecimal(".5")[0], 0.5);
  assert.equal(parseDecimal("5.")[0], 5);
  assert.equal(parseDecimal("  7.25 ")[0], 7.25);
  assert.equal(parseDecimal("1E3")[0], 1000);
});

Deno.test("DecimalParser.parse() rejects text that is not a decimal", () => {
  for (
    const s of [
      "",
      " ",
      "-",
      ".",
      "e5",
      "1e",
      "1e+",
      "0x10",
      "Infinity",
      "NaN",
      "1,5",
      "1.2.3",
      "12a",
      "1 2",
    ]
  ) {
    assert.ok(Number.isNaN(parseDecimal(s)[0]), JSON.stringify(s));
  }
});

Deno.test("DecimalParser.parse() reads a decimal comma", () => {
  assert.equal(parseDecimal("2,5", ",")[0], 2.5);
  assert.equal(parseDecimal("-0,125e2", ",")[0], -12.5);
  assert.ok(Number.isNaN(parseDecimal("2.5", ",")[0]));
  const [hi, lo] = parseDecimal("0,1", ",");
  assert.deepEqual([hi, lo], parseDecimal("0.1"));
});

Deno.test('DecimalParser lo makes hi + lo equal 1/10 to a few 1e-33 for "0.1"', () => {
  // Exact value of the double 0.1 is 0.1000000000000000055511151231257827021181583404541015625
  // (IEEE 754 binary64; checked here in BigInt arithmetic, not assumed).
  const [hi, lo] = parseDecimal("0.1");
  assert.equal(hi, 0.1);
  assert.ok(lo < 0 && lo > -6e-18);
  // The one rounding left is lo's own (half an ulp of lo ≈ 2^-108 relative to 1/10).
  assert.ok(agreesTo("0.1", hi, lo, 107), "hi + lo within 2^-107 ≈ 6.2e-33 of 1/10");
  assert.ok(!agreesTo("0.1", hi, 0, 60), "without lo the double 0.1 is off by ~5.6e-17 relative");
});

Deno.test("DecimalParser lo is exact (double-double) on 50,000 random decimals, fast and slow paths", () => {
  // Verified by exact rational arithmetic in BigInt (common practice, no source).
  // Bound 2^-104 relative (double-double: two 53-bit halves, a few ulps of lo).
  const r = rng(777);
  const p = new DecimalParser();
  const enc = new TextEncoder();
  let checked = 0;
  for (let i = 0; i < 50_000; i++) {
    const s = randomDecimal(r);
    const b = enc.encode(s);
    const hi = p.parse(b, 0, b.length);
    const abs = Math.abs(hi);
    if (hi === 0 || !Number.isFinite(hi) || abs < 1e-290) continue; // lo would underflow
    if (!agreesTo(s, hi, p.lo, 104)) assert.fail(`"${s}": hi ${hi}, lo ${p.lo} not within 2^-104`);
    checked++;
  }
  assert.ok(checked > 40_000, `only ${checked} values checked`);
});

Deno.test("DecimalParser lo is exactly zero for decimals that are doubles", () => {
  for (const s of ["1", "0.5", "-1024", "0.375", "1e22", "2251799813685248.5"]) {
    assert.equal(parseDecimal(s)[1], 0, s);
  }
});

Deno.test("DecimalParser lo is the exact product error for integers times large powers of ten", () => {
  // 1e23 is not a double: the nearest is 99999999999999991611392, so lo = 8388608 exactly
  // (from memory; checked against BigInt here).
  const [hi, lo] = parseDecimal("1e23");
  assert.equal(BigInt(hi) + BigInt(lo), 10n ** 23n);
  assert.equal(lo, 8388608);
});
