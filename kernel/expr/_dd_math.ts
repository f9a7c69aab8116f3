/**
 * Scalar double-double ("double-word") arithmetic and elementary functions,
 * allocation-free: every routine takes the parts of its operands as numbers
 * and writes the normalised result hi + lo into `r[0]`, `r[1]`.
 *
 * Sources:
 * - TwoSum (Knuth, *TAOCP* vol. 2, §4.2.2), FastTwoSum and TwoProduct by
 *   Veltkamp splitting (Dekker 1971, "A floating-point technique for
 *   extending the available precision", Numer. Math. 18), from their one
 *   home `kernel/dd.ts`.
 * - Addition (accurate two-TwoSum form), multiplication, division (three
 *   partial quotients) and square root (one Newton step from 1/√hi) as in
 *   the QD library's dd_real (Hida, Li & Bailey 2001, "Algorithms for
 *   quad-double precision floating point arithmetic", ARITH-15).
 * - exp: reduction by m·ln 2 and by two tables, e^(j/64) and e^(k/4096),
 *   then a short series (Tang 1989, ACM TOMS 15, table-driven exp, in
 *   double-double; QD's reduction by 2⁹ and nine squarings took three times
 *   as long).
 * - log: one Newton step x + a·e^(−x) − 1 from the double logarithm (QD).
 * - sin, cos: reduction by π/2 with a three-part π/2, then Taylor series on
 *   [−π/4, π/4] (QD reduces further by π/16 with a table; we take more terms
 *   instead).
 * - atan: from z₀ = atan(hi) in double, the exact identity
 *   atan(a) = z₀ + atan((a·cos z₀ − sin z₀)/(cos z₀ + a·sin z₀)), whose
 *   correction d ≈ 1e−16 has atan(d) = d to 1e−48 (a variant of QD's
 *   Newton step on tan).
 * - tanh: sinh by Taylor series for |x| < 0.05, else (1 − e^(−2|x|))/(1 + e^(−2|x|)).
 *
 * Accuracy, measured against 200-bit references (compile_dd_test.ts): about
 * 1e−31 relative for + − × ÷ √, 1e−30 for exp, log, sin, cos, tan, atan,
 * tanh on well-conditioned arguments; exp(x) loses |x|·1e−32 more through
 * the reduction by m·ln 2 (2e−30 at x = 700). Reduction of sin/cos loses
 * about log₁₀|x/π| digits beyond 1e6.
 *
 * @module
 */
import { addDD as add, divDD as div, mulDD as mul, productError, sqrtDD as sqrt } from "../dd.ts";

/** Holds one double-double result: `[hi, lo]`. */
export type Out = Float64Array;

// + − × ÷ √ on parts are the home's (kernel/dd.ts), under the names this file's routines use.
export { add, div, mul, sqrt };

const T = new Float64Array(2);

/** r = a^k for an integer k, by binary powering (exact products in DD). */
export function powInt(ah: number, al: number, k: number, r: Out): void {
  let n = Math.abs(k);
  let bh = ah, bl = al, ph = 1, pl = 0;
  while (n > 0) {
    if (n % 2 === 1) {
      mul(ph, pl, bh, bl, T);
      ph = T[0], pl = T[1];
    }
    n = Math.floor(n / 2);
    if (n > 0) {
      mul(bh, bl, bh, bl, T);
      bh = T[0], bl = T[1];
    }
  }
  if (k < 0) div(1, 0, ph, pl, r);
  else r[0] = ph, r[1] = pl;
}

// ---- constants, derived once from 240-bit fixed-point series -------------------------

const BITS = 240n;
const ONE = 1n << BITS;

/** atan(1/q) in fixed point, by its Taylor series (q ≥ 2). */
function atanInverse(q: bigint): bigint {
  let sum = 0n, pow = ONE / q, k = 1n, sign = 1n;
  const q2 = q * q;
  while (pow !== 0n) {
    sum += sign * (pow / k);
    pow /= q2;
    k += 2n;
    sign = -sign;
  }
  return sum;
}

/** ln((1 + 1/q)/(1 − 1/q)) / 2 = atanh(1/q) in fixed point. */
function atanhInverse(q: bigint): bigint {
  let sum = 0n, pow = ONE / q, k = 1n;
  const q2 = q * q;
  while (pow !== 0n) {
    sum += pow / k;
    pow /= q2;
    k += 2n;
  }
  return sum;
}

/** A fixed-point value (scale 2^BITS) rounded to a double-double. */
function fromFixed(x: bigint): [number, number] {
  const scale = 2 ** -Number(BITS);
  const hi = Number(x) * scale;
  const rest = x - BigInt(hi / scale);
  return [hi, Number(rest) * scale];
}

