/**
 * A linear fit's design rows in double-double on demand, a block of rows at
 * a time, for the refinement of the double path at scale (kernel/linalg
 * `refineLeastSquares`, whose `DDRows` this implements). Monomial terms
 * (`_dd_design.ts`) come from the powers of their columns computed per
 * block by successive double-double products (Dekker 1971, mul2, as
 * kernel/dd.ts `productError` and `fastSumError` compose it), in buffers
 * reused from block to block; any other term is evaluated once by
 * kernel/expr `compileDD` and read. A column whose table kept no
 * corrections has them recovered block by block too (`PrintedColumn`), so
 * the refinement of a million-row fit allocates no column-long arrays. Measured on 1,000,000 rows of
 * polynomial(x, 10): 26–33 ms a pass for the rows, against about 500 ms to
 * evaluate and keep the ten columns in double-double (their 80 MB of low
 * parts alone take about 200 ms to allocate and touch on this project's
 * machines).
 *
 * @module
 */
import { compileDD, type Expr } from "../../kernel/expr/mod.ts";
import { fastSumError, productError } from "../../kernel/dd.ts";
import { type DDRows, ROW_BLOCK } from "../../kernel/linalg/mod.ts";
import type { FitProblem } from "./problem.ts";
import { type DDColumn, type Monomial, monomialOf } from "./_dd_design.ts";
import { PrintedColumn } from "./_printed_lo.ts";

/**
 * The design's rows in double-double on demand (see the module notes).
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
      // A recovered column's corrections are 0 exactly at whole numbers (_printed_lo.ts).
      let a = 0, integers = cols[c] instanceof PrintedColumn || cols[c].lo === null;
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
  // A column used only as itself (k = 1) is not scanned for it: its corrections are what they
  // are either way (0 at whole numbers), and a scan of a million rows cost 5 ms a column.
  const exact = new Set<number>();
  const powered = (m: Monomial) => [...m.powers].some(([, k]) => k >= 2);
  for (const m of plans) {
    if (!("powers" in m) || !powered(m)) continue;
    for (const [c, k] of m.powers) {
      if (scan(c).integers && scan(c).largest ** k < 2 ** 53) exact.add(c);
    }
  }
  for (const m of plans) {
    if (!("powers" in m)) continue;
    for (const [c, k] of m.powers) {
      if (exact.has(c) && !(scan(c).largest ** k < 2 ** 53)) exact.delete(c);
    }
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
  /** A block of corrections per column recovered from its doubles (PrintedColumn). */
  readonly #printed = new Map<number, Float64Array>();

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
    for (const c of top.keys()) if (data[c] instanceof PrintedColumn) this.#printed.set(c, buf());
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
      const x = this.data[c], buf = this.#printed.get(c);
      const xl = buf === undefined
        ? (x.lo === null ? null : x.lo.subarray(start, start + len))
        : (x as PrintedColumn).block(start, len, buf);
      powersOf(x.hi.subarray(start, start + len), xl, len, pw.hi, this.exact.has(c) ? null : pw.lo);
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
 * x^0 … x^top of a block of rows of x (xh + xl), x^k = x^(k−1)·x (Dekker's
 * mul2); with pl null, in double (for whole numbers whose powers are exact).
 */
function powersOf(
  xh: Float64Array,
  xl: Float64Array | null,
  len: number,
  ph: Float64Array[],
  pl: Float64Array[] | null,
): void {
  ph[0].fill(1, 0, len);
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
