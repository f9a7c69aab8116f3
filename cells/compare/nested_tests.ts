/**
 * Extra-sum-of-squares F tests for every nested pair of linear fits.
 *
 * Nesting is decided numerically, not by names: fit S (mean space
 * offset_S + span X_S) lies inside fit L when every column of X_S and the
 * offset difference offset_S − offset_L lie in span X_L (column-space
 * inclusion by projection onto an orthonormal basis of span √W·X_L from its
 * pivoted Householder QR; Golub & Van Loan, *Matrix Computations*, 4th ed.,
 * §5.2 and §5.4.1). With positive weights √W does not change the inclusion;
 * rows of weight 0 do not count, as in the fits themselves. Weights enter the
 * test through the weighted RSS.
 *
 * Test (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §6.1 from
 * memory for the section): F = ((RSS_S − RSS_L)/(p_L − p_S)) / (RSS_L/(n − p_L))
 * against F(p_L − p_S, n − p_L), upper tail (kernel/stats `fisherF`). Both
 * fits must model the same transformed response on the same rows.
 *
 * @module
 */
import { applyQtInPlace, type QRFactorization } from "../../kernel/linalg/mod.ts";
import { fisherF } from "../../kernel/stats/mod.ts";
import { fitBasis } from "../fit/mod.ts";
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
  for (const s of all) {
    for (const l of all) {
      if (s === l || !isNestedIn(s, l)) continue;
      out.push(fTest(s, l));
    }
  }
  return out;
}

/**
 * Whether the mean space of `s` lies inside that of `l` with fewer parameters.
 *
 * The larger fit's column space is that of its (√w-scaled) design; a
 * smaller fit's columns and the difference of the offsets are scaled by the
 * same √w (compare accepts only fits with the same weights) and lie inside
 * when what is left after projecting onto that space is at most
 * {@link NESTING_TOLERANCE} of their length. What is left is read through
 * the QR its solver made (`designQR`, full rank): the last m − p entries of
 * Qᵀv (Golub & Van Loan, *Matrix Computations*, 4th ed., §5.3), p
 * reflections of v in a kept buffer, with no basis built (at 100,000 rows
 * building Q₁ of the three larger fits took about 7 ms of each update);
 * otherwise through the orthonormal basis `fitBasis` keeps. A column the larger design holds exactly (or negated), and a
 * zero offset difference, lie inside without a projection: polynomial and
 * other shared terms are computed by the same code from the same data, so
 * most nested pairs are told by comparing values.
 *
 * @param s The smaller candidate.
 * @param l The larger candidate.
 * @returns True when nested.
 */
export function isNestedIn(s: Candidate, l: Candidate): boolean {
  const fs = s.fit, fl = l.fit;
  if (fs.method !== "linear" || fl.method !== "linear") return false;
  if (fs.parameters.length >= fl.parameters.length) return false;
  if (!sameValues(fs.y, fl.y)) return false;
  const n = fl.y.length;
  const w = fl.weights;
  const qr = fl.designQR;
  const full = qr !== undefined && qr.rank === fl.design.length && qr.m === n;
  let basis: Float64Array[] | null = null;
  const within = (v: Float64Array) => {
    // A column the larger design has as it is (or negated) lies in its span: no projection.
    if (fl.design.some((u) => sameOrNegated(u, v)) || isZero(v)) return true;
    if (full) return inSpanOf(qr, v, w, NESTING_TOLERANCE);
    basis ??= fitBasis(fl);
    return inSpan(basis, w ? scaled(v, w) : v, NESTING_TOLERANCE);
  };
  // Last columns first: they are the ones a larger model most often lacks, so a pair that
  // is not nested is usually told by the first test.
  if (![...fs.design].reverse().every(within)) return false;
  // Neither has an offset: their difference is 0, which lies in any span (and a
  // 100,000-row array of zeros made and read for each nested pair cost about 2 ms).
  if (!fs.offset && !fl.offset) return true;
  const gap = new Float64Array(n);
  for (let i = 0; i < n; i++) gap[i] = (fs.offset?.[i] ?? 0) - (fl.offset?.[i] ?? 0);
  return within(gap);
}

/** Whether v equals u or −u value for value (stops at the first difference). */
function sameOrNegated(u: Float64Array, v: Float64Array): boolean {
  if (u.length !== v.length) return false;
  let same = true, negated = true;
  for (let i = 0; i < u.length && (same || negated); i++) {
    same &&= u[i] === v[i];
    negated &&= u[i] === -v[i];
  }
  return same || negated;
}

function isZero(v: Float64Array): boolean {
  for (let i = 0; i < v.length; i++) if (v[i] !== 0) return false;
  return true;
}

/** √wᵢ·vᵢ. */
function scaled(v: Float64Array, w: Float64Array): Float64Array {
  const out = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) out[i] = v[i] * Math.sqrt(w[i]);
  return out;
}

/**
 * Whether ‖v − Q₁Q₁ᵀv‖ ≤ tol·‖v‖ for orthonormal columns Q₁ (true for v = 0):
 * d = Q₁ᵀv in one pass over the rows, then the norm of v − Q₁d in a second.
 * With Q₁ orthonormal to working precision (from Householder QR) one
 * projection leaves an error of order ε·‖v‖, far below `tol` (Golub & Van
 * Loan, *Matrix Computations*, 4th ed., §5.2.8 on classical Gram–Schmidt
 * against an orthonormal set).
 */
function inSpan(basis: readonly Float64Array[], v: Float64Array, tol: number): boolean {
  const n = v.length, p = basis.length;
  const d = new Float64Array(p);
  let all = 0;
  for (let i = 0; i < n; i++) {
    const x = v[i];
    all += x * x;
    for (let k = 0; k < p; k++) d[k] += basis[k][i] * x;
  }
  let out = 0;
  for (let i = 0; i < n; i++) {
    let r = v[i];
    for (let k = 0; k < p; k++) r -= basis[k][i] * d[k];
    out += r * r;
  }
  return Math.sqrt(out) <= tol * Math.sqrt(all);
}

/** The buffer Qᵀv is formed in, kept from call to call (grown when too short). */
let buffer = new Float64Array(0);

/**
 * Whether ‖v − Q₁Q₁ᵀv‖ ≤ tol·‖v‖ (v scaled by √w when weighted), for Q₁ the
 * first p columns of a full-rank QR's Q: with z = Qᵀ(√w·v), what is left is
 * ‖z[p..m)‖ (Q orthogonal), to within ε·‖v‖ from the Householder reflections.
 */
function inSpanOf(
  f: QRFactorization,
  v: Float64Array,
  w: Float64Array | null,
  tol: number,
): boolean {
  const m = v.length;
  if (buffer.length < m) buffer = new Float64Array(m);
  const z = buffer.subarray(0, m);
  let all = 0;
  for (let i = 0; i < m; i++) {
    const x = w ? v[i] * Math.sqrt(w[i]) : v[i];
    z[i] = x;
    all += x * x;
  }
  applyQtInPlace(f, z);
  let out = 0;
  for (let i = f.tau.length; i < m; i++) out += z[i] * z[i];
  return Math.sqrt(out) <= tol * Math.sqrt(all);
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

function sameValues(x: Float64Array, y: Float64Array): boolean {
  if (x.length !== y.length) return false;
  for (let i = 0; i < x.length; i++) {
    if (!(Math.abs(x[i] - y[i]) <= 1e-12 * Math.max(1, Math.abs(x[i])))) return false;
  }
  return true;
}