// Machin: π/4 = 4·atan(1/5) − atan(1/239). ln 2 = 2·atanh(1/3). ln 10 = 3 ln 2 + 2·atanh(1/9).
const PI_FIXED = 4n * (4n * atanInverse(5n) - atanInverse(239n));
const LN2_FIXED = 2n * atanhInverse(3n);
const LN10_FIXED = 3n * LN2_FIXED + 2n * atanhInverse(9n);

/** π as a double-double. */
export const PI: readonly [number, number] = fromFixed(PI_FIXED);
/** Euler's number e as a double-double (Σ 1/k!). */
export const E: readonly [number, number] = (() => {
  let sum = 0n, term = ONE, k = 1n;
  while (term !== 0n) {
    sum += term;
    term /= k++;
  }
  return fromFixed(sum);
})();
/** ln 2 as a double-double. */
export const LN2: readonly [number, number] = fromFixed(LN2_FIXED);
/** ln 10 as a double-double. */
export const LN10: readonly [number, number] = fromFixed(LN10_FIXED);

// π/2 in three parts: the double-double and the next 53 bits, for reduction.
const PIO2_1 = fromFixed(PI_FIXED / 2n);
const PIO2_3 = Number(PI_FIXED / 2n - BigInt(PIO2_1[0] * 2 ** 240) - BigInt(PIO2_1[1] * 2 ** 240)) *
  2 ** -240;

/** 1/k! for k = 0 … 30 as double-doubles. */
const INV_FACT: [number, number][] = (() => {
  const out: [number, number][] = [];
  let f = 1n;
  for (let k = 0; k <= 30; k++) {
    if (k > 0) f *= BigInt(k);
    out.push(fromFixed(ONE / f));
  }
  return out;
})();

// ---- elementary functions ----------------------------------------------------------------

/** e^(num/den) in fixed point, by its Taylor series (|num/den| ≤ 1). */
function expFixed(num: bigint, den: bigint): bigint {
  let sum = 0n, term = ONE, k = 1n;
  while (term !== 0n) {
    sum += term;
    term = (term * num) / (den * k++);
  }
  return sum;
}

/** e^(j/den) for j = −half … half as double-doubles, by exact fixed-point powers. */
function expTable(den: bigint, half: number): [number, number][] {
  const up = expFixed(1n, den), down = expFixed(-1n, den);
  const out: [number, number][] = new Array(2 * half + 1);
  out[half] = [1, 0];
  for (let j = 1, pu = ONE, pd = ONE; j <= half; j++) {
    pu = (pu * up) >> BITS;
    pd = (pd * down) >> BITS;
    out[half + j] = fromFixed(pu);
    out[half - j] = fromFixed(pd);
  }
  return out;
}

// Reduction tables of exp: e^(j/64) for |j| ≤ 22 (|a − m·ln 2| ≤ ln2/2 < 22.5/64) and
// e^(k/4096) for |k| ≤ 32 (what is left, ≤ 1/128, is within 32.5/4096).
const EXP_64 = expTable(64n, 22);
const EXP_4096 = expTable(4096n, 32);
// 1/4! … 1/7! as doubles (their terms are below 1e−17).
const [C4, C5, C6, C7] = [4, 5, 6, 7].map((k) => INV_FACT[k][0]);

/**
 * r = e^a. Reduced as e^a = 2^m · e^(j/64) · e^(k/4096) · e^t with |t| ≤ 1/8192
 * (Tang 1989, "Table-driven implementation of the exponential function in
 * IEEE floating-point arithmetic", ACM TOMS 15, carried to double-double;
 * from memory for the reference): e^t − 1 = t + t²/2 + t³/6 in double-double
 * and t⁴/4! + … + t⁷/7! in double (below 1e−17, so their rounding is below
 * 1e−33; t⁸/8! < 1.2e−36 is left out).
 */
