/**
 * Double-double ("double-word") arithmetic: a value is the unevaluated sum
 * hi + lo of two doubles with |lo| ≤ ulp(hi)/2, about 106 bits (≈ 32 digits).
 *
 * Methods:
 * - TwoSum (Knuth, *TAOCP* vol. 2, §4.2.2; Møller 1965) and FastTwoSum
 *   (Dekker 1971, "A floating-point technique for extending the available
 *   precision", Numer. Math. 18): a + b = s + e exactly.
 * - TwoProduct by Veltkamp splitting (Dekker 1971): a·b = p + e exactly,
 *   without a fused multiply-add (JavaScript has none). The split constant is
 *   2^27 + 1; operands above 2^996 are pre-scaled so the split cannot overflow.
 * - Addition (the accurate, two-TwoSum form), multiplication, division and
 *   square root as in Shewchuk 1997 ("Adaptive precision floating-point
 *   arithmetic and fast robust geometric predicates", Discrete Comput. Geom.
 *   18) and the QD library's double-double (Hida, Li & Bailey 2001); relative
 *   error bounds of a few u² (u = 2^−53) per operation are proved by Joldes,
 *   Muller & Popescu 2017 (ACM TOMS 44), from memory.
 *
 * Representation: a `DD` is a `[hi, lo]` pair. Simple and allocation-heavy; a
 * least-squares kernel in double-double should keep hi and lo in two parallel
 * Float64Arrays (the data layout of the double path) and inline these steps.
 *
 * @module
 */

/** A double-double value hi + lo. */
export type DD = readonly [hi: number, lo: number];

const SPLITTER = 134217729; // 2^27 + 1
const SPLIT_LIMIT = 2 ** 996;

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
  const bb = s - a;
  return [s, (a - (s - bb)) + (b - bb)];
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
 * (barring underflow).
 *
 * @param a First factor.
 * @param b Second factor.
 * @returns [p, e].
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
    // Scale the large operand down by 2^−64 (exact), then scale the result back.
    const big = Math.abs(a) > SPLIT_LIMIT;
    const [q, e] = twoProduct(big ? a * 2 ** -64 : a, big ? b : b * 2 ** -64);
    return [q * 2 ** 64, e * 2 ** 64];
  }
  const [ah, al] = split(a), [bh, bl] = split(b);
  return [p, ((ah * bh - p) + ah * bl + al * bh) + al * bl];
}

/**
 * Double-double sum x + y (accurate form: both parts summed with TwoSum).
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
  const [s, e] = twoSum(x[0], y[0]);
  const [t, f] = twoSum(x[1], y[1]);
  const [s1, e1] = fastTwoSum(s, e + t);
  return fastTwoSum(s1, e1 + f);
}

/**
 * Double-double product x·y.
 *
 * @param x First factor.
 * @param y Second factor.
 * @returns The normalised product.
 * @example
 * ```ts
 * import { ddMul } from "./dd.ts";
 * // fl(1/3) = 1/3 − 2^−54/3, so 3·fl(1/3) = 1 − 2^−54 exactly
 * const p = ddMul([3, 0], [1 / 3, 0]);
 * if (p[0] !== 1 || p[1] !== -(2 ** -54)) throw new Error("unexpected");
 * ```
 */
export function ddMul(x: DD, y: DD): DD {
  const [p, e] = twoProduct(x[0], y[0]);
  return fastTwoSum(p, e + (x[0] * y[1] + x[1] * y[0]));
}

/**
 * Double-double quotient x/y: a first quotient, its remainder computed in
 * double-double, and one correction (long division in base 2^53).
 *
 * @param x Dividend.
 * @param y Divisor (not zero).
 * @returns The normalised quotient (±Infinity or NaN as doubles would give).
 * @example
 * ```ts
 * import { ddDiv, ddMul } from "./dd.ts";
 * const third = ddDiv([1, 0], [3, 0]);
 * const back = ddMul(third, [3, 0]);
 * if (Math.abs(back[0] - 1 + back[1]) > 1e-31) throw new Error("unexpected");
 * ```
 */
export function ddDiv(x: DD, y: DD): DD {
  const q1 = x[0] / y[0];
  if (!Number.isFinite(q1)) return [q1, 0];
  const r = ddAdd(x, neg(ddMul(y, [q1, 0])));
  const q2 = r[0] / y[0];
  const r2 = ddAdd(r, neg(ddMul(y, [q2, 0])));
  const q3 = r2[0] / y[0];
  const [s, e] = fastTwoSum(q1, q2);
  return ddAdd([s, e], [q3, 0]);
}

/**
 * Double-double square root: the double root refined by one Newton step
 * carried out in double-double (Karp & Markstein 1997 form, from memory).
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
  if (x[0] <= 0) return [x[0] === 0 ? 0 : NaN, 0];
  const s = Math.sqrt(x[0]);
  // x − s² exactly enough, then s + (x − s²)/(2s)
  const r = ddAdd(x, neg(twoProduct(s, s)));
  return fastTwoSum(s, r[0] / (2 * s));
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

function neg(x: DD): DD {
  return [-x[0], -x[1]];
}
