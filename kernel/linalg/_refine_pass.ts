/**
 * The pass over the rows of one refinement step of `refine_least_squares.ts`
 * (Björck 1967): the residuals of the augmented system, f = W(b − A·x) − r
 * and g = −Aᵀ·W·r, in double-double, A read a block of rows at a time.
 * Sums carry the exact errors of every product and addition in a second
 * double (Dot2 of Ogita, Rump & Oishi 2005, "Accurate sum and dot product",
 * SIAM J. Sci. Comput. 26), with the error-free transformations of
 * `kernel/dd.ts` (TwoSum, Knuth; TwoProduct, Dekker 1971).
 *
 * @module
 */
import { productError, sumError } from "../dd.ts";
import type { DDVector } from "./dd_least_squares.ts";

/**
 * A's rows on demand, a block of rows at a time, as hi + lo: for designs
 * whose double-double values are cheaper to compute again than to keep (a
 * million rows of x, x², … x¹⁰ are 80 MB of low parts; see
 * cells/fit/_dd_design.ts).
 */
export interface DDRows {
  /**
   * Points hi[j] and lo[j] (j < p) at arrays whose entries 0 … end − start − 1
   * are column j of A on rows start … end − 1 (lo[j] null: exact doubles).
   * The arrays may be reused by the next call.
   */
  block(
    start: number,
    end: number,
    hi: ArrayLike<number>[],
    lo: (ArrayLike<number> | null)[],
  ): void;
}

/** Rows per block of {@link DDRows}. */
export const ROW_BLOCK = 4096;

/** Blocks of columns kept in memory (views, no copies). */
export function columnRows(columns: readonly DDVector[]): DDRows {
  const view = (v: ArrayLike<number>, start: number, end: number) =>
    v instanceof Float64Array ? v.subarray(start, end) : Float64Array.from(v).subarray(start, end);
  return {
    block(start, end, hi, lo) {
      columns.forEach((c, j) => {
        hi[j] = view(c.hi, start, end);
        lo[j] = c.lo === null ? null : view(c.lo, start, end);
      });
    },
  };
}

/** The iterate: x and the whitened residual r, each hi + lo. */
export interface State {
  xh: Float64Array;
  xl: Float64Array;
  rh: Float64Array;
  rl: Float64Array;
}

/** A (by rows), b and the row scales. */
export interface Data {
  rows: DDRows;
  y: DDVector;
  w: ArrayLike<number> | null;
  p: number;
}

/**
 * f = W(b − A·x) − r and g = −Aᵀ·W·r in double-double, one pass over the
 * rows (A·x and Aᵀ·(Wr) accumulated as Dot2 of Ogita, Rump & Oishi 2005:
 * the exact product errors and sum errors carried in a second double).
 */
export function systemResiduals(d: Data, s: State, f: Float64Array): Float64Array | null {
  const m = s.rh.length, p = d.p;
  const ah: ArrayLike<number>[] = new Array(p), bl: (ArrayLike<number> | null)[] = new Array(p);
  const al: ArrayLike<number>[] = new Array(p), zero = new Float64Array(ROW_BLOCK);
  const gh = new Float64Array(p), gl = new Float64Array(p);
  let ok = true;
  for (let start = 0; start < m; start += ROW_BLOCK) {
    const end = Math.min(m, start + ROW_BLOCK);
    d.rows.block(start, end, ah, bl);
    for (let j = 0; j < p; j++) al[j] = bl[j] ?? zero;
    ok = residualsOfBlock(d, s, f, ah, al, gh, gl, start, end) && ok;
  }
  const g = gh.map((v, j) => v + gl[j]);
  return ok && g.every(Number.isFinite) ? g : null;
}

/**
 * The rows start … end − 1 of {@link systemResiduals}: its own function, so
 * that the engine optimises it after a few blocks rather than by on-stack
 * replacement (measured: the first pass over 1,000,000 rows 2–3 times slower
 * as one loop).
 */
function residualsOfBlock(
  d: Data,
  s: State,
  f: Float64Array,
  ah: ArrayLike<number>[],
  al: ArrayLike<number>[],
  gh: Float64Array,
  gl: Float64Array,
  start: number,
  end: number,
): boolean {
  const p = d.p, { xh, xl, rh, rl } = s, yh = d.y.hi, yl = d.y.lo, w = d.w;
  let ok = true;
  for (let i = start; i < end; i++) {
    const ii = i - start;
    // q = W·r for g; both sums read each A entry once
    let qh = rh[i], ql = rl[i];
    const wi = w === null ? 1 : w[i];
    if (w !== null) {
      const rq = qh * wi;
      ql = productError(qh, wi, rq) + ql * wi;
      qh = rq;
    }
    let h = yh[i], l = yl === null ? 0 : yl[i];
    for (let j = 0; j < p; j++) {
      const a = ah[j][ii], lo = al[j][ii], b = xh[j], q = a * b, t = h - q;
      l += sumError(h, -q, t) - (productError(a, b, q) + (a * xl[j] + lo * b));
      h = t;
      const q2 = a * qh, g = gh[j], t2 = g - q2;
      gl[j] += sumError(g, -q2, t2) - (productError(a, qh, q2) + (a * ql + lo * qh));
      gh[j] = t2;
    }
    if (w !== null) {
      const th = h * wi;
      l = productError(h, wi, th) + l * wi;
      h = th;
    }
    const t = h - rh[i];
    f[i] = t + (sumError(h, -rh[i], t) + (l - rl[i]));
    ok &&= Number.isFinite(f[i]);
  }
  return ok;
}