export function exp(ah: number, al: number, r: Out): void {
  if (Number.isNaN(ah)) return void (r[0] = NaN, r[1] = 0);
  if (ah > 709.79) return void (r[0] = Infinity, r[1] = 0);
  if (ah < -745.2) return void (r[0] = 0, r[1] = 0);
  if (ah === 0 && al === 0) return void (r[0] = 1, r[1] = 0);
  const m = Math.floor(ah / LN2[0] + 0.5);
  // a − m·ln 2, then less j/64 and k/4096 (exact doubles)
  mul(LN2[0], LN2[1], m, 0, T);
  add(ah, al, -T[0], -T[1], T);
  const j = Math.round(T[0] * 64);
  add(T[0], T[1], -j / 64, 0, T);
  const k = Math.round(T[0] * 4096);
  add(T[0], T[1], -k / 4096, 0, T);
  const th = T[0], tl = T[1];
  // s = e^t − 1
  mul(th, tl, th, tl, T);
  const p2h = T[0], p2l = T[1];
  mul(p2h, p2l, th, tl, T);
  mul(T[0], T[1], INV_FACT[3][0], INV_FACT[3][1], T);
  const p3h = T[0], p3l = T[1];
  add(th, tl, 0.5 * p2h, 0.5 * p2l, T);
  add(T[0], T[1], p3h, p3l, T);
  const t2 = th * th;
  add(T[0], T[1], t2 * t2 * (C4 + th * (C5 + th * (C6 + th * C7))), 0, T);
  // e^t · e^(k/4096) · e^(j/64)
  add(1, 0, T[0], T[1], T);
  const ek = EXP_4096[k + 32], ej = EXP_64[j + 22];
  mul(T[0], T[1], ek[0], ek[1], T);
  mul(T[0], T[1], ej[0], ej[1], T);
  // × 2^m in two exact steps (2^m alone may overflow or underflow)
  const m1 = Math.trunc(m / 2), f1 = 2 ** m1, f2 = 2 ** (m - m1);
  r[0] = T[0] * f1 * f2;
  r[1] = Number.isFinite(r[0]) ? T[1] * f1 * f2 : 0;
}

/** r = ln a (NaN below 0, −Infinity at 0). */
export function log(ah: number, al: number, r: Out): void {
  if (!(ah > 0) || ah === Infinity) {
    return void (r[0] = ah === 0 ? -Infinity : ah === Infinity ? Infinity : NaN, r[1] = 0);
  }
  const x = Math.log(ah);
  exp(-x, 0, r);
  mul(ah, al, r[0], r[1], r);
  add(r[0], r[1], -1, 0, r);
  add(x, 0, r[0], r[1], r);
}

/** Taylor sums on |t| ≤ π/4 into SC = [sin hi, sin lo, cos hi, cos lo]. */
const SC = new Float64Array(4);
function sinCosReduced(th: number, tl: number): void {
  let sh = th, sl = tl, ch = 1, cl = 0, ph = th, pl = tl; // ph = t^k
  let sign = -1;
  for (let k = 2; k < 30; k += 2) {
    // cos term t^k/k!
    mul(ph, pl, th, tl, T);
    ph = T[0], pl = T[1];
    mul(ph, pl, INV_FACT[k][0], INV_FACT[k][1], T);
    const c = T[0];
    add(ch, cl, sign * T[0], sign * T[1], T);
    ch = T[0], cl = T[1];
    // sin term t^(k+1)/(k+1)!
    mul(ph, pl, th, tl, T);
    ph = T[0], pl = T[1];
    mul(ph, pl, INV_FACT[k + 1][0], INV_FACT[k + 1][1], T);
    add(sh, sl, sign * T[0], sign * T[1], T);
    sh = T[0], sl = T[1];
    sign = -sign;
    if (Math.abs(c) < 1e-35) break;
  }
  SC[0] = sh, SC[1] = sl, SC[2] = ch, SC[3] = cl;
}

/** Reduces a by π/2 into SC (sin, cos of the reduced argument) and returns j mod 4. */
function sinCos(ah: number, al: number): number {
  const j = Math.round(ah / PIO2_1[0]);
  // a − j·π/2 with each j·part an exact TwoProduct, so the cancellation is exact
  const p1 = PIO2_1[0] * j, p2 = PIO2_1[1] * j;
  add(ah, al, -p1, -productError(PIO2_1[0], j, p1), T);
  add(T[0], T[1], -p2, -productError(PIO2_1[1], j, p2), T);
  add(T[0], T[1], -(PIO2_3 * j), 0, T);
  sinCosReduced(T[0], T[1]);
  return ((j % 4) + 4) % 4;
}

/** r = sin a. */
export function sin(ah: number, al: number, r: Out): void {
  if (!Number.isFinite(ah)) return void (r[0] = NaN, r[1] = 0);
  if (ah === 0) return void (r[0] = ah, r[1] = 0);
  const q = sinCos(ah, al);
  const k = q % 2 === 0 ? 0 : 2, s = q >= 2 ? -1 : 1;
  r[0] = s * SC[k], r[1] = s * SC[k + 1];
}

