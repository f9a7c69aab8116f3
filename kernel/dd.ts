/**
 * Double-double building blocks, the one home of them in the kernel: the
 * error-free transformations and the double-double arithmetic built on
 * them, used by the least-squares kernels of `linalg/`, the row evaluator of
 * `expr/compile_dd.ts` and the decimal corrections of `csv/`. An error-free
 * transformation gives a rounded result and its exact rounding error, so
 * that the two doubles add up to the exact value.
 *
 * ```
 *  a + b = s + e    s = fl(a + b)   TwoSum, FastTwoSum (|a| ≥ |b|)
 *  a · b = p + e    p = fl(a · b)   TwoProduct (Veltkamp split, no FMA)
 *  a     = h + l    h, l ≤ 26 bits  split
 * ```
 *
 * Sources:
 * - TwoSum: Knuth, *The Art of Computer Programming*, vol. 2, §4.2.2
 *   (Theorem B, from memory for the number; Møller 1965). FastTwoSum:
 *   Dekker 1971, "A floating-point technique for extending the available
 *   precision", Numer. Math. 18 (the normalising step of his add2 and mul2).
 * - TwoProduct by Veltkamp's splitting: Dekker 1971, §5 (mul12). JavaScript
 *   has no fused multiply-add, so the product is split into 26-bit halves
 *   (constant 2^27 + 1) whose partial products are exact. The split
 *   overflows above about 2^996: {@link twoProduct} scales such operands by
 *   2^−64 first; the allocation-free {@link productError} leaves that to
 *   the caller.
 * - Double-double + − × ÷ √ on parts (`addDD` …), the accurate forms of the
 *   QD library's dd_real (Hida, Li & Bailey 2001, "Algorithms for
 *   quad-double precision floating point arithmetic", ARITH-15) and Shewchuk
 *   1997 (Discrete Comput. Geom. 18): relative errors of a few u²
 *   (u = 2^−53) per operation, proved by Joldes, Muller & Popescu 2017 (ACM
 *   TOMS 44; from memory).
 * - Exact dyadic value of a double from its IEEE 754 bit fields
 *   ({@link dyadic}), for exact residuals and for tests.
 *
 * Two forms: pairs (`twoSum`, `twoProduct`, `ddAdd`, … returning
 * `[hi, lo]`), simple at call sites that run a few times; and functions that
 * allocate nothing (`sumError`, `fastSumError`, `productError`, `addDD`, …
 * writing into a Float64Array), for loops. The loops of `linalg/` and
 * `expr/` call these rather than writing the steps out inline: V8 inlines
 * them, and the inline copies measured no faster.
 *
 * @module
 */

/** A double-double value hi + lo. */
export type DD = readonly [hi: number, lo: number];

// Not exported, on purpose: V8 folds a module's private constants into the
// optimised code, while an exported binding is read from memory on every
// call (measured: ddLeastSquares 10,000 × 10 took 50% longer with an
// exported SPLITTER).
/** Veltkamp's splitting constant for binary64: 2^27 + 1. */
const SPLITTER = 134217729;
/** Above this magnitude `SPLITTER · a` may overflow: operands must be scaled first. */
const SPLIT_LIMIT = 2 ** 996;

/**
 * The exact error of a rounded sum: a + b = s + e, given s = fl(a + b) (TwoSum).
 *
 * @param a First addend.
 * @param b Second addend.
 * @param s fl(a + b).
 * @returns e.
 * @example
 * ```ts
 * import { sumError } from "./dd.ts";
 * if (sumError(2 ** -60, 1, 1 + 2 ** -60) !== 2 ** -60) throw new Error("the lost part");
 * ```
 */
export function sumError(a: number, b: number, s: number): number {
  const bb = s - a;
  return (a - (s - bb)) + (b - bb);
}

/**
 * As {@link sumError} for |a| ≥ |b| (or a = 0), in three operations (FastTwoSum).
 *
 * @param a The larger addend.
 * @param b The smaller addend.
 * @param s fl(a + b).
 * @returns e with a + b = s + e.
 * @example
 * ```ts
 * import { fastSumError } from "./dd.ts";
 * if (fastSumError(1, 2 ** -60, 1) !== 2 ** -60) throw new Error("the lost part");
 * ```
 */
export function fastSumError(a: number, b: number, s: number): number {
  return b - (s - a);
}

