import { deepEqual, equal, ok } from "node:assert/strict";
import { compileScalar, parseExpression } from "./mod.ts";
import { type ResponseInverse, responseInverse } from "./response_inverse.ts";

function inverse(text: string): ResponseInverse {
  const inv = responseInverse(parseExpression(text), "y");
  if ("reason" in inv) throw new Error(`${text}: ${inv.reason}`);
  return inv;
}

Deno.test("responseInverse() undoes one-to-one transforms: g⁻¹(g(y)) = y", () => {
  const cases = [
    "log(y)",
    "log10(y)",
    "sqrt(y)",
    "1/y",
    "2*y + 1",
    "-y/3",
    "-(y - 1)/3",
    "y^2",
    "y^3",
    "y^0.5",
    "y^-2",
    "exp(y)",
    "2^y",
    "10^y",
    "pow(y, 3)",
    "1/sqrt(y) - 2",
    "tanh(y/4)",
    "atan(y)",
    "log(y/2)^3",
  ];
  for (const text of cases) {
    const inv = inverse(text), g = compileScalar(parseExpression(text), ["y"]);
    for (const y of [0.3, 1.7, 2.5, 4.2]) {
      // Exact arithmetic: g⁻¹(g(y)) = y; each step rounds, so allow a few ulps (1e-14 relative).
      const back = inv(g([y]));
      ok(Math.abs(back - y) <= 1e-14 * y, `${text} at ${y}: ${back}`);
    }
  }
});

Deno.test("responseInverse() gives the closed forms e^z, 10^z, z², 1/z and the identity", () => {
  // Exact arithmetic: the inverses of log, log10, sqrt and 1/y, to the rounding of Math.exp and **.
  ok(Math.abs(inverse("log(y)")(2) / Math.exp(2) - 1) < 1e-15);
  ok(Math.abs(inverse("log10(y)")(-1.5) / 10 ** -1.5 - 1) < 1e-15);
  equal(inverse("sqrt(y)")(3), 9); // exact arithmetic: 3² = 9
  equal(inverse("1/y")(4), 0.25); // exact arithmetic: 1/4
  equal(inverse("1/y")(-4), -0.25); // exact arithmetic: 1/−4
  equal(inverse("y")(4), 4); // exact arithmetic: the bare column
  equal(inverse("10^y")(1000), 3); // exact arithmetic: log10 1000 = 3
});

Deno.test("responseInverse() maps the transform's range back and gives NaN outside it", () => {
  // The three cases the copies in compare, chart and predict disagreed on:
  equal(inverse("y^3")(-8), -2); // exact arithmetic: (−2)³ = −8, odd powers are one-to-one
  ok(Number.isNaN(inverse("sqrt(y)")(-2)), "exact arithmetic: no real y has sqrt(y) = −2");
  // Exact arithmetic: atan(tan 1) = 1 and |atan y| < π/2 for every real y.
  equal(inverse("atan(y)")(1), Math.tan(1));
  ok(Number.isNaN(inverse("atan(y)")(2)));
  // Even powers: y ≥ 0 assumed (common practice, no source): the root ≥ 0, none below 0.
  equal(inverse("y^2")(4), 2);
  ok(Number.isNaN(inverse("y^2")(-4)));
  ok(Number.isNaN(inverse("y^-2")(0)), "exact arithmetic: y^-2 is never 0");
  ok(Number.isNaN(inverse("y^0.5")(-3)), "exact arithmetic: y^0.5 is never negative");
  equal(inverse("y^-1")(-0.5), -2); // exact arithmetic: 1/(−2) = −0.5
  ok(Number.isNaN(inverse("y^-1")(0)), "exact arithmetic: 1/y is never 0");
  // Exact arithmetic: the ranges of exp, 2^y, 1/y and tanh exclude these values.
  for (
    const [text, v] of [["exp(y)", 0], ["exp(y)", -1], ["2^y", -1], ["1/y", 0], ["tanh(y)", 1]]
  ) {
    ok(Number.isNaN(inverse(text as string)(v as number)), `${text} at ${v}`);
  }
});

Deno.test("responseInverse() gives a reason for a transform it cannot undo", () => {
  const reason = (text: string) => {
    const inv = responseInverse(parseExpression(text), "y");
    return "reason" in inv ? inv.reason : null;
  };
  for (const text of ["y + y^2", "y*y", "a*y"]) {
    equal(reason(text), 'the response uses column "y" more than once or with parameters', text);
  }
  for (const fn of ["abs", "sin", "cos", "tan"]) {
    equal(reason(`${fn}(y)`), `${fn}() of the response is not one-to-one`);
  }
  equal(reason("max(y, 1)"), "max() of the response is not one-to-one");
  equal(reason("0*y"), "the response is multiplied by 0");
  equal(reason("y^0"), "the response is raised to the power 0");
  equal(reason("1^y"), "the response is a power of 1, which is not one-to-one");
  equal(reason("x"), 'the response does not reduce to column "y"');
});

Deno.test("compare, chart and predict back-transform through responseInverse and no copy of it", async () => {
  // The users sit in cells/, which kernel code may not import (test/architecture): read their text.
  const users = [
    "cells/compare/original_scale.ts",
    "cells/chart/_fit_layers.ts",
    "cells/predict/response_scale.ts",
  ];
  const root = new URL("../../", import.meta.url);
  for (const path of users) {
    const text = await Deno.readTextFile(new URL(path, root));
    ok(
      /import \{[^}]*\bresponseInverse\b[^}]*\} from "\.\.\/\.\.\/kernel\/expr\/mod\.ts"/.test(
        text,
      ),
      path,
    );
    ok(/\bresponseInverse\(/.test(text), `${path} calls it`);
  }
  const copies: string[] = [];
  for (const kind of ["compare", "chart", "predict"]) {
    for await (const e of Deno.readDir(new URL(`cells/${kind}/`, root))) {
      const text = await Deno.readTextFile(new URL(`cells/${kind}/${e.name}`, root));
      if (/function (inverseOf|invert)\(/.test(text)) copies.push(`${kind}/${e.name}`);
    }
  }
  deepEqual(copies, []);
});