/** r = cos a. */
export function cos(ah: number, al: number, r: Out): void {
  if (!Number.isFinite(ah)) return void (r[0] = NaN, r[1] = 0);
  const q = sinCos(ah, al);
  const k = q % 2 === 0 ? 2 : 0, s = q === 1 || q === 2 ? -1 : 1;
  r[0] = s * SC[k], r[1] = s * SC[k + 1];
}

/** r = tan a. */
export function tan(ah: number, al: number, r: Out): void {
  if (!Number.isFinite(ah)) return void (r[0] = NaN, r[1] = 0);
  if (ah === 0) return void (r[0] = ah, r[1] = 0);
  const q = sinCos(ah, al);
  if (q % 2 === 0) div(SC[0], SC[1], SC[2], SC[3], r);
  else div(-SC[2], -SC[3], SC[0], SC[1], r);
}

/** r = atan a. */
export function atan(ah: number, al: number, r: Out): void {
  if (Number.isNaN(ah)) return void (r[0] = NaN, r[1] = 0);
  if (!Number.isFinite(ah)) {
    return void (r[0] = Math.sign(ah) * PIO2_1[0], r[1] = Math.sign(ah) * PIO2_1[1]);
  }
  if (ah === 0) return void (r[0] = ah, r[1] = 0);
  const z = Math.atan(ah);
  sinCos(z, 0); // |z| < π/2 + tiny, so j ∈ {−1, 0, 1}
  const q = Math.round(z / PIO2_1[0]);
  let sh = SC[0], sl = SC[1], ch = SC[2], cl = SC[3];
  if (q !== 0) [sh, sl, ch, cl] = [q * ch, q * cl, -q * sh, -q * sl];
  // d = (a·c − s)/(c + a·s)
  mul(ah, al, ch, cl, T);
  add(T[0], T[1], -sh, -sl, T);
  const nh = T[0], nl = T[1];
  mul(ah, al, sh, sl, T);
  add(T[0], T[1], ch, cl, T);
  div(nh, nl, T[0], T[1], T);
  add(z, 0, T[0], T[1], r);
}

/** r = tanh a. */
export function tanh(ah: number, al: number, r: Out): void {
  if (Number.isNaN(ah)) return void (r[0] = NaN, r[1] = 0);
  if (ah === 0) return void (r[0] = ah, r[1] = 0);
  const neg = ah < 0;
  const xh = neg ? -ah : ah, xl = neg ? -al : al;
  if (xh > 40) {
    // tanh x = 1 − 2e^(−2x) + O(e^(−4x)), and e^(−4x) < 1e−69
    exp(-2 * xh, -2 * xl, r);
    const s = neg ? -1 : 1, small = r[0];
    return void (r[0] = s, r[1] = -2 * s * small);
  }
  if (xh < 0.05) {
    // sinh by Taylor series, cosh = √(1 + sinh²)
    mul(xh, xl, xh, xl, T);
    const x2h = T[0], x2l = T[1];
    let sh = xh, sl = xl, ph = xh, pl = xl;
    for (let k = 3; k < 30; k += 2) {
      mul(ph, pl, x2h, x2l, T);
      ph = T[0], pl = T[1];
      mul(ph, pl, INV_FACT[k][0], INV_FACT[k][1], T);
      const c = T[0];
      add(sh, sl, T[0], T[1], T);
      sh = T[0], sl = T[1];
      if (Math.abs(c) < 1e-35 * sh) break;
    }
    mul(sh, sl, sh, sl, T);
    add(T[0], T[1], 1, 0, T);
    sqrt(T[0], T[1], T);
    div(sh, sl, T[0], T[1], r);
  } else {
    exp(-2 * xh, -2 * xl, T);
    const eh = T[0], el = T[1];
    add(1, 0, -eh, -el, T);
    const nh = T[0], nl = T[1];
    add(1, 0, eh, el, T);
    div(nh, nl, T[0], T[1], r);
  }
  if (neg) r[0] = -r[0], r[1] = -r[1];
}

/** r = a^b: binary powering for an integer b, else e^(b·ln a) (NaN for a < 0). */
export function pow(ah: number, al: number, bh: number, bl: number, r: Out): void {
  if (bl === 0 && Number.isInteger(bh) && Math.abs(bh) <= 2 ** 31) {
    return powInt(ah, al, bh, r);
  }
  if (Number.isNaN(ah) || Number.isNaN(bh) || ah < 0) return void (r[0] = NaN, r[1] = 0);
  if (ah === 0) return void (r[0] = bh > 0 ? 0 : Infinity, r[1] = 0);
  log(ah, al, r);
  mul(r[0], r[1], bh, bl, r);
  exp(r[0], r[1], r);
}
