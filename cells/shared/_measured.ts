/**
 * A measured value and its uncertainty, rounded as metrology does.
 *
 * Rule (GUM, JCGM 100:2008, *Evaluation of measurement data — Guide to the
 * expression of uncertainty in measurement*, §7.2.6): the standard
 * uncertainty is quoted to at most two significant digits, and the estimate
 * is rounded to be consistent with it, that is to the same decimal place;
 * we round an interval's limits to that place too, so estimate and limits
 * line up digit for digit. Our choices beyond the text: two digits always
 * (never one), rounding to nearest (the GUM allows rounding up), trailing
 * zeros kept (`100.0041`, `0.010`), and outside 1e-4 ≤ |x| < 1e6 one shared
 * power of ten for the estimate and its limits (`2.346e-7`).
 *
 * ```
 *  u = 0.001473 ─two digits─▶ 0.0015 (last digit at 10⁻⁴)
 *  y = 138.50036          ─▶ 138.5004
 *  [138.49742, 138.50329] ─▶ [138.4974, 138.5033]
 * ```
 *
 * @module
 */
import { formatNumber } from "./_significant.ts";

/** Where the digits of a value stop: its last digit is at 10^place; shown as m × 10^exponent. */
export interface DigitPlace {
  place: number;
  /** 0 for plain notation, else the power of ten every value of the group shares. */
  exponent: number;
}

/**
 * The place of the last of two significant digits of an uncertainty.
 *
 * @param u A standard uncertainty (or standard error).
 * @returns The power of ten of its second significant digit after rounding
 *   (0.0996 rounds to 0.10, so −2), or null when `u` is not positive and finite.
 * @example
 * ```ts
 * import { uncertaintyPlace } from "./_measured.ts";
 * if (uncertaintyPlace(0.001473) !== -4 || uncertaintyPlace(0.0996) !== -2) throw new Error();
 * ```
 */
export function uncertaintyPlace(u: number | null): number | null {
  if (u === null || !Number.isFinite(u) || u <= 0) return null;
  let e = Math.floor(Math.log10(u));
  // log10 of a value just under a power of ten can round up: correct the decade.
  if (10 ** e > u) e--;
  else if (10 ** (e + 1) <= u) e++;
  const place = e - 1;
  return Math.round(u / 10 ** place) >= 100 ? place + 1 : place;
}

/**
 * The digit place for an estimate (and its limits) given its uncertainty.
 *
 * @param x The estimate (sets the notation: plain or a shared power of ten).
 * @param u Its standard uncertainty.
 * @returns The place, or null when `u` gives none (then use significant digits).
 */
export function measuredPlace(x: number | null, u: number | null): DigitPlace | null {
  const place = uncertaintyPlace(u);
  if (place === null) return null;
  const ref = Math.max(x !== null && Number.isFinite(x) ? Math.abs(x) : 0, u!);
  const plain = ref >= 1e-4 && ref < 1e6 && place >= -15;
  return { place, exponent: plain ? 0 : Math.floor(Math.log10(ref)) };
}

/**
 * A number rounded to a digit place.
 *
 * @param x The number, or null (a dash).
 * @param at The place (and shared exponent).
 * @returns The text: `138.5004`, `2510`, `2.346e-7`; never `-0.00`.
 * @example
 * ```ts
 * import { formatAtPlace } from "./_measured.ts";
 * if (formatAtPlace(100.00405, { place: -4, exponent: 0 }) !== "100.0041") throw new Error();
 * if (formatAtPlace(2512.3, { place: 1, exponent: 0 }) !== "2510") throw new Error();
 * ```
 */
export function formatAtPlace(x: number | null, at: DigitPlace): string {
  if (x === null || Number.isNaN(x)) return "—";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  const digits = at.exponent - at.place;
  let text: string;
  if (at.exponent !== 0) {
    const m = x / 10 ** at.exponent;
    text = `${m.toFixed(Math.max(0, digits))}e${at.exponent}`;
  } else if (at.place >= 0) {
    const step = 10 ** at.place;
    text = (Math.round(x / step) * step).toFixed(0);
  } else text = x.toFixed(-at.place);
  return /^-[0.]*(e|$)/.test(text) ? text.slice(1) : text;
}

/**
 * A standard uncertainty to two significant digits (GUM §7.2.6).
 *
 * @param u The uncertainty, or null.
 * @param fallbackSig Significant digits when `u` is zero (an exact fit).
 * @returns The text: `0.0015`, `0.10`, `120`.
 * @example
 * ```ts
 * import { formatUncertainty } from "./_measured.ts";
 * if (formatUncertainty(0.001473) !== "0.0015" || formatUncertainty(123.4) !== "120") throw new Error();
 * ```
 */
export function formatUncertainty(u: number | null, fallbackSig = 2): string {
  const at = measuredPlace(u, u);
  if (at === null) return u === 0 ? "0" : formatNumber(u, fallbackSig);
  return formatAtPlace(u, at);
}

/**
 * An estimate rounded to the place of its uncertainty's second significant digit.
 *
 * @param x The estimate, or null.
 * @param u Its standard uncertainty; without one (null, zero), `fallbackSig`
 *   significant digits.
 * @param fallbackSig Significant digits without an uncertainty.
 * @returns The text.
 * @example
 * ```ts
 * import { formatEstimate } from "./_measured.ts";
 * if (formatEstimate(138.50036, 0.001473) !== "138.5004") throw new Error();
 * ```
 */
export function formatEstimate(x: number | null, u: number | null, fallbackSig = 6): string {
  const at = measuredPlace(x, u);
  return at === null ? formatNumber(x, fallbackSig) : formatAtPlace(x, at);
}

/**
 * An interval's limits rounded to the place of the uncertainty of its estimate.
 *
 * @param ci The limits, or null.
 * @param u The standard uncertainty the interval was built from.
 * @param x The estimate (sets the notation shared with it).
 * @param join Text between the limits (`", "` inside brackets by default).
 * @returns `[138.4974, 138.5033]`, or "—".
 * @example
 * ```ts
 * import { formatIntervalAt } from "./_measured.ts";
 * const s = formatIntervalAt([138.49742, 138.50329], 0.001473, 138.50035);
 * if (s !== "[138.4974, 138.5033]") throw new Error(s);
 * ```
 */
export function formatIntervalAt(
  ci: readonly [number | null, number | null] | null,
  u: number | null,
  x: number | null = null,
  join: { open: string; sep: string; close: string } = { open: "[", sep: ", ", close: "]" },
): string {
  if (ci === null) return "—";
  const at = measuredPlace(x ?? ci[1] ?? ci[0], u);
  const one = (v: number | null) => at === null ? formatNumber(v, 6) : formatAtPlace(v, at);
  return `${join.open}${one(ci[0])}${join.sep}${one(ci[1])}${join.close}`;
}
