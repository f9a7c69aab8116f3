/**
 * Benchmarks of QR least squares on seeded problems: y = X·β + noise with an
 * intercept and 9 standard normal predictors (10 columns).
 *
 * Run: deno bench kernel/linalg/qr_bench.ts
 */
import { leastSquares } from "./least_squares.ts";
import { householderQR } from "./householder_qr.ts";
import { seededRandom } from "./_random.ts";

function problem(m: number, p: number, seed: number) {
  const rnd = seededRandom(seed);
  const cols = Array.from(
    { length: p },
    (_, j) => Float64Array.from({ length: m }, () => (j === 0 ? 1 : rnd.normal())),
  );
  const y = new Float64Array(m);
  cols.forEach((c, j) => c.forEach((v, i) => (y[i] += (j + 1) * v)));
  for (let i = 0; i < m; i++) y[i] += 0.1 * rnd.normal();
  const names = cols.map((_, j) => `x${j}`);
  return { cols, y, names };
}

const small = problem(10_000, 10, 1);
const large = problem(1_000_000, 10, 2);
const packed = new Float64Array(large.cols.length * large.y.length);
large.cols.forEach((c, j) => packed.set(c, j * large.y.length));

Deno.bench({ name: "leastSquares 10,000 × 10", group: "least squares", baseline: true }, () => {
  leastSquares(small.cols, small.y, small.names);
});

Deno.bench({ name: "leastSquares 1,000,000 × 10", group: "least squares" }, () => {
  leastSquares(large.cols, large.y, large.names);
});

Deno.bench({ name: "householderQR 1,000,000 × 10 (factor only)", group: "factor" }, () => {
  householderQR(packed, large.y.length, large.cols.length);
});
