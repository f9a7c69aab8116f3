/**
 * Exact decimal residual by rational arithmetic in BigInt: the slow path of
 * the decimal correction in `decimal_parser.ts`.
 *
 * Method: write the decimal as N / D (N = mantissa digits, D = 10^-k or 1)
 * and the double hi as mh · 2^eh (from its IEEE 754 bit fields), so the
 * residual N/D − hi is the exact fraction (N·2^s − mh·D·2^t) / (D·2^s) for
 * suitable shifts (`dyadic` of `kernel/dd.ts` reads mh and eh); it is then
 * rounded to a double from a 64-bit quotient. The quotient is truncated
 * before the final rounding, so lo carries a relative error of at most about
 * 2^-52 — far below the 2^-53·|hi| it corrects. Standard exact-rational technique (common practice, no source).
 *
 * @module
 */
import { dyadic } from "../dd.ts";

function bitLength(x: bigint): number {
  return x.toString(2).length;
}

/** The double nearest (to within one truncation) to num/den, den > 0. */
function ratioToDouble(num: bigint, den: bigint): number {
  if (num === 0n) return 0;
  const neg = num < 0n;
  const a = neg ? -num : num;
  const sh = 64 - (bitLength(a) - bitLength(den));
  const q = sh >= 0 ? (a << BigInt(sh)) / den : a / (den << BigInt(-sh));
  let v = Number(q);
  // Scale by 2^-sh in steps so intermediate powers of two neither overflow nor underflow early.
  let s = sh;
  while (s > 0) {
    const t = Math.min(s, 1000);
    v *= 2 ** -t;
    s -= t;
  }
  while (s < 0) {
    const t = Math.min(-s, 1000);
    v *= 2 ** t;
    s += t;
  }
  return neg ? -v : v;
}

/**
 * The double nearest to `decimal − hi`, where `decimal` is the exact value of
 * the text and `hi` its rounded double.
 *
 * @param text A decimal in JavaScript syntax (`.` separator), already validated.
 * @param hi `Number(text)`.
 * @returns The correction lo; 0 when hi is 0 or infinite because the value
 *   lies beyond the double range (the correction is then not representable).
 */
export function exactLo(text: string, hi: number): number {
  if (!Number.isFinite(hi)) return 0;
  const m = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(text);
  if (m === null) return 0;
  const intDigits = m[2], fracDigits = m[3] ?? "";
  const all = (intDigits + fracDigits).replace(/^0+/, "");
  if (all === "") return 0; // the decimal is zero, and so is hi
  const k = Number(m[4] ?? "0") - fracDigits.length;
  // Decimal magnitude ~ 10^(k + all.length); beyond ±400 the residual is 0 or hi is 0/∞.
  if (k + all.length < -400) return 0;
  if (k + all.length > 400) return 0;
  const sign = m[1] === "-" ? -1n : 1n;
  let num = sign * BigInt(all);
  let den = 1n;
  if (k >= 0) num *= 10n ** BigInt(k);
  else den = 10n ** BigInt(-k);
  if (hi === 0) return ratioToDouble(num, den);
  const [hiNum, eh] = dyadic(hi);
  // residual = num/den − hiNum·2^eh
  if (eh >= 0) {
    return ratioToDouble(num - hiNum * den * (1n << BigInt(eh)), den);
  }
  const s = BigInt(-eh);
  return ratioToDouble((num << s) - hiNum * den, den << s);
}
