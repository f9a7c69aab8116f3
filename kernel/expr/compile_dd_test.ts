import assert from "node:assert/strict";
import { compileDD } from "./compile_dd.ts";
import { compile } from "./compile.ts";
import { parseExpression } from "./parse_expression.ts";
import { ExprError } from "./expr_error.ts";
import { rng } from "./_testing.ts";
import * as D from "./_dd_math.ts";
import * as F from "./_fixed_reference.ts";

/** Evaluates `text` in one variable x = hi + lo and returns the fixed-point value. */
function evalDD(text: string, hi: number, lo = 0): bigint {
  const f = compileDD(parseExpression(text), ["x"], []);
  const r = f([[hi]], [[lo]], [], null, 1);
  return F.fromDD(r.hi[0], r.lo[0]);
}

Deno.test("_dd_math constants pi, e, ln 2 and ln 10 agree with their printed digits", () => {
  const digits = (c: readonly [number, number], text: string) => {
    // decimal text → fixed point exactly enough: digits·2^S / 10^k
    const [int, frac] = text.split(".");
    const k = BigInt(frac.length);
    const v = (BigInt(int + frac) << F.S) / 10n ** k;
    return F.relError(F.fromDD(c[0], c[1]), v);
  };
  // from memory: π, e, ln 2, ln 10 to 34 significant digits
  assert.ok(digits(D.PI, "3.141592653589793238462643383279503") < 1e-31);
  assert.ok(digits(D.E, "2.718281828459045235360287471352662") < 1e-31);
  assert.ok(digits(D.LN2, "0.6931471805599453094172321214581766") < 1e-31);
  assert.ok(digits(D.LN10, "2.302585092994045684017991454684364") < 1e-31);
});

Deno.test("compileDD() + - * / agree exactly enough with 320-bit rationals", () => {
  // Exact arithmetic on the parts (common practice, no source): the DD result
  // must be within a few 2^-104 of the exact value.
  const rand = rng(7);
  for (let k = 0; k < 200; k++) {
    const a = (rand() - 0.5) * 10 ** Math.floor(rand() * 8 - 4);
    const b = (rand() - 0.5) * 10 ** Math.floor(rand() * 8 - 4);
    const al = a * 2 ** -60 * rand(), bl = b * 2 ** -60 * rand();
    const f = (op: string) => {
      const c = compileDD(parseExpression(`x ${op} y`), ["x", "y"], []);
      const r = c([[a], [b]], [[al], [bl]], [], null, 1);
      return F.fromDD(r.hi[0], r.lo[0]);
    };
    const A = F.fromDD(a, al), B = F.fromDD(b, bl);
    assert.ok(F.relError(f("+"), A + B) < 1e-30 || A + B === 0n, "sum");
    assert.ok(F.relError(f("*"), F.mul(A, B)) < 1e-30, "product");
    assert.ok(F.relError(f("/"), F.div(A, B)) < 1e-30, "quotient");
  }
});

