import assert from "node:assert/strict";
import { formatUnit, parseUnit, timesUnit, toFraction } from "./unit.ts";

// Writing of products, quotients and powers of unit symbols: BIPM, The International System
// of Units, 9th ed. (2019), §5.4.3–5.4.6. The round trips are worked by hand.

function written(text: string): string {
  const r = parseUnit(text);
  if (!("unit" in r)) throw new Error(r.error);
  return formatUnit(r.unit);
}

Deno.test("parseUnit() reads products, quotients, powers and superscripts", () => {
  assert.equal(written("kg·m/s^2"), "kg·m/s^2");
  assert.equal(written("kg m s^-2"), "kg·m/s^2");
  assert.equal(written("m s⁻¹"), "m/s");
  assert.equal(written("m²"), "m^2");
  assert.equal(written("mg/(L·h)"), "mg/(L·h)");
  assert.equal(written("cycles^(1/3)"), "cycles^(1/3)");
  assert.equal(written("mAh/cycles^0.5"), "mAh/cycles^0.5");
  assert.equal(written("1/s"), "1/s");
  assert.equal(written("°C"), "°C");
  assert.equal(written("µS/cm"), "µS/cm");
  assert.equal(written("m/m"), "");
  assert.equal(written("1"), "");
});

Deno.test("parseUnit() refuses what it cannot read, naming the place", () => {
  for (
    const [text, why] of [["m^", /power is missing/], ["(m", /not closed/], ["2 m", /number 2/], [
      "m/",
      /symbol is missing/,
    ]] as const
  ) {
    const r = parseUnit(text);
    assert.ok("error" in r, text);
    assert.match((r as { error: string }).error, why);
    assert.match(
      (r as { error: string }).error,
      new RegExp(`^Cannot read the unit "${text.replace(/[()^]/g, "\\$&")}"`),
    );
  }
});

Deno.test("timesUnit() cancels and toFraction() finds exact small fractions", () => {
  const m = parseUnit("m") as { unit: Map<string, [number, number]> };
  assert.equal(formatUnit(timesUnit(m.unit, m.unit, [-1, 1])), "");
  assert.deepEqual(toFraction(0.5), [1, 2]);
  assert.deepEqual(toFraction(-1.5), [-3, 2]);
  assert.deepEqual(toFraction(2 / 3), [2, 3]);
  assert.equal(toFraction(Math.SQRT2), null);
});
