/**
 * Units as products of symbols raised to rational powers: reading a unit as
 * written in a table (`mAh`, `mg/L`, `m·s^-2`, `cycles^0.5`), the algebra
 * of products and powers, and writing a unit back.
 *
 * A unit here is what the SI Brochure calls a unit symbol: a product of
 * powers of unit symbols, written with a centred dot or a space for the
 * product and a solidus or negative exponents for the quotient (BIPM, *The
 * International System of Units*, 9th ed., 2019, §5.4.3–5.4.6). Each symbol
 * is taken as its own base: no conversion between symbols is made (`g` and
 * `kg` stay two symbols), so units combine exactly as they are written.
 * Exponents are exact fractions (a square root halves every exponent).
 *
 * ```
 *   "mAh/cycles^0.5"  ─parseUnit─▶  { mAh: 1, cycles: −1/2 }  ─formatUnit─▶  "mAh/cycles^0.5"
 * ```
 *
 * @module
 */

/** An exact fraction n/d, d > 0, in lowest terms. */
export type Fraction = readonly [number, number];

/** A unit: symbol → non-zero exponent, in the order the symbols first appeared; empty for none. */
export type Unit = ReadonlyMap<string, Fraction>;

/** The unit of a pure number. */
export const NO_UNIT: Unit = new Map();

function gcd(a: number, b: number): number {
  a = Math.abs(a), b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a || 1;
}

/**
 * A fraction in lowest terms.
 *
 * @param n Numerator (an integer).
 * @param d Denominator (a non-zero integer).
 * @returns n/d reduced, with a positive denominator.
 * @example
 * ```ts
 * import { fraction } from "./unit.ts";
 * if (fraction(2, -4).join("/") !== "-1/2") throw new Error("2/−4 = −1/2");
 * ```
 */
export function fraction(n: number, d = 1): Fraction {
  const g = gcd(n, d) * Math.sign(d);
  return [n / g + 0, d / g];
}

/** a + b. */
export const addF = (a: Fraction, b: Fraction): Fraction =>
  fraction(a[0] * b[1] + b[0] * a[1], a[1] * b[1]);
/** a·b. */
export const mulF = (a: Fraction, b: Fraction): Fraction => fraction(a[0] * b[0], a[1] * b[1]);
/** a/b (b ≠ 0). */
export const divF = (a: Fraction, b: Fraction): Fraction => fraction(a[0] * b[1], a[1] * b[0]);
/** Whether a is zero. */
export const isZeroF = (a: Fraction): boolean => a[0] === 0;

/**
 * The exact fraction a double stands for, if it is one with a denominator
 * of at most 1000 (continued fractions; e.g. 0.5, −1.5, 1/3 as 0.333…).
 *
 * @param x A finite number.
 * @returns The fraction, or null when x is not such a fraction.
 * @example
 * ```ts
 * import { toFraction } from "./unit.ts";
 * if (toFraction(1 / 3)?.join("/") !== "1/3" || toFraction(Math.PI) !== null) throw new Error();
 * ```
 */
export function toFraction(x: number): Fraction | null {
  if (!Number.isFinite(x)) return null;
  let [h0, h1, k0, k1] = [0, 1, 1, 0], r = x;
  for (let i = 0; i < 20; i++) {
    const a = Math.floor(r);
    [h0, h1] = [h1, a * h1 + h0];
    [k0, k1] = [k1, a * k1 + k0];
    if (k1 > 1000) return null;
    if (Math.abs(h1 / k1 - x) <= 1e-12 * Math.max(1, Math.abs(x))) return fraction(h1, k1);
    if (r === a) break;
    r = 1 / (r - a);
  }
  return null;
}

/**
 * u·v^s: the product of u with v raised to the fraction s (s = −1 divides).
 *
 * @param u A unit.
 * @param v A unit.
 * @param s The power of v (default 1).
 * @returns The product, symbols whose exponent cancels left out.
 */
export function timesUnit(u: Unit, v: Unit, s: Fraction = [1, 1]): Unit {
  const out = new Map(u);
  for (const [sym, e] of v) {
    const sum = addF(out.get(sym) ?? [0, 1], mulF(e, s));
    if (isZeroF(sum)) out.delete(sym);
    else out.set(sym, sum);
  }
  return out;
}

/**
 * u^s.
 *
 * @param u A unit.
 * @param s The power.
 * @returns Every exponent multiplied by s (the empty unit for s = 0).
 */
export function powerUnit(u: Unit, s: Fraction): Unit {
  return timesUnit(NO_UNIT, u, s);
}

/**
 * Whether two units are the same product of powers.
 *
 * @param u A unit.
 * @param v A unit.
 * @returns True when every symbol has the same exponent in both.
 */
export function sameUnit(u: Unit, v: Unit): boolean {
  return timesUnit(u, v, [-1, 1]).size === 0;
}

const SEPARATORS = /[\s*·⋅]/;
const SUPERSCRIPT = "⁰¹²³⁴⁵⁶⁷⁸⁹";

