/**
 * A linear fit's design and response in double-double from the data as
 * printed: the columns with their decimal corrections (the table's `lo`, or
 * the shortest decimal of each double where the table kept none,
 * `printedLo` below), each design term ∂f/∂θ_j evaluated to about 32 digits.
 *
 * Method: terms that are monomials in the columns (a number times columns
 * to whole powers: `1`, `x`, `x^3`, `x1*x2`, as `polynomial()` and
 * `linear()` expand to) are evaluated here, the powers of each column by
 * successive double-double products shared by every term (x² = x·x,
 * x³ = x²·x, …; Dekker 1971 mul2 as kernel/dd.ts `mulDD`); any other term by
 * kernel/expr `compileDD`, node by node. The columns are kept whole, for the
 * double-double path (n·p² ≤ 2e7, `_precise_linear.ts`); the refinement at
 * larger sizes reads rows a block at a time instead (`_dd_rows.ts`).
 * Measured on 1,000,000 rows of polynomial(x, 10) (this machine): 70–80 ms
 * here against about 500 ms term by term with `compileDD`.
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
import { mulDD, productError } from "../../kernel/dd.ts";
import type { FitProblem } from "./problem.ts";
import { PrintedColumn, printedLo } from "./_printed_lo.ts";

export { printedLo };

/** A column of values as hi + lo (lo null: exact doubles). */
export interface DDColumn {
  hi: Float64Array;
  lo: Float64Array | null;
}

/**
 * The model's columns as printed: the table's corrections, else recovered
 * from the doubles (`_printed_lo.ts`) when first read, whole, or a block of
 * rows at a time by the refinement (`_dd_rows.ts`).
 *
 * @param problem The fit problem.
 * @returns One hi + lo pair per `model.columns` entry.
 */
export function printedColumns(problem: FitProblem): DDColumn[] {
  return problem.columns.map((hi, c) => {
    const lo = problem.lo?.columns[c] ?? null;
    return lo !== null ? { hi, lo } : new PrintedColumn(hi);
  });
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

/** c·Π x_col^k: the coefficient (an exact double) and the whole powers of columns. */
export interface Monomial {
  coef: number;
  powers: Map<number, number>;
}

/** Largest power evaluated by the table (higher ones go to `compileDD`). */
const MAX_POWER = 64;

/** The term as a monomial in the columns, or null when it is not one. */
export function monomialOf(e: Expr, columns: readonly string[]): Monomial | null {
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