Deno.test("compileDD() elementary functions reach 1e-30 against 320-bit series", () => {
  // Reference: _fixed_reference.ts (textbook series at 320 bits, common practice).
  const cases: [string, (x: bigint) => bigint, number[]][] = [
    ["exp(x)", F.exp, [-30.5, -1, -1e-5, 0.001, 0.5, 1, 2.75, 10, 100.25, 700]],
    ["log(x)", F.log, [1e-10, 0.001, 0.5, 0.9, 1.5, 2, 10, 12345.678, 1e100]],
    ["sin(x)", (x) => F.sinCos(x)[0], [-7, -0.3, 1e-8, 0.5, 0.78, 1, 1.6, 3, 10, 100, 1000]],
    ["cos(x)", (x) => F.sinCos(x)[1], [-7, -0.3, 1e-8, 0.5, 0.78, 1, 1.6, 3, 10, 100, 1000]],
    ["tan(x)", (x) => F.div(...F.sinCos(x)), [-1.2, -0.3, 0.01, 0.7, 1.5, 4]],
    ["atan(x)", F.atan, [-50, -1, -0.25, 1e-9, 0.1, 0.5, 1, 1.7, 3, 1e6]],
    ["tanh(x)", (x) => {
      const e2 = F.exp(2n * x);
      return F.div(e2 - F.ONE, e2 + F.ONE);
    }, [-3, -0.04, 1e-6, 0.01, 0.049, 0.051, 0.3, 1, 5, 20]],
    ["sqrt(x)", (x) => F.exp(F.log(x) / 2n), [1e-20, 0.3, 2, 10, 1e15]],
    ["x^2.5", (x) => F.exp((5n * F.log(x)) / 2n), [0.1, 1.5, 7, 300]],
    ["log10(x)", (x) => F.div(F.log(x), F.log(10n * F.ONE)), [0.002, 3, 1e20]],
  ];
  for (const [text, ref, xs] of cases) {
    for (const x of xs) {
      const lo = x * 2 ** -55 / 3; // a non-trivial low part
      const got = evalDD(text, x, lo);
      const want = ref(F.fromDD(x, lo));
      const err = F.relError(got, want);
      // exp(x) is conditioned |x|: its reduction by m·ln 2 costs |x|·1e-32 (see _dd_math.ts)
      const tol = text === "exp(x)" ? 1e-30 * Math.max(1, Math.abs(x) / 10) : 1e-30;
      assert.ok(err < tol, `${text} at ${x}: relative error ${err}`);
    }
  }
});

Deno.test("_dd_math exp() reaches 1e-30 across its reduction by m·ln 2, j/64 and k/4096", () => {
  // Reference: _fixed_reference.ts (the exponential series at 320 bits, common practice).
  // Arguments at the edges of each reduction step (where m, j or k round the other way),
  // and seeded ones over [−40, 40].
  const next = rng(16);
  const xs = [1e-300, -1e-20, 2 ** -14, -(2 ** -14), 1 / 128, -1 / 128, 22.5 / 64, -22.5 / 64];
  for (let m = -50; m <= 50; m += 7) xs.push((m + 0.5) * Math.LN2, (m - 0.5) * Math.LN2);
  for (let j = -22; j <= 22; j += 3) xs.push((j + 0.5) / 64, (j - 0.5) / 64 + 3 * Math.LN2);
  for (let k = -32; k <= 32; k += 5) xs.push(5 / 64 + (k + 0.5) / 4096);
  for (let i = 0; i < 200; i++) xs.push(80 * next() - 40);
  const r = new Float64Array(2);
  for (const x of xs) {
    const lo = x * 2 ** -55 * (next() - 0.5);
    D.exp(x, lo, r);
    const err = F.relError(F.fromDD(r[0], r[1]), F.exp(F.fromDD(x, lo)));
    assert.ok(err < 1e-30 * Math.max(1, Math.abs(x) / 10), `exp at ${x}: relative error ${err}`);
  }
});

Deno.test("compileDD() integer powers are exact repeated products", () => {
  const rand = rng(3);
  for (let k = 0; k < 50; k++) {
    const x = 1 + rand() * 20, lo = x * 2 ** -58 * rand();
    const X = F.fromDD(x, lo);
    let want = F.ONE;
    for (let j = 0; j < 7; j++) want = F.mul(want, X);
    assert.ok(F.relError(evalDD("x^7", x, lo), want) < 1e-30);
    assert.ok(F.relError(evalDD("x^-3", x, lo), F.div(F.ONE, F.mul(X, F.mul(X, X)))) < 1e-30);
  }
});

