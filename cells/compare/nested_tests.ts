/**
 * Extra-sum-of-squares F tests for every nested pair of linear fits.
 *
 * Nesting is decided numerically, not by names: fit S (mean space
 * offset_S + span X_S) lies inside fit L when every column of X_S and the
 * offset difference offset_S − offset_L lie in span X_L (column-space
 * inclusion via the pivoted Householder QR of X_L, kernel/linalg
 * `inColumnSpace`; Golub & Van Loan, *Matrix Computations*, 4th ed.,
 * §5.4.1). Weights do not change the inclusion (√W is invertible) and enter
 * through the weighted RSS.
 *
 * Test (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §6.1 from
 * memory for the section): F = ((RSS_S − RSS_L)/(p_L − p_S)) / (RSS_L/(n − p_L))
 * against F(p_L − p_S, n − p_L), upper tail (kernel/stats `fisherF`). Both
 * fits must model the same transformed response on the same rows.
 *
 * @module
 */
import { householderQR, inColumnSpace, type QRFactorization } from "../../kernel/linalg/mod.ts";
import { fisherF } from "../../kernel/stats/mod.ts";
import type { Candidate } from "./comparable.ts";

/** One nested comparison (RUN-JSON `nested_tests`; `ss_extra` is our addition). */
export interface NestedTest {
  smaller: string;
  larger: string;
  /** Null when RSS of the larger fit is 0. */
  f: number | null;
  df1: number;
  df2: number;
  p_value: number | null;
  /** RSS_S − RSS_L. */
  ss_extra: number;
}

/** Relative tolerance of the column-space inclusion (common practice, no source). */
export const NESTING_TOLERANCE = 1e-8;

/**
 * F tests for every pair of linear fits where one is nested in the other.
 *
 * @param all The candidates (already checked comparable), in the order listed.
 * @returns One test per nested pair, in the order the smaller fit is listed, then the larger.
 * @example
 * ```ts
 * import { nestedTests } from "./nested_tests.ts";
 * if (nestedTests([]).length !== 0) throw new Error("no fits, no tests");
 * ```
 */
export function nestedTests(all: readonly Candidate[]): NestedTest[] {
  const out: NestedTest[] = [];
  // One factorization per larger fit, shared by every smaller one tested against it.
  const factors = new Map<Candidate, QRFactorization>();
  for (const s of all) {
    for (const l of all) {
      if (s === l || !isNestedIn(s, l, factors)) continue;
      out.push(fTest(s, l));
    }
  }
  return out;
}

/**
 * Whether the mean space of `s` lies inside that of `l` with fewer parameters.
 *
 * @param s The smaller candidate.
 * @param l The larger candidate.
 * @param factors A cache of the larger fits' factorizations (optional).
 * @returns True when nested.
 */
export function isNestedIn(
  s: Candidate,
  l: Candidate,
  factors: Map<Candidate, QRFactorization> = new Map(),
): boolean {
  const fs = s.fit, fl = l.fit;
  if (fs.method !== "linear" || fl.method !== "linear") return false;
  if (fs.parameters.length >= fl.parameters.length) return false;
  if (!sameValues(fs.y, fl.y)) return false;
  const n = fl.y.length;
  let qr = factors.get(l);
  if (qr === undefined) factors.set(l, qr = unitDesignQR(fl.design, n));
  const within = (v: Float64Array) => inColumnSpace(qr, v, NESTING_TOLERANCE);
  if (!fs.design.every(within)) return false;
  const gap = new Float64Array(n);
  for (let i = 0; i < n; i++) gap[i] = (fs.offset?.[i] ?? 0) - (fl.offset?.[i] ?? 0);
  return within(gap);
}

/** Householder QR of a design with unit-length columns. */
function unitDesignQR(design: readonly Float64Array[], n: number): QRFactorization {
  const p = design.length;
  const a = new Float64Array(n * p);
  design.forEach((c, j) => a.set(unit(c), j * n));
  return householderQR(a, n, p);
}

function fTest(s: Candidate, l: Candidate): NestedTest {
  const rs = s.fit.statistics.rss, rl = l.fit.statistics.rss;
  const df1 = l.fit.parameters.length - s.fit.parameters.length;
  const df2 = l.fit.statistics.dfResidual;
  const ssExtra = rs - rl;
  const f = (ssExtra / df1) / (rl / df2);
  const finite = Number.isFinite(f);
  return {
    smaller: s.name,
    larger: l.name,
    f: finite ? f : null,
    df1,
    df2,
    p_value: finite && df2 > 0 ? fisherF(df1, df2).upper(f) : null,
    ss_extra: ssExtra,
  };
}

function unit(c: Float64Array): Float64Array {
  let ss = 0;
  for (const v of c) ss += v * v;
  const norm = Math.sqrt(ss);
  return norm > 0 && Number.isFinite(norm) ? c.map((v) => v / norm) : c;
}

function sameValues(x: Float64Array, y: Float64Array): boolean {
  if (x.length !== y.length) return false;
  for (let i = 0; i < x.length; i++) {
    if (!(Math.abs(x[i] - y[i]) <= 1e-12 * Math.max(1, Math.abs(x[i])))) return false;
  }
  return true;
}