/**
 * Reads a unit as written: symbols joined by `*`, `·` or spaces, `/`
 * dividing by the factor after it (or a parenthesised group), powers as
 * `^2`, `^-1`, `^0.5`, `^(1/3)` or superscripts (`m²`, `s⁻¹`); `1` is a pure
 * number. A symbol is any run of other characters (`°C`, `µS`, `%`, `mAh`).
 *
 * @param text The unit as written.
 * @returns The unit, or an error message naming the character at fault.
 * @example
 * ```ts
 * import { formatUnit, parseUnit } from "./unit.ts";
 * const u = parseUnit("kg·m/s^2");
 * if (!("unit" in u) || formatUnit(u.unit) !== "kg·m/s^2") throw new Error(JSON.stringify(u));
 * ```
 */
export function parseUnit(text: string): { unit: Unit } | { error: string } {
  const p = { s: text.trim(), i: 0 };
  if (p.s === "" || p.s === "1") return { unit: NO_UNIT };
  try {
    const unit = readProduct(p);
    if (p.i < p.s.length) throw new Error(`unexpected "${p.s[p.i]}" at character ${p.i + 1}`);
    return { unit };
  } catch (e) {
    return { error: `Cannot read the unit "${text}": ${(e as Error).message}` };
  }
}

type Cursor = { s: string; i: number };

function skipSpace(p: Cursor) {
  while (p.i < p.s.length && /\s/.test(p.s[p.i])) p.i++;
}

function readProduct(p: Cursor): Unit {
  let u = readFactor(p);
  for (;;) {
    skipSpace(p);
    const c = p.s[p.i];
    if (c === undefined || c === ")") return u;
    if (c === "/") {
      p.i++;
      u = timesUnit(u, readFactor(p), [-1, 1]);
    } else {
      if (c === "*" || c === "·" || c === "⋅") p.i++;
      u = timesUnit(u, readFactor(p));
    }
  }
}

function readFactor(p: Cursor): Unit {
  skipSpace(p);
  let base: Unit;
  if (p.s[p.i] === "(") {
    p.i++;
    base = readProduct(p);
    if (p.s[p.i] !== ")") throw new Error(`a "(" at character ${p.i} is not closed`);
    p.i++;
  } else {
    const start = p.i;
    while (p.i < p.s.length && !SEPARATORS.test(p.s[p.i]) && !"/()^".includes(p.s[p.i])) {
      if (SUPERSCRIPT.includes(p.s[p.i]) || p.s[p.i] === "⁻") break;
      p.i++;
    }
    const sym = p.s.slice(start, p.i);
    if (sym === "") throw new Error(`a unit symbol is missing at character ${start + 1}`);
    base = /^[0-9.]+$/.test(sym)
      ? (sym === "1" ? NO_UNIT : fail(`the number ${sym} is not a unit`))
      : new Map([[sym, [1, 1] as Fraction]]);
  }
  const e = readExponent(p);
  return e === null ? base : powerUnit(base, e);
}

function fail(message: string): never {
  throw new Error(message);
}

function readExponent(p: Cursor): Fraction | null {
  if (p.s[p.i] === "^") {
    p.i++;
    const m = /^\(\s*(-?\d+)\s*\/\s*(\d+)\s*\)|^(-?\d+(?:\.\d+)?)/.exec(p.s.slice(p.i));
    if (m === null) throw new Error(`a power is missing after "^" at character ${p.i}`);
    p.i += m[0].length;
    const f = m[1] !== undefined ? fraction(+m[1], +m[2]) : toFraction(+m[3]);
    if (f === null || f[1] === 0) throw new Error(`the power ${m[0]} is not a fraction`);
    return f;
  }
  let t = "";
  while (p.i < p.s.length && (SUPERSCRIPT.includes(p.s[p.i]) || p.s[p.i] === "⁻")) {
    t += p.s[p.i] === "⁻" ? "-" : String(SUPERSCRIPT.indexOf(p.s[p.i]));
    p.i++;
  }
  if (t === "") return null;
  if (!/^-?\d+$/.test(t)) throw new Error(`the power "${t}" is not a whole number`);
  return fraction(+t, 1);
}

function exponentText(e: Fraction): string {
  const [n, d] = [Math.abs(e[0]), e[1]];
  if (d === 1) return n === 1 ? "" : `^${n}`;
  const decimal = n / d;
  // Terminating decimals (denominators 2^a·5^b) read as written in tables: ^0.5, ^1.25.
  let q = d;
  while (q % 2 === 0) q /= 2;
  while (q % 5 === 0) q /= 5;
  return q === 1 ? `^${decimal}` : `^(${n}/${d})`;
}

/**
 * Writes a unit: symbols with positive powers joined by `·`, then `/` and
 * the symbols with a negative power (their power's magnitude), grouped in
 * parentheses when there are several (SI Brochure §5.4.6), e.g.
 * `mAh/cycles^0.5`, `mg/(L·h)`; `1/s` when nothing is above the line; ""
 * for none.
 *
 * @param u A unit.
 * @returns Its text.
 */
export function formatUnit(u: Unit): string {
  const up: string[] = [], down: string[] = [];
  for (const [sym, e] of u) (e[0] > 0 ? up : down).push(sym + exponentText(e));
  if (up.length === 0 && down.length === 0) return "";
  const below = down.length === 0 ? "" : down.length === 1 ? `/${down[0]}` : `/(${down.join("·")})`;
  return (up.length ? up.join("·") : "1") + below;
}
