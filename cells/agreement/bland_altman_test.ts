/**
 * Bias, limits of agreement and their intervals against Bland & Altman's
 * formulas computed independently here, with and without replicates.
 */
import { equal, ok } from "node:assert/strict";
import { blandAltman, spreadOf } from "./bland_altman.ts";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";

// Invented differences (y − x) of ten samples.
const D = [0.4, -0.2, 0.9, 0.1, 0.5, -0.6, 0.3, 0.8, 0.0, 0.6];
const ONE_EACH = D.map((_, i) => [i]);

Deno.test("blandAltman() without replicates: bias, limits and their t intervals by B&A 1999 §2", () => {
  // Bland & Altman 1986 and 1999 (section numbers from memory): d̄, s, d̄ ± z·s;
  // SE(d̄) = s/√n, SE(limit) = s·√(1/n + z²/(2(n − 1))), intervals ± t(n − 1)·SE.
  const n = D.length, mean = D.reduce((s, v) => s + v, 0) / n;
  const s = Math.sqrt(D.reduce((t, v) => t + (v - mean) ** 2, 0) / (n - 1));
  const z = 1.959963984540054; // Φ⁻¹(0.975), printed normal tables
  const t = studentT(9).quantile(0.975);
  ok(Math.abs(standardNormal.quantile(0.975) - z) < 1e-12);
  ok(Math.abs(t - 2.262157) < 1e-6); // t(0.975, 9), printed t tables to 6 decimals
  const r = blandAltman(D, ONE_EACH, 0.95, 0.95, 1);
  equal(r.replicated, false);
  ok(Math.abs(r.bias - mean) < 1e-15);
  ok(Math.abs(r.sd - s) < 1e-15);
  ok(Math.abs(r.lower - (mean - z * s)) < 1e-14 && Math.abs(r.upper - (mean + z * s)) < 1e-14);
  const seB = s / Math.sqrt(n), seL = s * Math.sqrt(1 / n + z * z / (2 * (n - 1)));
  ok(Math.abs(r.biasCi.lower! - (mean - t * seB)) < 1e-12);
  ok(Math.abs(r.biasCi.upper! - (mean + t * seB)) < 1e-12);
  ok(Math.abs(r.upperCi.lower! - (mean + z * s - t * seL)) < 1e-12);
  ok(Math.abs(r.lowerCi.upper! - (mean - z * s + t * seL)) < 1e-12);
  ok(r.lowerCi.method.includes("Bland–Altman") && r.biasCi.method === "t");
  // The 1986 paper's rule of thumb √(3s²/n) for the limits' SE lies close at 1.96 (B&A 1986).
  ok(Math.abs(seL / Math.sqrt(3 * s * s / n) - 1) < 0.1);
});

Deno.test("blandAltman() limits take the share asked: z = Φ⁻¹((1 + p)/2)", () => {
  // p = 0.9: z = 1.644854 (printed normal tables).
  const r = blandAltman(D, ONE_EACH, 0.9, 0.95, 1);
  ok(Math.abs(r.z - 1.6448536269514722) < 1e-12);
});

Deno.test("spreadOf() with replicates: between plus within by one-way ANOVA (B&A 1999 §5)", () => {
  // Bland & Altman 1999, replicated data in pairs (from memory): s² = (MS_b − MS_w)/m₀ + MS_w.
  // Balanced, three samples of two rows each: worked out here by hand.
  // Sample means 1.1, 0.4, −0.1; grand mean 0.4667; MS_w = Σ(dᵢⱼ − d̄ᵢ)²/(6 − 3),
  // MS_b = 2·Σ(d̄ᵢ − d̄)²/2, m₀ = 2.
  const d = [1.0, 1.2, 0.3, 0.5, -0.2, 0.0];
  const g = [[0, 1], [2, 3], [4, 5]];
  const means = [1.1, 0.4, -0.1], grand = (1.1 + 0.4 - 0.1) / 3;
  const msW = (0.01 + 0.01 + 0.01 + 0.01 + 0.01 + 0.01) / 3;
  const msB = 2 * means.reduce((s, m) => s + (m - grand) ** 2, 0) / 2;
  const sp = spreadOf(d, g);
  ok(Math.abs(sp.bias - grand) < 1e-15);
  ok(Math.abs(sp.msWithin - msW) < 1e-15);
  ok(Math.abs(sp.msBetween - msB) < 1e-14);
  ok(Math.abs(sp.variance - ((msB - msW) / 2 + msW)) < 1e-14);
  // One row per sample: the plain variance of the differences (MS_w = 0, m₀ = 1).
  const plain = spreadOf(D, ONE_EACH);
  const m = D.reduce((s, v) => s + v, 0) / D.length;
  ok(Math.abs(plain.variance - D.reduce((s, v) => s + (v - m) ** 2, 0) / (D.length - 1)) < 1e-15);
});

Deno.test("blandAltman() with replicates: bootstrap limits seeded and around the estimates", () => {
  // Invented: 12 samples in duplicate. Common practice, no source: a percentile interval from
  // 2,000 resamples holds its estimate, and the same seed gives the same limits.
  const d: number[] = [], g: number[][] = [];
  for (let i = 0; i < 12; i++) {
    const base = 0.3 + 0.4 * Math.sin(i * 1.3);
    g.push([d.length, d.length + 1]);
    d.push(base + 0.1 * Math.cos(i), base - 0.1 * Math.cos(i * 2.1));
  }
  const a = blandAltman(d, g, 0.95, 0.95, 7), b = blandAltman(d, g, 0.95, 0.95, 7);
  equal(a.replicated, true);
  equal(a.lowerCi.lower, b.lowerCi.lower);
  ok(a.lowerCi.method.startsWith("bootstrap over samples"));
  ok(a.lowerCi.lower! < a.lower && a.lower < a.lowerCi.upper!);
  ok(a.upperCi.lower! < a.upper && a.upper < a.upperCi.upper!);
  // The bias's t interval with SE √(MS_b/N).
  const sp = spreadOf(d, g), t = studentT(11).quantile(0.975);
  ok(Math.abs(a.biasCi.upper! - (sp.bias + t * Math.sqrt(sp.msBetween / 24))) < 1e-14);
});
