import { equal, ok } from "node:assert/strict";
import { parseModel } from "../../kernel/expr/mod.ts";
import type { CalcSpec } from "./spec.ts";
import { checkModule, runModule, typeOf } from "./program.ts";

const spec = (code: string): CalcSpec => ({
  reads: [{ cell: "power", as: "power", offset: 7 }],
  gives: "value",
  seconds: 10,
  memoryMb: 256,
  code,
  codeOffset: 0,
});

Deno.test("typeOf() merges an array of objects with the same keys into one object type", () => {
  const t = typeOf([{ name: "a", se: 1 }, { name: "b", se: null }]);
  equal(t, 'readonly { readonly "name": string; readonly "se": number | null }[]');
  equal(typeOf([1, "x", null]), "readonly (number | string | null)[]");
  equal(typeOf([]), "readonly never[]");
});

Deno.test("checkModule() declares the inputs and puts the code's first line where it says", () => {
  const model = parseModel("capacity = q0 - a*cycle^b", ["capacity", "cycle"]);
  const inputs = [{
    as: "power",
    data: { r2: 0.99 },
    model: { rhs: model.rhs, columns: model.columns, parameters: model.parameters },
  }];
  const { text, firstLine } = checkModule(spec("return power.r2;\n"), inputs);
  equal(text.split("\n")[firstLine - 1], "return power.r2;");
  ok(text.includes('declare const power: { readonly "r2": number } & { readonly estimates:'));
  ok(text.includes('evaluate(at: { readonly "cycle": number }'));
});

Deno.test("runModule() evaluates a fit's model at a point from its estimates, overridable", async () => {
  // Exact arithmetic: 2500 - 10*100^0.5 = 2400; with a = 20: 2300.
  const model = parseModel("capacity = q0 - a*cycle^b", ["capacity", "cycle"]);
  const inputs = [{
    as: "power",
    data: {},
    model: { rhs: model.rhs, columns: model.columns, parameters: model.parameters },
  }];
  const text = runModule(
    spec("const power = 1; return [arguments.length, power];\n"),
    inputs,
  );
  equal(text.split("\n")[1], "const power = 1; return [arguments.length, power];");
  const js = runModule(
    spec("return [power.evaluate({ cycle: 100 }), power.evaluate({ cycle: 100 }, { a: 20 })];\n"),
    inputs,
  );
  const url = "data:application/typescript;base64," + btoa(js);
  const mod = await import(url);
  const out = await mod.default({ power: { estimates: { q0: 2500, a: 10, b: 0.5 } } });
  equal(out[0], 2400);
  equal(out[1], 2300);
});
