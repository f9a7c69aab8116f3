import assert from "node:assert/strict";
import { hatValues } from "./leverage.ts";
import { studentizedResiduals } from "./studentized_residuals.ts";
import { cooksDistance } from "./cooks_distance.ts";
import { dffits } from "./dffits.ts";

const x = [1, 2, 3, 4, 5, 6], y = [1.2, 1.9, 3.4, 3.8, 5.5, 5.7];

/** Straight-line least squares by the centred hand formulas. */
function line(xs: number[], ys: number[]) {
  const n = xs.length, mx = xs.reduce((a, b) => a + b) / n, my = ys.reduce((a, b) => a + b) / n;
  let sxy = 0, sxx = 0;
  xs.forEach((v, i) => {
    sxy += (v - mx) * (ys[i] - my);
    sxx += (v - mx) ** 2;
  });
  const b = sxy / sxx;
  return { a: my - b * mx, b };
}

Deno.test("studentizedResiduals(), cooksDistance() and dffits() agree with leave-one-out refits", () => {
  // Definitions by refitting without row k (Belsley, Kuh & Welsch 1980, §2.1; Cook 1977).
  const f = line(x, y), n = 6, p = 2;
  const e = new Float64Array(y.map((v, i) => v - f.a - f.b * x[i]));
  const h = hatValues([new Float64Array(n).fill(1), new Float64Array(x)], null);
  const st = studentizedResiduals(e, h, p, null);
  const cd = cooksDistance(st.internal, h, p), df = dffits(st.external, h);
  const s2 = e.reduce((a, v) => a + v * v, 0) / (n - p);
  for (let k = 0; k < n; k++) {
    const xs = x.filter((_, i) => i !== k), ys = y.filter((_, i) => i !== k);
    const g = line(xs, ys);
    const s2k = ys.reduce((a, v, i) => a + (v - g.a - g.b * xs[i]) ** 2, 0) / (n - 1 - p);
    const t = e[k] / Math.sqrt(s2k * (1 - h[k]));
    assert.ok(Math.abs(st.external[k] - t) < 1e-12, `external ${k}`);
    // Cook's D = Σ(ŷᵢ − ŷᵢ₍ₖ₎)²/(p·s²); DFFITS = (ŷₖ − ŷₖ₍ₖ₎)/(s₍ₖ₎√hₖ).
    let d = 0;
    x.forEach((v) => d += (f.a + f.b * v - g.a - g.b * v) ** 2);
    assert.ok(Math.abs(cd[k] - d / (p * s2)) < 1e-12, `cook ${k}`);
    const dfk = (f.a + f.b * x[k] - g.a - g.b * x[k]) / Math.sqrt(s2k * h[k]);
    assert.ok(Math.abs(df[k] - dfk) < 1e-12, `dffits ${k}`);
    assert.ok(Math.abs(st.internal[k] - e[k] / Math.sqrt(s2 * (1 - h[k]))) < 1e-14);
  }
});

Deno.test("studentizedResiduals() gives NaN at leverage 1 and refuses n ≤ p", () => {
  const st = studentizedResiduals(
    new Float64Array([1, -1, 0]),
    new Float64Array([0.5, 0.5, 1]),
    2,
    null,
  );
  assert.ok(Number.isNaN(st.internal[2]));
  assert.ok(Number.isNaN(st.external[2]));
  assert.ok(Number.isNaN(cooksDistance(st.internal, new Float64Array([0.5, 0.5, 1]), 2)[2]));
  assert.ok(Number.isNaN(dffits(st.external, new Float64Array([0.5, 0.5, 1]))[2]));
  assert.ok(Number.isFinite(st.internal[0])); // n − p − 1 = 0: every external residual is NaN
  assert.throws(() => studentizedResiduals(new Float64Array(2), new Float64Array(2), 2, null), {
    name: "RangeError",
    message: "Cannot studentize residuals: 2 rows for 2 parameters",
  });
});
