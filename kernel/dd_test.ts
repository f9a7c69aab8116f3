import assert from "node:assert/strict";
import {
  type DD,
  ddAdd,
  ddDiv,
  ddMul,
  ddSqrt,
  dyadic,
  fastSumError,
  productError,
  split,
  sumError,
  twoProduct,
  twoSum,
} from "./dd.ts";
import { seededRandom } from "./random.ts";

// ---------------------------------------------------------------------------
// Exact dyadic rationals m·2^e (every double is one) for reference values.

interface Exact {
  m: bigint;
  e: number;
}
function exact(x: number): Exact {
  const [m, e] = dyadic(x);
  return { m, e };
}
function add(a: Exact, b: Exact): Exact {
  const e = Math.min(a.e, b.e);
  return { m: (a.m << BigInt(a.e - e)) + (b.m << BigInt(b.e - e)), e };
}
function mul(a: Exact, b: Exact): Exact {
  return { m: a.m * b.m, e: a.e + b.e };
}
const exactDD = (x: DD) => add(exact(x[0]), exact(x[1]));
const isZero = (a: Exact) => a.m === 0n;
const neg = (a: Exact): Exact => ({ m: -a.m, e: a.e });
/** |a − b| / |b| as a double (b ≠ 0). */
function relErr(a: Exact, b: Exact): number {
  const d = add(a, { m: -b.m, e: b.e });
  if (d.m === 0n) return 0;
  const bits = (v: bigint) => (v < 0n ? -v : v).toString(2).length;
  // ratio ≈ 2^(log2|d| − log2|b|), to a few bits: plenty for bounds like 1e-31
  const top = (v: bigint, n: number) => Number((v < 0n ? -v : v) >> BigInt(Math.max(0, n - 53)));
  const ld = Math.log2(top(d.m, bits(d.m))) + Math.max(0, bits(d.m) - 53) + d.e;
  const lb = Math.log2(top(b.m, bits(b.m))) + Math.max(0, bits(b.m) - 53) + b.e;
  return 2 ** (ld - lb);
}

const U2 = 2 ** -106; // u² with u = 2^-53
const rnd = seededRandom(1971);
/** Seeded doubles spread over 2^−40 … 2^40 with random signs. */
function sample(): number {
  return (rnd() < 0.5 ? -1 : 1) * (1 + rnd()) * 2 ** Math.floor(80 * rnd() - 40);
}

Deno.test("twoSum() and twoProduct() are error-free: s + e equals a + b, p + e equals a·b", () => {
  // Exactness theorems of Knuth/Møller (TwoSum) and Dekker 1971 (TwoProduct), checked in exact integers.
  for (let k = 0; k < 2000; k++) {
    const a = sample(), b = sample();
    const s = twoSum(a, b);
    assert.ok(
      isZero(add(exactDD(s), { m: -add(exact(a), exact(b)).m, e: add(exact(a), exact(b)).e })),
      `sum ${a} ${b}`,
    );
    const p = twoProduct(a, b);
    assert.equal(relErr(exactDD(p), mul(exact(a), exact(b))), 0, `product ${a} ${b}`);
  }
  // Large operands go through the pre-scaling path.
  const p = twoProduct(2 ** 1000 * 1.5, 1 + 2 ** -40);
  assert.equal(relErr(exactDD(p), mul(exact(2 ** 1000 * 1.5), exact(1 + 2 ** -40))), 0);
});

