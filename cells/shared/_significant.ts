/**
 * Numbers to significant digits, and statistics printed so that what
 * differs reads differently: a value near 1 never prints as 1, and the
 * values of one column never print alike unless they are equal. Our rules
 * (common practice, no source): a reader compares numbers by their text, so
 * the text must keep every difference the numbers have.
 *
 * @module
 */

/**
 * `sig` significant digits, plain notation for 1e-4 ≤ |x| < 1e6, else an
 * exponent. A value that is not ±1 never prints as ±1: more digits are kept
 * until it differs (0.99999 at 4 digits is `0.99999`).
 *
 * @param x The number, or null (shown as a dash).
 * @param sig Significant digits.
 * @returns The text.
 * @example
 * ```ts
 * import { formatNumber } from "./_significant.ts";
 * if (formatNumber(2512.345) !== "2512" || formatNumber(3.2e-7, 2) !== "3.2e-7") throw new Error();
 * if (formatNumber(0.99999, 4) !== "0.99999") throw new Error(formatNumber(0.99999, 4));
 * ```
 */
export function formatNumber(x: number | null, sig = 4): string {
  if (x === null || Number.isNaN(x)) return "—";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e6) {
    let s = sig;
    while (s < 17 && a !== 1 && Math.abs(Number(x.toPrecision(s))) === 1) s++;
    return String(Number(x.toPrecision(s)));
  }
  return x.toExponential(sig - 1).replace("e+", "e");
}

/**
 * A fraction near 1 (R², adjusted R², a correlation) with enough decimals
 * that 1 − x keeps two significant digits (at least four decimals): R²
 * 0.9999999904 prints as `0.9999999904`, never `1.00000`. Beyond 15 nines
 * the gap is written out: `1 − 2.2e-16`.
 *
 * @param r The fraction, or null.
 * @param extra Decimals beyond the rule (for {@link distinctTexts}).
 * @returns The text.
 * @example
 * ```ts
 * import { formatNearOne } from "./_significant.ts";
 * if (formatNearOne(0.9999999904) !== "0.9999999904") throw new Error(formatNearOne(0.9999999904));
 * if (formatNearOne(0.96341) !== "0.9634") throw new Error();
 * ```
 */
export function formatNearOne(r: number | null, extra = 0): string {
  if (r === null || Number.isNaN(r)) return "—";
  if (!Number.isFinite(r)) return r > 0 ? "∞" : "−∞";
  const gap = 1 - r;
  if (gap > 0 && gap < 1e-15) return `1 − ${gap.toExponential(1)}`;
  const decimals = gap > 0 ? Math.max(4, Math.ceil(-Math.log10(gap)) + 1) : 4;
  return r.toFixed(Math.min(17, decimals + extra)).replace(/^-(?=[0.]*$)/, "");
}

/**
 * A p-value that keeps its size: 3.2e-27 is shown as such, never as 0, and
 * 0.99996 as 0.999960, never as 1. Two significant digits between.
 *
 * @param p The p-value, or null.
 * @param extra Digits beyond the rule (for {@link distinctTexts}).
 * @returns The text.
 * @example
 * ```ts
 * import { formatP } from "./_significant.ts";
 * if (formatP(3.2e-27) !== "3.2e-27" || formatP(0.0123) !== "0.012") throw new Error();
 * if (formatP(0.99996) !== "0.999960") throw new Error(formatP(0.99996));
 * ```
 */
export function formatP(p: number | null, extra = 0): string {
  if (p === null || Number.isNaN(p)) return "—";
  if (p < 1e-4) return p.toExponential(1 + extra).replace("e+", "e");
  if (p < 1 && Number(p.toPrecision(2 + extra)) >= 1) return formatNearOne(p, extra);
  return formatNumber(p, 2 + extra);
}

/**
 * Texts for a column of values: the formatter is given more digits until
 * values that differ print differently (at most 12 more).
 *
 * @param values The column.
 * @param format Formats one value with `extra` digits beyond its rule.
 * @returns One text per value.
 * @example
 * ```ts
 * import { distinctTexts, formatNumber } from "./_significant.ts";
 * const t = distinctTexts([182.234, 182.241, 190], (x, e) => formatNumber(x, 4 + e));
 * if (t.join(" ") !== "182.23 182.24 190") throw new Error(t.join(" "));
 * ```
 */
export function distinctTexts(
  values: readonly (number | null)[],
  format: (x: number | null, extra: number) => string,
): string[] {
  let texts = values.map((v) => format(v, 0));
  for (let extra = 1; extra <= 12 && collides(values, texts); extra++) {
    texts = values.map((v) => format(v, extra));
  }
  return texts;
}

/** True when two different values share a text. */
function collides(values: readonly (number | null)[], texts: string[]): boolean {
  const seen = new Map<string, number | null>();
  for (let i = 0; i < values.length; i++) {
    const before = seen.get(texts[i]);
    if (before !== undefined && !Object.is(before, values[i])) return true;
    seen.set(texts[i], values[i]);
  }
  return false;
}