/**
 * The exact error of a rounded product: a·b = p + e, given p = fl(a·b)
 * (Dekker's mul12 with Veltkamp's splitting), barring underflow.
 *
 * @param a First factor, |a| ≤ 2^996.
 * @param b Second factor, |b| ≤ 2^996.
 * @param p fl(a·b).
 * @returns e.
 * @example
 * ```ts
 * import { productError } from "./dd.ts";
 * const a = 1 + 2 ** -30; // a² = 1 + 2^-29 + 2^-60
 * if (productError(a, a, a * a) !== 2 ** -60) throw new Error("the lost part");
 * ```
 */
export function productError(a: number, b: number, p: number): number {
  let c = SPLITTER * a;
  const ah = c - (c - a), al = a - ah;
  c = SPLITTER * b;
  const bh = c - (c - b), bl = b - bh;
  return ((ah * bh - p) + ah * bl + al * bh) + al * bl;
}

/**
 * TwoSum: s = fl(a + b) and the exact error e, so a + b = s + e.
 *
 * @param a First addend.
 * @param b Second addend.
 * @returns [s, e].
 * @example
 * ```ts
 * import { twoSum } from "./dd.ts";
 * const [s, e] = twoSum(1, 2 ** -60);
 * if (s !== 1 || e !== 2 ** -60) throw new Error("the small part is the error");
 * ```
 */
export function twoSum(a: number, b: number): DD {
  const s = a + b;
  return [s, sumError(a, b, s)];
}

/**
 * FastTwoSum (Dekker): as {@link twoSum} but requires |a| ≥ |b| (or a = 0).
 *
 * @param a The larger addend.
 * @param b The smaller addend.
 * @returns [s, e] with a + b = s + e.
 * @example
 * ```ts
 * import { fastTwoSum } from "./dd.ts";
 * if (fastTwoSum(1, 2 ** -60)[1] !== 2 ** -60) throw new Error("unexpected");
 * ```
 */
export function fastTwoSum(a: number, b: number): DD {
  const s = a + b;
  return [s, b - (s - a)];
}

/**
 * Veltkamp split: a = hi + lo with each half fitting in 26 bits (so products of
 * halves are exact).
 *
 * @param a A finite double with |a| ≤ 2^996.
 * @returns [hi, lo].
 * @example
 * ```ts
 * import { split } from "./dd.ts";
 * const [hi, lo] = split(0.1);
 * if (hi + lo !== 0.1) throw new Error("the halves add up exactly");
 * ```
 */
export function split(a: number): DD {
  const c = SPLITTER * a;
  const hi = c - (c - a);
  return [hi, a - hi];
}

/**
 * TwoProduct (Dekker): p = fl(a·b) and the exact error e, so a·b = p + e
 * (barring underflow); operands above 2^996 are scaled by 2^−64 (exact) so the
 * split cannot overflow.
 *
 * @param a First factor.
 * @param b Second factor.
 * @returns [p, e] ([p, 0] when p is not finite).
 * @example
 * ```ts
 * import { twoProduct } from "./dd.ts";
 * const [p, e] = twoProduct(1 + 2 ** -30, 1 + 2 ** -30); // 1 + 2^-29 + 2^-60
 * if (p !== 1 + 2 ** -29 || e !== 2 ** -60) throw new Error("unexpected");
 * ```
 */
export function twoProduct(a: number, b: number): DD {
  const p = a * b;
  if (!Number.isFinite(p)) return [p, 0];
  if (Math.abs(a) > SPLIT_LIMIT || Math.abs(b) > SPLIT_LIMIT) {
    const big = Math.abs(a) > SPLIT_LIMIT;
    const [q, e] = twoProduct(big ? a * 2 ** -64 : a, big ? b : b * 2 ** -64);
    return [q * 2 ** 64, e * 2 ** 64];
  }
  return [p, productError(a, b, p)];
}

const bitsView = new DataView(new ArrayBuffer(8));

/**
 * The exact value of a finite double as m·2^e, read from its IEEE 754 bit
 * fields (subnormals included): the form exact residuals are computed in.
 *
 * @param x A finite double.
 * @returns [m, e] with x = m·2^e exactly (m signed; 0 gives [0n, -1074]).
 * @example
 * ```ts
 * import { dyadic } from "./dd.ts";
 * const [m, e] = dyadic(-0.75); // −3·2^51 · 2^−53
 * if (m !== -(3n << 51n) || e !== -53) throw new Error(`${m} ${e}`);
 * ```
 */
export function dyadic(x: number): [m: bigint, e: number] {
  bitsView.setFloat64(0, Math.abs(x));
  const bits = bitsView.getBigUint64(0);
  const be = Number(bits >> 52n);
  const frac = bits & 0xfffffffffffffn;
  const [m, e] = be === 0 ? [frac, -1074] : [frac | (1n << 52n), be - 1075];
  return [x < 0 ? -m : m, e];
}

