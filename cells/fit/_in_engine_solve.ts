/**
 * From the engine's sums to the estimates (cells/fit/_in_engine.ts): pass
 * 1's counts checked and its means and power-of-two scales; pass 2's Gram
 * matrix G of the augmented design [c₀ | z | zy] in centred coordinates;
 * κ of the centred design from its correlation matrix's eigenvalues (the
 * singular values of a symmetric positive semidefinite matrix, kernel/linalg
 * `singularValues`, one-sided Jacobi); and the solve from a triangular
 * factor R of G (Cholesky's or QR's: RᵀR = G either way): γ by back
 * substitution, (X̃ᵀWX̃)⁻¹ = R₁₁⁻¹R₁₁⁻ᵀ, both mapped back to the model's
 * parameters, and pass 3's SQL of the residual and of the leverage
 * hᵢ = wᵢ‖R₁₁⁻ᵀx̃ᵢ‖² (a sum of squares: no cancellation).
 *
 * @module
 */
import { sqlNumber as sqlLiteral } from "../../kernel/expr/to_sql.ts";
import { quotedList, singularValues } from "../../kernel/linalg/mod.ts";
import type { EngineRows } from "../../kernel/engine/types.ts";
import { countRows } from "./_offsets.ts";
import type { Centring } from "./_in_engine_sql.ts";
import { invertUpper } from "./_in_engine_algebra.ts";
import { type DD, ddAdd, twoProduct } from "../../kernel/dd.ts";
import { type Design, Stop } from "./_in_engine_design.ts";
import type { InEngineRequest } from "./_in_engine.ts";

/** One answer's columns by name, the partitions' rows combined (summed; `max…` columns: max). */
export function combined(got: EngineRows): Map<string, number> {
  const out = new Map<string, number>();
  for (const c of got.columns) {
    if (c.name === "plumb_part") continue;
    if (c.type !== "number") {
      throw new Stop(
        "engine",
        `The database returned "${c.name}" as text, where a sum was expected`,
      );
    }
    const isMax = c.name.startsWith("max_");
    let v = isMax ? -Infinity : 0;
    for (const x of c.values) {
      if (Number.isNaN(x)) continue; // a partition without used rows: NULL
      v = isMax ? Math.max(v, x) : v + x;
    }
    out.set(c.name, v);
  }
  return out;
}

/** The value of a column of a combined answer. */
export function at(m: Map<string, number>, name: string): number {
  const v = m.get(name);
  if (v === undefined) throw new Error(`in-engine fit: no column ${name} in the answer`);
  return v;
}

/** Pass 1's counts, checked. */
export interface Counts {
  rows: number;
  missing: number;
  zeroWeight: number;
  n: number;
  sw: number;
  /** Σ ln wᵢ. */
  slw: number;
}

export function checkCounts(req: InEngineRequest, d: Design, one: Map<string, number>): Counts {
  const { name } = req;
  d.labels.forEach((label, i) => {
    const bad = at(one, `b${i}`);
    if (bad > 0) {
      throw new Stop(
        "data",
        `Cannot fit "${name}": ${label} is not finite in ${countRows(bad)} of the query`,
      );
    }
  });
  const bw = at(one, "bw");
  if (bw > 0) {
    throw new Stop(
      "data",
      `Cannot fit "${name}": weights "${req.weights?.text}" are negative or not finite in ${
        countRows(bw)
      } of the query: a weight must be 0 or more`,
    );
  }
  const c: Counts = {
    rows: at(one, "plumb_rows"),
    missing: at(one, "plumb_missing"),
    zeroWeight: at(one, "zw"),
    n: at(one, "n"),
    sw: at(one, "sw"),
    slw: at(one, "slw"),
  };
  if (c.missing > 0) {
    const culprits = d.sql.columns.filter((_, i) => at(one, `plumb_missing_${i}`) > 0);
    req.warn(
      `${countRows(c.missing)} of the query left out for missing values in ${quotedList(culprits)}`,
    );
  }
  if (c.zeroWeight > 0) {
    req.warn(`${countRows(c.zeroWeight)} left out for weight 0 in "weights"`);
  }
  if (c.n <= d.p) {
    throw new Stop(
      "data",
      `Cannot fit "${name}": the query gives ${countRows(c.n)} to fit ${d.p} ${
        d.p === 1 ? "parameter" : "parameters"
      }; it needs more rows than parameters`,
    );
  }
  return c;
}

