import assert from "node:assert/strict";
import { parseModel } from "../expr/mod.ts";
import { modelUnits } from "./model_units.ts";

// Every expected unit below is worked by hand from the rule that only quantities of one
// kind add and that functions such as exp and log take pure numbers (Bridgman 1922, ch. 1;
// from memory), with the SI Brochure's way of writing products and quotients (BIPM 2019 §5.4).

function unitsOf(
  text: string,
  units: Record<string, string | null>,
): Record<string, unknown> {
  const model = parseModel(text, Object.keys(units));
  const u = modelUnits(model, new Map(Object.entries(units)));
  assert.deepEqual(Object.fromEntries(u.columns), units);
  return {
    ...Object.fromEntries(
      [...u.parameters].map(([p, v]) => [p, v.unit ?? (v.note ? `? ${v.note}` : null)]),
    ),
    response: u.response,
    warnings: u.warnings.map((w) => w.message),
  };
}

Deno.test("modelUnits() gives a square-root fade law's parameters their units", () => {
  const u = unitsOf("capacity = q0 - a*sqrt(cycle)", { capacity: "mAh", cycle: "cycles" });
  assert.deepEqual(u, { q0: "mAh", a: "mAh/cycles^0.5", response: "mAh", warnings: [] });
});

Deno.test("modelUnits() reads exponential decay, a saturation law and a polynomial shorthand", () => {
  assert.deepEqual(unitsOf("c = c0*exp(-k*t)", { c: "mg/L", t: "h" }), {
    c0: "mg/L",
    k: "1/h",
    response: "mg/L",
    warnings: [],
  });
  assert.deepEqual(unitsOf("rate = vmax*s/(km + s)", { rate: "mM/min", s: "mM" }), {
    vmax: "mM/min",
    km: "mM",
    response: "mM/min",
    warnings: [],
  });
  assert.deepEqual(unitsOf("signal = polynomial(conc, 2)", { signal: "mAU", conc: "mg/L" }), {
    b0: "mAU",
    b1: "mAU·L/mg",
    b2: "mAU·L^2/mg^2",
    response: "mAU",
    warnings: [],
  });
});

Deno.test("modelUnits() names the term whose units cannot agree", () => {
  const u = unitsOf("capacity = q0 + a*cycle + cycle", { capacity: "mAh", cycle: "cycles" });
  const w = u.warnings as string[];
  assert.equal(w.length, 1);
  assert.match(w[0], /^Units in ".*cycle" do not agree: its terms differ by /);
  const log = unitsOf("y = a + b*log(x)", { y: "V", x: "s" });
  assert.deepEqual(log.warnings, [
    `"x" has the unit s, but the argument of log must be a pure number`,
  ]);
  const e = unitsOf("y = a*exp(t)", { y: "V", t: "s" });
  assert.deepEqual(e.warnings, [
    `"t" has the unit s, but the argument of exp must be a pure number`,
  ]);
});

Deno.test("modelUnits() reads a number in a sum in the unit of the other term", () => {
  assert.deepEqual(
    unitsOf("rate = r0 + c*(temperature - 15)", { rate: "kPa/h", temperature: "°C" }),
    {
      r0: "kPa/h",
      c: "kPa/(h·°C)",
      response: "kPa/h",
      warnings: [],
    },
  );
});

Deno.test("modelUnits() says why a unit cannot be derived", () => {
  const power = unitsOf("force = a*x^b", { force: "N", x: "m" });
  assert.equal(power.b, null, "a fitted exponent is a pure number");
  assert.equal(power.a, `? "x^b" raises a quantity with a unit to a fitted power`);
  const bare = unitsOf("y = a + b*x", { y: "mAh", x: null });
  assert.equal(bare.a, "mAh");
  assert.equal(bare.b, `? column "x" has no unit`);
  const scaled = unitsOf("y = a*(x/x0)^n", { y: "N", x: "m" });
  assert.deepEqual(
    [scaled.a, scaled.x0, scaled.n],
    ["N", "m", null],
    "the base of a fitted power is a pure number",
  );
});

Deno.test("modelUnits() says nothing without units and reads a log response as a pure number", () => {
  assert.deepEqual(unitsOf("y = a + b*x", { y: null, x: null }), {
    a: null,
    b: null,
    response: null,
    warnings: [],
  });
  assert.deepEqual(unitsOf("log(c) = a - k*t", { c: "mg/L", t: "h" }), {
    a: null,
    k: "1/h",
    response: null,
    warnings: [],
  });
});