// ---- double-double arithmetic on parts ------------------------------------------------
//
// Each routine takes its operands as hi, lo numbers and writes the normalised
// result into r[0], r[1], allocating nothing. A non-finite hi gives lo = 0.

/** Normalises s + e into r (FastTwoSum), with lo = 0 when the sum is not finite. */
function put(r: Float64Array, s: number, e: number): void {
  const h = s + e;
  r[0] = h;
  r[1] = Number.isFinite(h) ? fastSumError(s, e, h) : 0;
}

/**
 * r = a + b in double-double (the accurate form: both parts summed with
 * TwoSum; QD's dd_real, Hida, Li & Bailey 2001).
 *
 * @param ah High part of a.
 * @param al Low part of a.
 * @param bh High part of b.
 * @param bl Low part of b.
 * @param r Receives [hi, lo].
 * @example
 * ```ts
 * import { addDD } from "./dd.ts";
 * const r = new Float64Array(2);
 * addDD(1, 2 ** -70, 2 ** -60, 0, r);
 * if (r[0] !== 1 || r[1] !== 2 ** -60 + 2 ** -70) throw new Error(`${r}`);
 * ```
 */
export function addDD(ah: number, al: number, bh: number, bl: number, r: Float64Array): void {
  const s = ah + bh;
  if (!Number.isFinite(s)) return void (r[0] = s, r[1] = 0);
  const e = sumError(ah, bh, s);
  const t = al + bl, f = sumError(al, bl, t);
  const s1 = s + (e + t), e1 = fastSumError(s, e + t, s1);
  const s2 = s1 + (e1 + f);
  r[0] = s2;
  r[1] = Number.isFinite(s2) ? fastSumError(s1, e1 + f, s2) : 0;
}

/**
 * r = a·b in double-double (TwoProduct of the high parts plus the cross
 * terms); factors above 2^996 are scaled by 2^−64 first.
 *
 * @param ah High part of a.
 * @param al Low part of a.
 * @param bh High part of b.
 * @param bl Low part of b.
 * @param r Receives [hi, lo].
 * @example
 * ```ts
 * import { mulDD } from "./dd.ts";
 * const r = new Float64Array(2);
 * mulDD(3, 0, 1 / 3, 0, r); // fl(1/3) = 1/3 − 2^−54/3, so 3·fl(1/3) = 1 − 2^−54
 * if (r[0] !== 1 || r[1] !== -(2 ** -54)) throw new Error(`${r}`);
 * ```
 */
export function mulDD(ah: number, al: number, bh: number, bl: number, r: Float64Array): void {
  const p = ah * bh;
  if (!Number.isFinite(p)) return void (r[0] = p, r[1] = 0);
  if (Math.abs(ah) > SPLIT_LIMIT || Math.abs(bh) > SPLIT_LIMIT) {
    const big = Math.abs(ah) > SPLIT_LIMIT;
    const k = 2 ** -64;
    mulDD(big ? ah * k : ah, big ? al * k : al, big ? bh : bh * k, big ? bl : bl * k, r);
    return void (r[0] *= 2 ** 64, r[1] *= 2 ** 64);
  }
  put(r, p, productError(ah, bh, p) + (ah * bl + al * bh));
}

const T = new Float64Array(2);

/**
 * r = a/b in double-double: three partial quotients, each remainder computed
 * in double-double (QD's accurate division). ±Infinity or NaN as doubles give.
 *
 * @param ah High part of the dividend.
 * @param al Low part of the dividend.
 * @param bh High part of the divisor.
 * @param bl Low part of the divisor.
 * @param r Receives [hi, lo].
 * @example
 * ```ts
 * import { divDD, mulDD } from "./dd.ts";
 * const q = new Float64Array(2), back = new Float64Array(2);
 * divDD(1, 0, 3, 0, q);
 * mulDD(q[0], q[1], 3, 0, back);
 * if (Math.abs(back[0] - 1 + back[1]) > 1e-31) throw new Error(`${back}`);
 * ```
 */