/** The value columns: the varying terms, the target, and the response when apart. */
function valueCount(d: Design): number {
  return d.varying.length + 1 + (d.sql.response === null ? 0 : 1);
}

/** Means (with a constant term) and power-of-two scales from pass 1. */
export function centringOf(d: Design, one: Map<string, number>, sw: number): Centring {
  const k = valueCount(d);
  const means = d.constantAt >= 0
    ? Array.from({ length: k }, (_, i) => at(one, `s${i}`) / sw)
    : null;
  const exponents = Array.from({ length: k }, (_, i) => {
    const m = at(one, `max_${i}`);
    return m > 0 && Number.isFinite(m)
      ? Math.max(-1000, Math.min(1000, Math.ceil(Math.log2(m))))
      : 0;
  });
  return { means, exponents };
}

/** The Gram matrix of [c₀ | z | zy] (k×k row-major), TSS, and the unweighted sums for Breusch–Pagan. */
export interface Gram {
  g: Float64Array;
  k: number;
  /** Coordinate of the first varying term (1 with a constant term, else 0). */
  off: number;
  tss: number;
  /** Unweighted: Σz_a·z_b (q×q), Σz_a, rows. */
  plain: { cross: Float64Array; first: Float64Array; n: number };
}

export function gramOf(d: Design, two: Map<string, number>, sw: number, c: Centring): Gram {
  const q = d.varying.length, k = d.p + 1, off = d.constantAt >= 0 ? 1 : 0;
  const g = new Float64Array(k * k);
  const put = (a: number, b: number, v: number) => (g[a * k + b] = g[b * k + a] = v);
  const plainCross = new Float64Array(q * q);
  const weighted = d.sql.weight !== null;
  let i = 0;
  for (let a = 0; a <= q; a++) {
    for (let b = a; b <= q; b++, i++) {
      put(off + a, off + b, at(two, `p${i}`));
      if (a < q && b < q) {
        const u = weighted ? at(two, `u${i}`) : at(two, `p${i}`);
        plainCross[a * q + b] = plainCross[b * q + a] = u;
      }
    }
  }
  if (off === 1) {
    put(0, 0, d.constant * d.constant * sw);
    for (let a = 0; a <= q; a++) put(0, 1 + a, d.constant * at(two, `f${a}`));
  }
  const first = Float64Array.from({ length: q }, (_, a) => at(two, weighted ? `g${a}` : `f${a}`));
  // TSS of the response (zy, or zr when the model has a part free of parameters), unscaled.
  const apart = d.sql.response !== null;
  const ss = apart ? at(two, "rr") : g[k * k - 1];
  const s1 = apart ? at(two, "rf") : at(two, `f${q}`);
  const e = c.exponents[apart ? q + 1 : q];
  const tss = (off === 1 ? ss - s1 * s1 / sw : ss) * 2 ** (2 * e);
  return { g, k, off, tss, plain: { cross: plainCross, first, n: weighted ? at(two, "n") : NaN } };
}

/** κ of the varying terms' correlation matrix (centred on the constant term when there is one). */
export function kappaOf(req: InEngineRequest, d: Design, gram: Gram): number {
  const q = d.varying.length, { g, k, off } = gram;
  if (q === 0) return 1;
  const c = new Float64Array(q * q);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) {
      const v = g[(off + a) * k + off + b];
      c[a * q + b] = off === 1 ? v - g[off + a] * g[off + b] / g[0] : v;
    }
  }
  for (let a = 0; a < q; a++) {
    if (!(c[a * q + a] > 0)) {
      const j = d.varying[a];
      throw new Stop(
        "data",
        `Cannot fit "${req.name}": ${d.labels[a]} is ${
          off === 1 ? "constant" : "0"
        } on every row used, so "${req.model.parameters[j]}" cannot be told apart${
          off === 1 ? ` from "${req.model.parameters[d.constantAt]}"` : ""
        }`,
      );
    }
  }
  const corr = c.map((v, i) =>
    v / Math.sqrt(c[Math.floor(i / q) * (q + 1)] * c[(i % q) * (q + 1)])
  );
  const ev = singularValues(corr, q, q); // symmetric positive semidefinite: the eigenvalues
  return ev[q - 1] > 0 ? Math.sqrt(ev[0] / ev[q - 1]) : Infinity;
}

