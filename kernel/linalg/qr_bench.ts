/**
 * Benchmarks of QR least squares on seeded problems: y = X·β + noise with an
 * intercept and 9 standard normal predictors (10 columns). The
 * double-double path (`ddLeastSquares`, used by the fit cell when
 * n·p² ≤ 2e7, see cells/fit/_precise_linear.ts) runs at n = 10,000 and
 * 100,000 with nonzero low parts, beside the double path at the same sizes.
 *
 * Run: deno bench kernel/linalg/qr_bench.ts
 */
import { leastSquares } from "./least_squares.ts";
import { householderQR } from "./householder_qr.ts";
import { ddLeastSquares } from "./dd_least_squares.ts";
import { seededRandom } from "../random.ts";

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
const medium = problem(100_000, 10, 3);

/** The problem as hi + lo pairs: lo a small seeded correction, as decimals give. */
function asDD(pr: ReturnType<typeof problem>, seed: number) {
  const rnd = seededRandom(seed);
  const lo = (v: Float64Array) => v.map((x) => x * 2 ** -54 * rnd.normal());
  return { cols: pr.cols.map((c) => ({ hi: c, lo: lo(c) })), y: { hi: pr.y, lo: lo(pr.y) } };
}
const smallDD = asDD(small, 4), mediumDD = asDD(medium, 5);
const order = Int32Array.from({ length: 10 }, (_, j) => j);
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

Deno.bench({ name: "ddLeastSquares 10,000 × 10", group: "double-double", baseline: true }, () => {
  ddLeastSquares(smallDD.cols, smallDD.y, order);
});

Deno.bench({ name: "ddLeastSquares 100,000 × 10", group: "double-double" }, () => {
  ddLeastSquares(mediumDD.cols, mediumDD.y, order);
});

Deno.bench({ name: "leastSquares 100,000 × 10", group: "double-double" }, () => {
  leastSquares(medium.cols, medium.y, medium.names);
});
