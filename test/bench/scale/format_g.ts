/**
 * C's `%.Pg` conversion of a double, exactly as C11 §7.21.6.1 defines it,
 * for the benchmark data (printed as `%.10g`, as a C or Python logger
 * writes it).
 *
 * The rule (C11 §7.21.6.1 ¶8, conversion `g`): let P be the precision (6
 * when omitted, 1 when zero) and X the exponent that style `e` would show
 * after rounding to P significant digits. If P > X ≥ −4 the value is
 * written in style `f` with P − 1 − X decimals, else in style `e` with
 * P − 1 decimals; then trailing zeros of the fraction are removed, and the
 * decimal point when no fraction is left. Style `e` writes at least two
 * exponent digits (`1e-05`). ¶13: the digits are correctly rounded, which
 * under the default rounding of IEC 60559 (C11 annex F) sends an exact tie
 * to the even neighbour (glibc does so).
 *
 * How: JavaScript's `toExponential(d)` rounds correctly too, but sends an
 * exact tie upward (ECMA-262, Number.prototype.toExponential: "pick the n
 * for which n × 10^(e−f) is larger"). An exact tie at P digits has exactly
 * P + 1 significant digits ending in 5, so `toExponential(P)` shows it; only
 * then is the double compared exactly with that decimal (BigInt), and an
 * exact tie with an even P-th digit is truncated instead of rounded up.
 *
 * @module
 */

/** The exponent of an `e`-style string such as "1.5e-7". */
function exponentOf(e: string): number {
  return Number(e.slice(e.indexOf("e") + 1));
}

/** Whether `abs` (finite, positive) equals exactly the decimal written `e` ("d.ddde±X"). */
function equalsExactly(abs: number, e: string): boolean {
  const mark = e.indexOf("e");
  const digits = e.slice(0, mark).replace(".", "");
  const q = exponentOf(e) - (digits.length - 1);
  // abs = m · 2^k with m a 53-bit integer, read off the bits.
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, abs);
  const hi = view.getUint32(0), lo = view.getUint32(4);
  const biased = hi >>> 20;
  const frac = (BigInt(hi & 0xfffff) << 32n) | BigInt(lo);
  const m = biased === 0 ? frac : frac | (1n << 52n);
  const k = (biased === 0 ? 1 : biased) - 1075;
  let left = m, right = BigInt(digits);
  if (k >= 0) left <<= BigInt(k);
  else right <<= BigInt(-k);
  if (q >= 0) right *= 10n ** BigInt(q);
  else left *= 10n ** BigInt(-q);
  return left === right;
}

/**
 * The P significant digits of `abs` correctly rounded (ties to even) and
 * the exponent X of style `e`, as one `e`-style string "d.ddde±X".
 */
function roundedE(abs: number, p: number): string {
  const longer = abs.toExponential(p); // P + 1 digits
  const mark = longer.indexOf("e");
  const last = longer.charCodeAt(mark - 1) - 48;
  const truncated = () => {
    const head = longer.slice(0, mark - 1);
    return (head.endsWith(".") ? head.slice(0, -1) : head) + longer.slice(mark);
  };
  if (last < 5) return truncated(); // rounding P + 1 digits changed nothing at P
  const rounded = abs.toExponential(p - 1);
  if (last > 5 || Number(longer) !== abs || !equalsExactly(abs, longer)) return rounded;
  // An exact tie: to the even neighbour.
  const pth = longer.charCodeAt(p === 1 ? 0 : mark - 2) - 48; // "d.5e+X" when P = 1
  return pth % 2 === 0 ? truncated() : rounded;
}

/**
 * Formats a number as C's `printf("%.Pg", x)` does.
 *
 * @param x Any number.
 * @param precision P, the significant digits (C's default 6; 0 counts as 1).
 * @returns The text, e.g. "1.5e-07", "123456.789", "-0", "inf", "nan".
 * @throws RangeError when the precision is not a whole number from 0 to 99.
 * @example
 * ```ts
 * import { formatG } from "./format_g.ts";
 * if (formatG(1 / 3, 10) !== "0.3333333333" || formatG(1e-5, 10) !== "1e-05") {
 *   throw new Error("%.10g");
 * }
 * ```
 */
export function formatG(x: number, precision = 6): string {
  if (!Number.isInteger(precision) || precision < 0 || precision > 99) {
    throw new RangeError(`Precision "${precision}" is not a whole number from 0 to 99`);
  }
  if (Number.isNaN(x)) return "nan";
  const sign = x < 0 || Object.is(x, -0) ? "-" : "";
  const abs = Math.abs(x);
  if (abs === Infinity) return sign + "inf";
  if (abs === 0) return sign + "0";
  const p = precision === 0 ? 1 : precision;
  const e = roundedE(abs, p);
  const mark = e.indexOf("e");
  const digits = e.slice(0, mark).replace(".", "");
  const exp = exponentOf(e);
  if (exp < -4 || exp >= p) {
    const fraction = digits.slice(1).replace(/0+$/, "");
    const mag = Math.abs(exp);
    return sign + digits[0] + (fraction ? "." + fraction : "") + "e" + (exp < 0 ? "-" : "+") +
      (mag < 10 ? "0" : "") + mag;
  }
  // Style f with P − 1 − X decimals: the same P digits with the point moved.
  const text = exp >= 0
    ? digits.slice(0, exp + 1) + "." + digits.slice(exp + 1)
    : "0." + "0".repeat(-exp - 1) + digits;
  return sign + text.replace(/0+$/, "").replace(/\.$/, "");
}
