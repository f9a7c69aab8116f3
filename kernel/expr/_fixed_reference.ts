/**
 * Test support: a 320-bit binary fixed-point reference for the double-double
 * evaluator. Values are BigInts scaled by 2^320; doubles convert exactly.
 * The functions are the plainest textbook series (common practice, no
 * source): exp by halving and squaring, log by Newton on exp, sin/cos by
 * Taylor series after reduction by 2π (Machin's π), atan by argument halving
 * atan x = 2·atan(x/(1 + √(1 + x²))) and its Taylor series. Independent of
 * the algorithms in `_dd_math.ts` apart from Machin's formula for π.
 *
 * @module
 */

/** Fraction bits. */
export const S = 320n;
/** 1 in fixed point. */
export const ONE = 1n << S;

/** The exact fixed-point value of a double (truncated below 2^−320). */
export function fromDouble(x: number): bigint {
  if (x === 0) return 0n;
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const sign = bits >> 63n ? -1n : 1n;
  const exponent = Number((bits >> 52n) & 0x7ffn);
  let mant = bits & ((1n << 52n) - 1n);
  let e = exponent - 1075;
  if (exponent === 0) e = -1074;
  else mant |= 1n << 52n;
  const shift = BigInt(e) + S;
  return sign * (shift >= 0n ? mant << shift : mant >> -shift);
}

/** hi + lo in fixed point. */
export function fromDD(hi: number, lo: number): bigint {
  return fromDouble(hi) + fromDouble(lo);
}

/** Fixed-point product. */
export function mul(a: bigint, b: bigint): bigint {
  return (a * b) >> S;
}

/** Fixed-point quotient. */
export function div(a: bigint, b: bigint): bigint {
  return (a << S) / b;
}

/** Relative error |approx − ref|/|ref| as a double. */
export function relError(approx: bigint, ref: bigint): number {
  const d = approx > ref ? approx - ref : ref - approx;
  const r = ref < 0n ? -ref : ref;
  return Number((d << 200n) / r) * 2 ** -200;
}

function sqrtFixed(a: bigint): bigint {
  if (a <= 0n) return 0n;
  const n = a << S;
  let x = BigInt(Math.floor(Math.sqrt(Number(a) * 2 ** -Number(S)) * 2 ** 50)) << (S - 50n);
  for (let i = 0; i < 12; i++) x = (x + n / x) >> 1n;
  return x;
}

function atanInv(q: bigint): bigint {
  let sum = 0n, pow = ONE / q, k = 1n, sign = 1n;
  while (pow !== 0n) {
    sum += sign * (pow / k);
    pow /= q * q;
    k += 2n;
    sign = -sign;
  }
  return sum;
}

/** π (Machin). */
export const PI = 4n * (4n * atanInv(5n) - atanInv(239n));

/** e^x for |x| < 700. */
export function exp(x: bigint): bigint {
  if (x < 0n) return div(ONE, exp(-x));
  const m = 24n;
  const r = x >> m;
  let sum = ONE, term = ONE;
  for (let k = 1n; term !== 0n; k++) {
    term = mul(term, r) / k;
    sum += term;
  }
  for (let i = 0n; i < m; i++) sum = mul(sum, sum);
  return sum;
}

/** ln x for x > 0 (Newton on exp from the double logarithm). */
export function log(x: bigint): bigint {
  let y = fromDouble(Math.log(Number(x) * 2 ** -Number(S)));
  for (let i = 0; i < 6; i++) {
    const ey = exp(y);
    y += div(2n * (x - ey), x + ey);
  }
  return y;
}

/** sin and cos of x. */
export function sinCos(x: bigint): [bigint, bigint] {
  const twoPi = 2n * PI;
  let t = x % twoPi;
  if (t > PI) t -= twoPi;
  if (t < -PI) t += twoPi;
  let s = 0n, c = 0n, term = ONE;
  for (let k = 0n; term !== 0n; k++) {
    if (k % 4n === 0n) c += term;
    else if (k % 4n === 1n) s += term;
    else if (k % 4n === 2n) c -= term;
    else s -= term;
    term = mul(term, t) / (k + 1n);
  }
  return [s, c];
}

/** atan x. */
export function atan(x: bigint): bigint {
  if (x < 0n) return -atan(-x);
  if (x > ONE) return PI / 2n - atan(div(ONE, x));
  let t = x;
  for (let i = 0; i < 8; i++) t = div(t, ONE + sqrtFixed(ONE + mul(t, t)));
  let sum = 0n, pow = t, k = 1n, sign = 1n;
  const t2 = mul(t, t);
  while (pow !== 0n) {
    sum += sign * (pow / k);
    pow = mul(pow, t2);
    k += 2n;
    sign = -sign;
  }
  return sum << 8n;
}
