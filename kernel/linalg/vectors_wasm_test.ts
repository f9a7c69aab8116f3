/**
 * The Householder QR's loops in WebAssembly (`vectors.wat`,
 * `_wasm_vectors.ts`): the committed bytes are what the text assembles to,
 * and a factorization, Qᵀy and least squares come out the same bit for bit
 * whether the design lives in WebAssembly memory or in a plain array (exact:
 * the JavaScript loops are the reference).
 *
 * @module
 */
import assert from "node:assert/strict";
import { buildWasm, SOURCES } from "../wasm/build.ts";
import { mulberry32 } from "../random.ts";
import { VECTORS_WASM } from "./_vectors_bytes.ts";
import { kernelsOf, vectorsForTests, wasmMatrix } from "./_wasm_vectors.ts";
import { blockedDot } from "./_householder.ts";
import { leastSquares } from "./least_squares.ts";

Deno.test("_vectors_bytes.ts is what vectors.wat assembles to", async () => {
  const source = SOURCES.find((s) => s.name === "VECTORS_WASM")!;
  assert.equal(await buildWasm(source.wat), VECTORS_WASM, "run kernel/wasm/build.ts after editing");
});

function identical(a: ArrayLike<number>, b: ArrayLike<number>, what: string): void {
  assert.equal(a.length, b.length, what);
  for (let i = 0; i < a.length; i++) {
    if (!Object.is(a[i], b[i])) assert.fail(`${what}[${i}]: ${a[i]} against ${b[i]}`);
  }
}

Deno.test("blockedDot() in WebAssembly memory sums as the loop does, at every length and offset", () => {
  const next = mulberry32(3);
  const a = wasmMatrix(1 << 17, 0);
  assert.ok(kernelsOf(a) !== undefined, "a WebAssembly matrix");
  for (let i = 0; i < a.length; i++) a[i] = (next() - 0.5) * 2 ** Math.floor(next() * 40 - 20);
  const plain = a.slice();
  for (const len of [1025, 1026, 4097, 65_536 + 3, 70_001, 131_000]) {
    for (const [xo, yo] of [[0, 0], [1, 2], [7, 7], [13, 0]]) {
      const w = blockedDot(a, xo, a, yo, len), j = blockedDot(plain, xo, plain, yo, len);
      assert.ok(Object.is(w, j), `len ${len} at ${xo}, ${yo}: ${w} against ${j}`);
    }
  }
});

Deno.test("leastSquares() gives the same bits with its design in WebAssembly memory or not", () => {
  const next = mulberry32(11);
  for (const [m, p] of [[70_000, 3], [20_001, 7], [9_000, 11]]) {
    const columns = Array.from({ length: p }, (_, j) => {
      const c = new Float64Array(m);
      for (let i = 0; i < m; i++) c[i] = j === 0 ? 1 : (next() - 0.5) * 10 ** (j / 3);
      return c;
    });
    // A column nearly a combination of two others: pivoting and small pivots both exercised.
    if (p > 3) {
      for (let i = 0; i < m; i++) {
        columns[p - 1][i] = columns[1][i] - 2 * columns[2][i] + 1e-9 * next();
      }
    }
    const y = new Float64Array(m);
    for (let i = 0; i < m; i++) y[i] = columns.reduce((s, c, j) => s + c[i] * (j + 1), 0) + next();
    const names = columns.map((_, j) => `x${j}`);
    vectorsForTests.wasm = false;
    const js = leastSquares(columns, y, names);
    vectorsForTests.wasm = true;
    const wasm = leastSquares(columns, y, names);
    assert.ok(kernelsOf(wasm.qr.qr) !== undefined, `${m}×${p}: the design in WebAssembly memory`);
    assert.ok(kernelsOf(js.qr.qr) === undefined);
    identical(wasm.qr.qr, js.qr.qr, `${m}×${p} factor`);
    identical(wasm.qr.tau, js.qr.tau, `${m}×${p} tau`);
    identical(wasm.qr.perm, js.qr.perm, `${m}×${p} perm`);
    assert.ok(wasm.fullRank && js.fullRank);
    identical(wasm.coefficients, js.coefficients, `${m}×${p} coefficients`);
    identical(wasm.qty, js.qty, `${m}×${p} Qᵀy`);
    assert.ok(Object.is(wasm.rss, js.rss));
  }
});