export function divDD(ah: number, al: number, bh: number, bl: number, r: Float64Array): void {
  const q1 = ah / bh;
  if (!Number.isFinite(q1) || q1 === 0) return void (r[0] = q1, r[1] = 0);
  mulDD(bh, bl, q1, 0, T);
  addDD(ah, al, -T[0], -T[1], T);
  const rh = T[0], rl = T[1];
  const q2 = rh / bh;
  mulDD(bh, bl, q2, 0, T);
  addDD(rh, rl, -T[0], -T[1], T);
  const q3 = T[0] / bh;
  const s = q1 + q2;
  addDD(s, fastSumError(q1, q2, s), q3, 0, r);
}

/**
 * r = √a in double-double: one Newton step from 1/√hi (QD's dd_real sqrt).
 *
 * @param ah High part of a.
 * @param al Low part of a.
 * @param r Receives [hi, lo] (NaN below 0, 0 at 0).
 * @example
 * ```ts
 * import { mulDD, sqrtDD } from "./dd.ts";
 * const s = new Float64Array(2), sq = new Float64Array(2);
 * sqrtDD(2, 0, s);
 * mulDD(s[0], s[1], s[0], s[1], sq);
 * if (Math.abs(sq[0] - 2 + sq[1]) > 1e-30) throw new Error(`${sq}`);
 * ```
 */
export function sqrtDD(ah: number, al: number, r: Float64Array): void {
  if (ah <= 0 || !Number.isFinite(ah)) {
    return void (r[0] = ah === 0 ? 0 : ah === Infinity ? Infinity : NaN, r[1] = 0);
  }
  const x = 1 / Math.sqrt(ah);
  const ax = ah * x;
  addDD(ah, al, -(ax * ax), -productError(ax, ax, ax * ax), T);
  put(r, ax, T[0] * x * 0.5);
}

// ---- the same on [hi, lo] pairs, for call sites that run a few times -------------------

const P = new Float64Array(2);

/**
 * Double-double sum x + y on pairs ({@link addDD}).
 *
 * @param x First addend.
 * @param y Second addend.
 * @returns The normalised sum.
 * @example
 * ```ts
 * import { ddAdd } from "./dd.ts";
 * const s = ddAdd([1, 2 ** -70], [2 ** -60, 0]);
 * if (s[0] !== 1 || s[1] !== 2 ** -60 + 2 ** -70) throw new Error("unexpected");
 * ```
 */
export function ddAdd(x: DD, y: DD): DD {
  addDD(x[0], x[1], y[0], y[1], P);
  return [P[0], P[1]];
}

/**
 * Double-double product x·y on pairs ({@link mulDD}).
 *
 * @param x First factor.
 * @param y Second factor.
 * @returns The normalised product.
 * @example
 * ```ts
 * import { ddMul } from "./dd.ts";
 * const p = ddMul([3, 0], [1 / 3, 0]); // 1 − 2^−54 exactly
 * if (p[0] !== 1 || p[1] !== -(2 ** -54)) throw new Error("unexpected");
 * ```
 */
export function ddMul(x: DD, y: DD): DD {
  mulDD(x[0], x[1], y[0], y[1], P);
  return [P[0], P[1]];
}

/**
 * Double-double quotient x/y on pairs ({@link divDD}).
 *
 * @param x Dividend.
 * @param y Divisor.
 * @returns The normalised quotient (±Infinity or NaN as doubles would give).
 * @example
 * ```ts
 * import { ddDiv, ddMul } from "./dd.ts";
 * const back = ddMul(ddDiv([1, 0], [3, 0]), [3, 0]);
 * if (Math.abs(back[0] - 1 + back[1]) > 1e-31) throw new Error("unexpected");
 * ```
 */
export function ddDiv(x: DD, y: DD): DD {
  divDD(x[0], x[1], y[0], y[1], P);
  return [P[0], P[1]];
}

/**
 * Double-double square root on pairs ({@link sqrtDD}).
 *
 * @param x A non-negative value.
 * @returns √x (NaN for negative x, 0 for 0).
 * @example
 * ```ts
 * import { ddMul, ddSqrt } from "./dd.ts";
 * const r = ddSqrt([2, 0]);
 * const sq = ddMul(r, r);
 * if (Math.abs(sq[0] - 2 + sq[1]) > 1e-30) throw new Error("unexpected");
 * ```
 */
export function ddSqrt(x: DD): DD {
  sqrtDD(x[0], x[1], P);
  return [P[0], P[1]];
}

/**
 * The double-double nearest a double (lo = 0), for symmetry of call sites.
 *
 * @param a A double.
 * @returns [a, 0].
 * @example
 * ```ts
 * import { dd } from "./dd.ts";
 * if (dd(0.5)[1] !== 0) throw new Error("unexpected");
 * ```
 */
export function dd(a: number): DD {
  return [a, 0];
}