Deno.test("compileDD() hi parts agree with compile() on the nonlinear models of NIST StRD", () => {
  // The models are those of NIST StRD Lanczos1, ENSO (cos) and Roszman1 (atan);
  // doubles and double-doubles must agree to double precision (common practice).
  const models = [
    "b1*exp(-b2*x) + b3*exp(-b4*x) + b5*exp(-b6*x)",
    "b1 + b2*cos(2*pi*x/12) + b3*sin(2*pi*x/12)",
    "b1 - b2*x - atan(b3/(x-b4))/pi",
    "abs(x - b1) + min(x, b2) - max(x, b2) + tanh(x/b3) + sqrt(x) + log10(x) + tan(x/10)",
  ];
  const params = ["b1", "b2", "b3", "b4", "b5", "b6"];
  const values = [0.0951, 1.0, 0.8607, 3.0, 1.5576, 5.0];
  const xs = Float64Array.from({ length: 25 }, (_, i) => 0.05 * i + 0.01);
  for (const m of models) {
    const e = parseExpression(m);
    const d = compile(e, ["x"], params)([xs], values, xs.length);
    const { hi } = compileDD(e, ["x"], params)([xs], [null], values, null, xs.length);
    for (let i = 0; i < xs.length; i++) {
      assert.ok(Math.abs(hi[i] - d[i]) <= 1e-13 * Math.max(1, Math.abs(d[i])), `${m} row ${i}`);
    }
  }
});

Deno.test("compileDD() reads parameter low parts and writes into given arrays", () => {
  const f = compileDD(parseExpression("a*x"), ["x"], ["a"]);
  const hi = new Float64Array(2), lo = new Float64Array(2);
  const r = f([[1, 2]], [null], [0.1], [2 ** -60], 2, hi, lo);
  assert.equal(r.hi, hi);
  assert.equal(lo[0], 2 ** -60);
  assert.equal(lo[1], 2 ** -59);
});

Deno.test("compileDD() serves columns with and without low parts from one compiled function", () => {
  // Exact arithmetic: 3·(1 + 2^-60) + (1 + 2^-60) = 4 + 2^-58, representable as 4 + 2^-58 in DD.
  const f = compileDD(parseExpression("a*x + x"), ["x"], ["a"]);
  const exact = f([[1, 2]], [null], [3], null, 2);
  assert.deepEqual([...exact.hi, ...exact.lo], [4, 8, 0, 0]);
  const withLo = f([[1, 2]], [[2 ** -60, 0]], [3], null, 2);
  assert.deepEqual([...withLo.hi, ...withLo.lo], [4, 8, 2 ** -58, 0]);
  assert.deepEqual([...f([[1]], [null], [3], null, 1).hi], [4]);
});

Deno.test("compileDD() evaluates the internal ifpos and sign of derivative trees", () => {
  const f = compileDD(parseExpression("ifpos(x - 1, sign(x), -1) * 2"), ["x"], []);
  assert.deepEqual([...f([[0, 3]], [null], [], null, 2).hi], [-2, 2]);
});

Deno.test("compileDD() gives NaN and Infinity as doubles would, without throwing", () => {
  const f = compileDD(parseExpression("log(x) + sqrt(x) + (-x)^0.5"), ["x"], []);
  assert.ok(Number.isNaN(f([[-1]], [null], [], null, 1).hi[0]));
  const g = compileDD(parseExpression("exp(x) + 1/(x - 1000)"), ["x"], []);
  assert.equal(g([[1000]], [null], [], null, 1).hi[0], Infinity);
});

Deno.test("compileDD() throws ExprError for an unknown name and RangeError for bad arguments", () => {
  assert.throws(
    () => compileDD(parseExpression("a*zz"), ["x"], ["a"]),
    (e) =>
      e instanceof ExprError &&
      e.message === 'Unknown name "zz": it is neither a column nor a parameter' && e.offset === 2,
  );
  const f = compileDD(parseExpression("a*x"), ["x"], ["a"]);
  assert.throws(
    () => f([[1]], [null], [1, 2], null, 1),
    (e) => e instanceof RangeError && e.message === "Expected 1 parameters, got 2",
  );
  assert.throws(
    () => f([[1]], [null], [1], null, 2),
    (e) => e instanceof RangeError && e.message === 'Column "x" has 1 rows: 2 needed',
  );
});
