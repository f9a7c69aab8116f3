/**
 * The traces of the Durbin–Watson moments (`durbin_watson.ts`) from the rows
 * of Q₁ taken in order, in one pass with O(p²) memory: no n-long array.
 *
 * With A = DᵀD (D the n − 1 × n first-difference matrix) and Q₁ the
 * orthonormal basis of the design (H = Q₁Q₁ᵀ):
 *
 * ```
 *   G = Q₁ᵀAQ₁ = (DQ₁)ᵀ(DQ₁) = Σₜ δₜδₜᵀ,   δₜ = uₜ₊₁ − uₜ    (uₜ row t of Q₁)
 *   tr(HA)    = tr G
 *   tr(HA·HA) = ‖G‖²_F
 *   tr(HA²)   = Σₖ‖Aqₖ‖²,   (Aqₖ)[t] = δₜ₋₁,ₖ − δₜ,ₖ   (δ₋₁ = δₙ₋₁ = 0)
 * ```
 *
 * (tr(HA²) = tr(Q₁ᵀA²Q₁) by the cyclic property.) Rows come from the basis
 * columns or, without forming Q₁, through the fit's factor (kernel/linalg
 * `qRows`, {@link tracesOfFactor}): O(p²) a row either way, and the
 * factor's route never forms the p n-long columns of Q₁.
 *
 * @module
 */
import { qRows } from "../linalg/q_rows.ts";
import type { TriangularFactor } from "../linalg/mod.ts";

/** The three traces. */
export interface DesignTraces {
  /** tr(HA) = Σₖ qₖᵀAqₖ. */
  trHA: number;
  /** tr(HA²) = Σₖ ‖Aqₖ‖². */
  trHA2: number;
  /** tr(HA·HA) = ‖Q₁ᵀAQ₁‖²_F. */
  trHAHA: number;
}

/** Sums rows of Q₁ pushed in order; `done` gives the traces. */
export class TraceSums {
  // Plain fields, read into locals once a row (private #fields measured slower in this hot loop).
  readonly g: Float64Array;
  readonly prev: Float64Array;
  readonly delta: Float64Array;
  readonly last: Float64Array;
  rows = 0;
  trHA2 = 0;

  /** @param p The number of basis columns (the length of each row). */
  constructor(readonly p: number) {
    this.g = new Float64Array(p * p);
    this.prev = new Float64Array(p);
    this.delta = new Float64Array(p);
    this.last = new Float64Array(p);
  }

  /** Adds the next row u (p entries; read, not kept). */
  push(u: Float64Array): void {
    const p = this.p, g = this.g, prev = this.prev, delta = this.delta, last = this.last;
    if (this.rows++ > 0) {
      let t = this.trHA2;
      for (let k = 0; k < p; k++) {
        const dk = u[k] - last[k], a = prev[k] - dk; // (Aqₖ) at the row before
        t += a * a;
        delta[k] = dk;
      }
      this.trHA2 = t;
      for (let k = 0; k < p; k++) {
        const c = delta[k], o = k * p;
        for (let l = 0; l <= k; l++) g[o + l] += c * delta[l];
        prev[k] = c;
      }
    }
    for (let k = 0; k < p; k++) last[k] = u[k];
  }

  /** The traces of every row pushed. */
  done(): DesignTraces {
    const p = this.p, g = this.g;
    let trHA2 = this.trHA2;
    for (let k = 0; k < p; k++) trHA2 += this.prev[k] ** 2; // (Aqₖ) at the last row: δₙ₋₂
    let trHA = 0, trHAHA = 0;
    for (let k = 0; k < p; k++) {
      trHA += g[k * p + k];
      trHAHA += g[k * p + k] ** 2;
      for (let l = 0; l < k; l++) trHAHA += 2 * g[k * p + l] ** 2;
    }
    return { trHA, trHA2, trHAHA };
  }
}

/**
 * The traces from basis columns.
 *
 * @param basis Orthonormal columns Q₁, each n long.
 * @param n Rows.
 * @returns The traces.
 * @example
 * ```ts
 * import { tracesOfBasis } from "./_dw_traces.ts";
 * // Mean only, n = 3: q = 1/√3 (1, 1, 1), Aq = 0, so every trace is 0 (hand computation).
 * const t = tracesOfBasis([new Float64Array(3).fill(1 / Math.sqrt(3))], 3);
 * if (Math.abs(t.trHA) + Math.abs(t.trHA2) + Math.abs(t.trHAHA) > 1e-30) throw new Error();
 * ```
 */
export function tracesOfBasis(basis: readonly Float64Array[], n: number): DesignTraces {
  const sums = new TraceSums(basis.length), u = new Float64Array(basis.length);
  for (let t = 0; t < n; t++) {
    for (let k = 0; k < basis.length; k++) u[k] = basis[k][t];
    sums.push(u);
  }
  return sums.done();
}

/**
 * The traces through a fit's factor, Q₁'s rows by forward substitution (kernel/linalg `qRows`).
 *
 * @param f R̃ of √W·X·S with its pivot order and scales.
 * @param design The design columns it was made from, by its column numbers.
 * @param weights wᵢ per row, or null.
 * @returns The traces for the column space of the columns the factor covers.
 * @example
 * ```ts
 * import { factorOfQR, householderQR } from "../linalg/mod.ts";
 * import { tracesOfBasis, tracesOfFactor } from "./_dw_traces.ts";
 * // Straight line through x = 0, 1, 2: Q₁ = (1, 1, 1)/√3 and (−1, 0, 1)/√2 (hand computation).
 * const one = Float64Array.of(1, 1, 1), x = Float64Array.of(0, 1, 2);
 * const f = factorOfQR(householderQR(Float64Array.of(...one, ...x), 3, 2), Float64Array.of(1, 1));
 * const a = tracesOfFactor(f, [one, x], null);
 * const b = tracesOfBasis([one.map((v) => v / Math.sqrt(3)), Float64Array.of(-1, 0, 1).map((v) => v / Math.SQRT2)], 3);
 * if (Math.abs(a.trHA - b.trHA) + Math.abs(a.trHA2 - b.trHA2) + Math.abs(a.trHAHA - b.trHAHA) > 1e-14) throw new Error();
 * ```
 */
export function tracesOfFactor(
  f: TriangularFactor,
  design: readonly Float64Array[],
  weights: Float64Array | null,
): DesignTraces {
  const n = design[0].length, sums = new TraceSums(f.p);
  let root: Float64Array | null = null;
  if (weights !== null) {
    root = new Float64Array(n);
    for (let i = 0; i < n; i++) root[i] = Math.sqrt(weights[i]);
  }
  qRows(f, design, n, root, (_, z) => sums.push(z));
  return sums.done();
}