/** The solve from R: estimates and (XᵀWX)⁻¹ in the model's parameters, and pass 3's SQL. */
export interface Solved {
  estimates: Float64Array;
  /** p×p column-major. */
  unscaled: Float64Array;
  /** ρ², the normal equations' RSS in zy units (pass 3 computes the RSS itself). */
  rho2: number;
  residualSql: string;
  /** The residual from `estimates` in the model's own terms (the refinement's). */
  originalSql: string;
  /** x̃ as SQL: the constant term's literal, z0… */
  coordinates: string[];
  leverageSql: string;
  /** (X̃ᵀWX̃)⁻¹ (P×P row-major) and Mᵀ (p×P row-major): δθ = Mᵀ(X̃ᵀWX̃)⁻¹X̃ᵀWe. */
  inner: Float64Array;
  mt: Float64Array;
}

export function solveFromR(
  req: InEngineRequest,
  d: Design,
  c: Centring,
  r: Float64Array,
  k: number,
  kappa: number,
): Solved {
  const P = k - 1, off = d.constantAt >= 0 ? 1 : 0;
  let big = 0;
  for (let i = 0; i < P; i++) big = Math.max(big, Math.abs(r[i * k + i]));
  for (let i = 0; i < P; i++) {
    // A pivot 1e-13 below the largest: the terms are dependent to working accuracy.
    if (!(Math.abs(r[i * k + i]) > 1e-13 * big)) {
      throw new Stop(
        "data",
        `Cannot fit "${req.name}": the terms are linearly dependent on the rows used (condition number ${
          kappa.toPrecision(2)
        }): ${quotedList(req.model.parameters)} cannot all be estimated`,
      );
    }
  }
  const v = invertUpper(r, P, k); // R₁₁⁻¹
  const gamma = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    let s = 0;
    for (let j = i; j < P; j++) s += v[i * P + j] * r[j * k + P];
    gamma[i] = s;
  }
  // Coordinates x̃ = (c₀, z₀ … z_{q−1}) as SQL; the fitted value and hᵢ = wᵢ‖R₁₁⁻ᵀx̃ᵢ‖².
  const coord = (i: number) => (off === 1 && i === 0 ? null : `z${i - off}`);
  const fitted = Array.from(gamma, (gi, i) => {
    const x = coord(i);
    return x === null ? sqlLiteral(gi * d.constant) : `${sqlLiteral(gi)} * ${x}`;
  });
  const vk = Array.from({ length: P }, (_, col) => {
    const parts: string[] = [];
    for (let l = 0; l <= col; l++) {
      const x = coord(l);
      parts.push(
        x === null
          ? sqlLiteral(v[l * P + col] * d.constant)
          : `${sqlLiteral(v[l * P + col])} * ${x}`,
      );
    }
    return `(${parts.join(" + ")})`;
  });
  const { estimates, unscaled, inner, mt } = toModel(d, c, gamma, v, P);
  const originalSql = originalResidual(d, c, estimates);
  return {
    estimates,
    unscaled,
    rho2: r[P * k + P] * r[P * k + P],
    residualSql: `(zy - (${fitted.join(" + ")}))`,
    originalSql,
    coordinates: Array.from({ length: P }, (_, i) => coord(i) ?? sqlLiteral(d.constant)),
    // power(s, 2), not s * s: PostgreSQL would evaluate the term twice (measured: ~40% of a read).
    leverageSql: `w * (${vk.map((s) => `power(${s}, 2)`).join(" + ")})`,
    inner,
    mt,
  };
}

/**
 * The residual of θ in the model's own terms, centred on pass 1's means with θ's own constant:
 * e = (y − m̃_y) − (K + Σθⱼ(tⱼ − m̃ⱼ)), K = θ₀c₀ + Σθⱼm̃ⱼ − m̃_y summed in double-double
 * (kernel/dd.ts), so that the SQL adds only centred magnitudes and K carries the rounding of
 * θ₀ exactly (θ₀ = 1 beside Σθⱼm̃ⱼ near 10⁶ in Wampler's sets).
 */
function originalResidual(d: Design, c: Centring, theta: Float64Array): string {
  if (d.constantAt < 0 || c.means === null) {
    return `(cy - (${d.varying.map((j, i) => `${sqlLiteral(theta[j])} * c${i}`).join(" + ")}))`;
  }
  const m = c.means, q = d.varying.length;
  let k: DD = twoProduct(theta[d.constantAt], d.constant);
  d.varying.forEach((j, i) => (k = ddAdd(k, twoProduct(theta[j], m[i]))));
  k = ddAdd(k, [-m[q], 0]);
  const slopes = d.varying.map((j, i) => `${sqlLiteral(theta[j])} * (c${i} - ${sqlLiteral(m[i])})`);
  return `((cy - ${sqlLiteral(m[q])}) - (${[sqlLiteral(k[0] + k[1]), ...slopes].join(" + ")}))`;
}

