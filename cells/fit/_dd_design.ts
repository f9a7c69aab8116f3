/**
 * A linear fit's design and response in double-double from the data as
 * printed: the columns with their decimal corrections (the table's `lo`, or
 * the shortest decimal of each double where the table kept none,
 * `_printed_lo.ts`), each design term ∂f/∂θ_j evaluated to about 32 digits.
 *
 * Method: terms that are monomials in the columns (a number times columns
 * to whole powers: `1`, `x`, `x^3`, `x1*x2`, as `polynomial()` and
 * `linear()` expand to) are evaluated here, the powers of each column by
 * successive double-double products shared by every term (x² = x·x,
 * x³ = x²·x, …; Dekker 1971 mul2 as kernel/dd.ts `mulDD`); any other term by
 * kernel/expr `compileDD`, node by node. Measured on 1,000,000 rows of
 * polynomial(x, 10) (this machine): about 90 ms here against about 500 ms
 * term by term with `compileDD`, and 165 ms for the double design by
 * `compile`.
 *
 * ```
 *  x (hi, lo) ─·x─▶ x² ─·x─▶ x³ … x¹⁰      one pass per power, shared by the terms
 *  2*x1*x2     ─▶ x1·x2 (DD) · 2            a term of several factors: its own pass
 *  log(x)      ─▶ compileDD                  anything else
 * ```
 *
 * @module
 */
import { compileDD, type Expr } from "../../kernel/expr/mod.ts";
import { fastSumError, mulDD, productError } from "../../kernel/dd.ts";
import { type DDRows, ROW_BLOCK } from "../../kernel/linalg/mod.ts";
import type { FitProblem } from "./problem.ts";
import { printedLo } from "./_printed_lo.ts";

/** A column of values as hi + lo (lo null: exact doubles). */
export interface DDColumn {
  hi: Float64Array;
  lo: Float64Array | null;
}

/**
 * The model's columns as printed: the table's corrections, else recovered.
 *
 * @param problem The fit problem.
 * @returns One hi + lo pair per `model.columns` entry.
 */
export function printedColumns(problem: FitProblem): DDColumn[] {
  return problem.columns.map((hi, c) => ({
    hi,
    lo: problem.lo?.columns[c] ?? printedLo(hi),
  }));
}

/**
 * The response as written (`log(y)` included), in double-double from the
 * response column as printed.
 *
 * @param problem The fit problem.
 * @returns y as hi + lo.
 */
export function printedResponse(problem: FitProblem): DDColumn {
  const { model, n } = problem;
  const resp = problem.lo?.response;
  // Without the raw column (a refit), only a bare column's values are data as printed.
  if (resp === undefined) {
    return { hi: problem.y, lo: model.response.op === "id" ? printedLo(problem.y) : null };
  }
  const lo = resp.lo ?? printedLo(resp.hi);
  if (model.response.op === "id") return { hi: resp.hi, lo };
  return compileDD(model.response, [model.responseColumn], [])([resp.hi], [lo], [], null, n);
}

/**
 * The design terms in double-double.
 *
 * @param problem The fit problem (model, n).
 * @param terms ∂f/∂θ_j per parameter (free of parameters: the model is linear).
 * @param cols The columns as printed ({@link printedColumns}).
 * @returns One hi + lo column per term; hi is the design as a double.
 */
export function ddDesign(
  problem: FitProblem,
  terms: readonly Expr[],
  cols: readonly DDColumn[],
): DDColumn[] {
  const { model, n } = problem;
  const monomials = terms.map((t) => monomialOf(t, model.columns));
  const powers = new PowerTable(cols, n);
  const zeros = new Float64Array(model.parameters.length);
  return terms.map((t, j) => {
    const mono = monomials[j];
    const v = mono === null ? null : powers.term(mono);
    if (v !== null) return v;
    const out = compileDD(t, model.columns, model.parameters)(
      cols.map((c) => c.hi),
      cols.map((c) => c.lo),
      zeros,
      null,
      n,
    );
    return { hi: out.hi, lo: out.lo };
  });
}

/**
 * The design's rows in double-double on demand, for refinement at scale
 * (kernel/linalg `refineLeastSquares`): monomial terms from their columns'
 * powers, computed row by row; any other term evaluated once by `compileDD`
 * and read. A million rows of polynomial(x, 10) keep no low parts (80 MB,
 * about 200 ms to allocate and touch) for the price of nine double-double
 * products a row in each refinement pass.
 *
 * @param problem The fit problem (model, n).
 * @param terms ∂f/∂θ_j per parameter.
 * @param cols The columns as printed ({@link printedColumns}).
 * @returns The row source.
 */