Deno.test("sumError(), fastSumError() and productError() give the exact error of s and p", () => {
  // Same theorems (Knuth TAOCP vol. 2 §4.2.2; Dekker 1971), checked in exact integers.
  const sumExact = (a: number, b: number, s: number, e: number) =>
    isZero(add(add(exact(s), exact(e)), neg(add(exact(a), exact(b)))));
  for (let k = 0; k < 2000; k++) {
    const a = sample(), b = sample();
    assert.ok(sumExact(a, b, a + b, sumError(a, b, a + b)), `sum ${a} ${b}`);
    const [big, small] = Math.abs(a) >= Math.abs(b) ? [a, b] : [b, a];
    assert.ok(sumExact(big, small, a + b, fastSumError(big, small, a + b)), `fast ${a} ${b}`);
    const p = a * b, e = productError(a, b, p);
    assert.ok(
      isZero(add(add(exact(p), exact(e)), neg(mul(exact(a), exact(b))))),
      `product ${a} ${b}`,
    );
  }
});

Deno.test("dyadic() reads the exact value m·2^e of normal and subnormal doubles", () => {
  // Exact arithmetic: 0.1 is 0x1.999999999999ap−4 = 7205759403792794·2^−56 in binary64; 2^−1074 is
  // the least subnormal.
  assert.deepEqual(dyadic(0.1), [7205759403792794n, -56]);
  assert.deepEqual(dyadic(-(2 ** -1074)), [-1n, -1074]);
  assert.deepEqual(dyadic(0), [0n, -1074]);
});

Deno.test("split() gives halves that add up exactly and fit in 26 bits", () => {
  for (let k = 0; k < 500; k++) {
    const a = sample();
    const [hi, lo] = split(a);
    assert.equal(hi + lo, a);
    assert.ok(exact(hi).m.toString(2).replace(/0+$/, "").length <= 27, `hi of ${a}`);
  }
});

Deno.test("ddAdd() and ddMul() are accurate to a few u² relative", () => {
  // Bounds: 3u² (accurate addition) and 5u² (multiplication) per Joldes, Muller &
  // Popescu 2017 (from memory); we allow 4u² and 8u².
  for (let k = 0; k < 2000; k++) {
    const x = twoSum(sample(), sample() * 2 ** -60), y = twoSum(sample(), sample() * 2 ** -60);
    const s = ddAdd(x, y), want = add(exactDD(x), exactDD(y));
    if (!isZero(want)) assert.ok(relErr(exactDD(s), want) <= 4 * U2, `add ${x} ${y}`);
    const p = ddMul(x, y);
    assert.ok(relErr(exactDD(p), mul(exactDD(x), exactDD(y))) <= 8 * U2, `mul ${x} ${y}`);
  }
});

Deno.test("ddDiv() and ddSqrt() leave residuals q·y − x and r² − x of order u²", () => {
  // q·y and r·r are exact in the dyadic rationals, so the residual measures the error;
  // the published bounds are ~15u² (division, Joldes et al. 2017, from memory), we allow 20u².
  for (let k = 0; k < 1000; k++) {
    const x = twoSum(sample(), sample() * 2 ** -60), y = twoSum(sample(), sample() * 2 ** -60);
    const q = ddDiv(x, y);
    assert.ok(relErr(mul(exactDD(q), exactDD(y)), exactDD(x)) <= 20 * U2, `div ${x} / ${y}`);
    const ax: DD = [Math.abs(x[0]), Math.sign(x[0]) * x[1]];
    const r = ddSqrt(ax);
    assert.ok(relErr(mul(exactDD(r), exactDD(r)), exactDD(ax)) <= 20 * U2, `sqrt ${ax}`);
  }
  assert.deepEqual(ddSqrt([0, 0]), [0, 0]);
  assert.ok(Number.isNaN(ddSqrt([-1, 0])[0]));
});

Deno.test("ddDiv() gives 1/3 to double-double precision", () => {
  // 1/3 = fl(1/3) + (1 − 3·fl(1/3))/3 and 1 − 3·fl(1/3) = 2^−54 (hand computation),
  // so lo = 2^−54/3 rounded: 1/3 − hi = 1.850371707708594e-17 (from that formula).
  const [hi, lo] = ddDiv([1, 0], [3, 0]);
  assert.equal(hi, 1 / 3);
  assert.equal(lo, 2 ** -54 / 3);
});