/**
 * From centred, scaled coordinates back to the model's parameters. With x̃ = M·x
 * (x = (c₀, t₁ … t_q) the model's terms; x̃ = (c₀, (t_j − m̃_j)/2^e_j)) and the target
 * scaled by s_y = 2^e_y: θ = s_y·Mᵀγ (+ m̃_y/c₀ on the constant term) and
 * (XᵀWX)⁻¹ = Mᵀ(X̃ᵀWX̃)⁻¹M.
 */
function toModel(
  d: Design,
  c: Centring,
  gamma: Float64Array,
  v: Float64Array,
  P: number,
): { estimates: Float64Array; unscaled: Float64Array; inner: Float64Array; mt: Float64Array } {
  const p = d.p, q = d.varying.length, off = d.constantAt >= 0 ? 1 : 0;
  const mean = (i: number) => (c.means === null ? 0 : c.means[i]);
  const sy = 2 ** c.exponents[q];
  // Mᵀ, p×P row-major: rows the model's parameters, columns the coordinates.
  const mt = new Float64Array(p * P);
  d.varying.forEach((j, i) => (mt[j * P + off + i] = 2 ** -c.exponents[i]));
  if (off === 1) {
    const jc = d.constantAt;
    mt[jc * P] = 1;
    for (let i = 0; i < q; i++) mt[jc * P + 1 + i] = -mean(i) * 2 ** -c.exponents[i] / d.constant;
  }
  const estimates = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let s = 0;
    for (let a = 0; a < P; a++) s += mt[j * P + a] * gamma[a];
    estimates[j] = sy * s;
  }
  if (off === 1) estimates[d.constantAt] += mean(q) / d.constant;
  // (X̃ᵀWX̃)⁻¹ = R₁₁⁻¹R₁₁⁻ᵀ, then Mᵀ·it·M.
  const inner = new Float64Array(P * P);
  for (let a = 0; a < P; a++) {
    for (let b = a; b < P; b++) {
      let s = 0;
      for (let t = b; t < P; t++) s += v[a * P + t] * v[b * P + t];
      inner[a * P + b] = inner[b * P + a] = s;
    }
  }
  const left = new Float64Array(p * P); // Mᵀ·inner
  for (let j = 0; j < p; j++) {
    for (let b = 0; b < P; b++) {
      let s = 0;
      for (let a = 0; a < P; a++) s += mt[j * P + a] * inner[a * P + b];
      left[j * P + b] = s;
    }
  }
  const unscaled = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let b = 0; b < P; b++) s += left[i * P + b] * mt[j * P + b];
      unscaled[j * p + i] = s;
    }
  }
  return { estimates, unscaled, inner, mt };
}

/**
 * One step of iterative refinement of the estimates in the model's own terms (the corrected
 * semi-normal equations: Björck, *Numerical Methods for Least Squares Problems*, SIAM 1996,
 * §6.6.5): with e the residual of θ computed from the model's terms (not the centred ones) and
 * X̃ᵀWe summed by the engine, δθ = Mᵀ(X̃ᵀWX̃)⁻¹X̃ᵀWe. Centring costs the constant term the digits
 * of Σθⱼm̃ⱼ (Wampler's θ₀ = 1 beside terms near 10⁶: 8.6 digits); δθ is small, so the same
 * cancellation in it costs nothing, and the step restores them (12.6).
 *
 * @param s The solve.
 * @param xtwe X̃ᵀWe, P long.
 * @returns The refined estimates and the largest step relative to its estimate.
 */
export function refined(s: Solved, xtwe: Float64Array): { estimates: Float64Array; step: number } {
  const P = xtwe.length, p = s.estimates.length;
  const dg = new Float64Array(P);
  for (let a = 0; a < P; a++) {
    let t = 0;
    for (let b = 0; b < P; b++) t += s.inner[a * P + b] * xtwe[b];
    dg[a] = t;
  }
  const estimates = new Float64Array(p);
  let step = 0;
  for (let j = 0; j < p; j++) {
    let t = 0;
    for (let a = 0; a < P; a++) t += s.mt[j * P + a] * dg[a];
    estimates[j] = s.estimates[j] + t;
    step = Math.max(step, Math.abs(t) / Math.max(Math.abs(estimates[j]), Number.MIN_VALUE));
  }
  return { estimates, step };
}