export function ddRows(
  problem: FitProblem,
  terms: readonly Expr[],
  cols: readonly DDColumn[],
): DDRows {
  const { model, n } = problem;
  const scans = new Map<number, { largest: number; integers: boolean }>();
  const scan = (c: number) => {
    if (!scans.has(c)) {
      let a = 0, integers = cols[c].lo === null;
      const v = cols[c].hi;
      for (let i = 0; i < v.length; i++) {
        a = Math.max(a, Math.abs(v[i]));
        if (integers && !Number.isInteger(v[i])) integers = false;
      }
      scans.set(c, { largest: a, integers });
    }
    return scans.get(c)!;
  };
  const largest = (c: number) => scan(c).largest;
  const plans = terms.map((t) => {
    const m = monomialOf(t, model.columns);
    // TwoProduct's splitting overflows above about 2^996 (kernel/dd.ts): such terms go to compileDD.
    const safe = m !== null &&
      [...m.powers].every(([c, k]) =>
        (k <= 1 && Math.abs(m.coef) <= 1) || largest(c) ** k * Math.abs(m.coef) < 2 ** 900
      );
    if (safe) return m!;
    const zeros = new Float64Array(model.parameters.length);
    return compileDD(t, model.columns, model.parameters)(
      cols.map((c) => c.hi),
      cols.map((c) => c.lo),
      zeros,
      null,
      n,
    ) as DDColumn;
  });
  // Whole numbers whose every power used stays below 2^53 have exact double powers (Wampler's x).
  const exact = new Set<number>();
  for (const m of plans) {
    if (!("powers" in m)) continue;
    for (const [c, k] of m.powers) {
      if (scan(c).integers && scan(c).largest ** k < 2 ** 53) exact.add(c);
    }
  }
  for (const m of plans) {
    if (!("powers" in m)) continue;
    for (const [c, k] of m.powers) if (!(scan(c).largest ** k < 2 ** 53)) exact.delete(c);
  }
  return new MonomialRows(cols, plans, exact);
}

/**
 * Blocks of rows of monomials (each column's powers x, x², … computed once
 * per block, column by column, into buffers reused from block to block;
 * each term then a power, or a product of powers) and of terms kept as
 * columns (views).
 */
class MonomialRows implements DDRows {
  /** Powers x^1 … x^top of each used column, hi and lo, one block long. */
  readonly #powers = new Map<number, { hi: Float64Array[]; lo: Float64Array[] }>();
  /** A buffer per term that is a product or a multiple of powers. */
  readonly #own: ({ hi: Float64Array; lo: Float64Array } | null)[];

  constructor(
    private readonly data: readonly DDColumn[],
    private readonly plans: (Monomial | DDColumn)[],
    /** Columns whose powers are exact in double (whole numbers, powers below 2^53). */
    private readonly exact: ReadonlySet<number>,
  ) {
    const top = new Map<number, number>();
    for (const m of plans) {
      if ("powers" in m) {
        for (const [c, k] of m.powers) top.set(c, Math.max(top.get(c) ?? 0, k));
      }
    }
    const buf = () => new Float64Array(ROW_BLOCK);
    for (const [c, k] of top) {
      this.#powers.set(c, {
        hi: Array.from({ length: k + 1 }, buf),
        lo: Array.from({ length: k + 1 }, buf),
      });
    }
    this.#own = plans.map((m) =>
      "powers" in m && !(m.coef === 1 && m.powers.size === 1) ? { hi: buf(), lo: buf() } : null
    );
  }

  block(
    start: number,
    end: number,
    hi: ArrayLike<number>[],
    lo: (ArrayLike<number> | null)[],
  ): void {
    const len = end - start;
    for (const [c, pw] of this.#powers) {
      powersOf(this.data[c], start, len, pw.hi, this.exact.has(c) ? null : pw.lo);
    }
    this.plans.forEach((m, j) => {
      if (!("powers" in m)) {
        hi[j] = m.hi.subarray(start, end);
        lo[j] = m.lo === null ? null : m.lo.subarray(start, end);
        return;
      }
      const own = this.#own[j];
      if (own === null) {
        const [[c, k]] = m.powers;
        hi[j] = this.#powers.get(c)!.hi[k];
        lo[j] = this.exact.has(c) ? null : this.#powers.get(c)!.lo[k];
        return;
      }
      own.hi.fill(m.coef, 0, len), own.lo.fill(0, 0, len);
      for (const [c, k] of m.powers) {
        const pw = this.#powers.get(c)!;
        mulInto(own.hi, own.lo, pw.hi[k], pw.lo[k], len);
      }
      hi[j] = own.hi, lo[j] = own.lo;
    });
  }
}

/**
 * x^0 … x^top of rows start … start + len − 1 of x, x^k = x^(k−1)·x (Dekker's
 * mul2); with pl null, in double (for whole numbers whose powers are exact).
 */
function powersOf(
  x: DDColumn,
  start: number,
  len: number,
  ph: Float64Array[],
  pl: Float64Array[] | null,
): void {
  ph[0].fill(1, 0, len);
  const xh = x.hi.subarray(start, start + len);
  const xl = x.lo === null ? null : x.lo.subarray(start, start + len);
  if (pl === null) {
    for (let k = 1; k < ph.length; k++) {
      const a = ph[k - 1], b = ph[k];
      for (let i = 0; i < len; i++) b[i] = a[i] * xh[i];
    }
    return;
  }
  pl[0].fill(0, 0, len);
  for (let k = 1; k < ph.length; k++) {
    ph[k].set(ph[k - 1].subarray(0, len)), pl[k].set(pl[k - 1].subarray(0, len));
    mulInto(ph[k], pl[k], xh, xl, len);
  }
}

/** a ← a·b element by element in double-double, for values in range (no scaling; see ddRows). */
function mulInto(
  ah: Float64Array,
  al: Float64Array,
  bh: Float64Array,
  bl: Float64Array | null,
  len: number,
): void {
  for (let i = 0; i < len; i++) {
    const h = ah[i], l = al[i], b = bh[i], lb = bl === null ? 0 : bl[i];
    const q = h * b, e = productError(h, b, q) + (h * lb + l * b), t = q + e;
    ah[i] = t;
    al[i] = fastSumError(q, e, t);
  }
}

/** c·Π x_col^k: the coefficient (an exact double) and the whole powers of columns. */
interface Monomial {
  coef: number;
  powers: Map<number, number>;
}

/** Largest power evaluated by the table (higher ones go to `compileDD`). */
const MAX_POWER = 64;

/** The term as a monomial in the columns, or null when it is not one. */
function monomialOf(e: Expr, columns: readonly string[]): Monomial | null {
  switch (e.op) {
    case "num":
      return { coef: e.value, powers: new Map() };
    case "id": {
      const c = columns.indexOf(e.name);
      return c < 0 ? null : { coef: 1, powers: new Map([[c, 1]]) };
    }
    case "neg": {
      const m = monomialOf(e.arg, columns);
      return m === null ? null : { coef: -m.coef, powers: m.powers };
    }
    case "*": {
      const a = monomialOf(e.left, columns), b = monomialOf(e.right, columns);
      if (a === null || b === null) return null;
      const coef = a.coef * b.coef;
      // Only exact products of literals: anything else is left to compileDD.
      if (!Number.isFinite(coef) || productError(a.coef, b.coef, coef) !== 0) return null;
      const powers = new Map(a.powers);
      for (const [c, k] of b.powers) powers.set(c, (powers.get(c) ?? 0) + k);
      return { coef, powers };
    }
    case "^": {
      const a = monomialOf(e.left, columns);
      const k = e.right.op === "num" ? e.right.value : NaN;
      if (a === null || !Number.isInteger(k) || k < 0 || Math.abs(a.coef) !== 1) return null;
      const powers = new Map([...a.powers].map(([c, j]) => [c, j * k]));
      return [...powers.values()].some((j) => j > MAX_POWER)
        ? null
        : { coef: k % 2 === 0 ? 1 : a.coef, powers };
    }
    default:
      return null;
  }
}

/** Powers of the columns in double-double, each computed once. */
class PowerTable {
  #table = new Map<string, DDColumn>();
  constructor(private readonly cols: readonly DDColumn[], private readonly n: number) {}

  /** x_c^k (k ≥ 1) as hi + lo: x^k = x^(k−1)·x, rows at a time. */
  power(c: number, k: number): DDColumn {
    if (k === 1) return this.cols[c];
    const key = `${c}^${k}`;
    let v = this.#table.get(key);
    if (v === undefined) {
      v = product(this.power(c, k - 1), this.cols[c], this.n);
      this.#table.set(key, v);
    }
    return v;
  }

  /** The monomial's values, or null when they leave the range of the double-double products. */
  term(m: Monomial): DDColumn | null {
    let v: DDColumn | null = null;
    for (const [c, k] of m.powers) {
      if (k === 0) continue;
      const x = this.power(c, k);
      v = v === null ? x : product(v, x, this.n);
    }
    if (v === null) return { hi: new Float64Array(this.n).fill(m.coef), lo: null };
    if (m.coef !== 1) v = scaled(v, m.coef);
    // TwoProduct's splitting overflows above about 2^996 (kernel/dd.ts).
    for (let i = 0; i < this.n; i++) if (!(Math.abs(v.hi[i]) < 2 ** 900)) return null;
    return v;
  }
}

const OUT = new Float64Array(2);

/** a·b per row in double-double (mulDD). */
function product(a: DDColumn, b: DDColumn, n: number): DDColumn {
  const hi = new Float64Array(n), lo = new Float64Array(n);
  const al = a.lo, bl = b.lo;
  for (let i = 0; i < n; i++) {
    mulDD(a.hi[i], al === null ? 0 : al[i], b.hi[i], bl === null ? 0 : bl[i], OUT);
    hi[i] = OUT[0];
    lo[i] = OUT[1];
  }
  return { hi, lo };
}

/** c·a per row for an exact double c (mulDD with a zero low part). */
function scaled(a: DDColumn, c: number): DDColumn {
  return product(a, { hi: new Float64Array(a.hi.length).fill(c), lo: null }, a.hi.length);
}
