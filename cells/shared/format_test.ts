/**
 * The shared number formatter's rounding rules. Each case names its source:
 * "GUM §7.2.6" is JCGM 100:2008, *Guide to the expression of uncertainty in
 * measurement*, §7.2.6 (the rule and its worked example); "issue 13" are the
 * numbers the project's issue 13 reported as shown wrongly before.
 */
import { deepEqual, equal } from "node:assert/strict";
import {
  distinctTexts,
  formatEstimate,
  formatIntervalAt,
  formatNearOne,
  formatNumber,
  formatP,
  formatR2,
  formatUncertainty,
  uncertaintyPlace,
} from "./format.ts";

Deno.test("formatEstimate() rounds an estimate to its uncertainty's second digit (GUM §7.2.6)", () => {
  // GUM §7.2.6: "if y = 10.057 62 Ω with uc(y) = 27 mΩ, y should be rounded to 10.058 Ω".
  equal(formatEstimate(10.05762, 0.027), "10.058");
  equal(formatUncertainty(0.027), "0.027");
  // GUM §7.2.6: "u(xi) = 28.05 kHz should be rounded down to 28 kHz" (to nearest, as we always do).
  equal(formatUncertainty(28.05), "28");
  // GUM §7.2.6 allows rounding 10.47 mΩ up to 11; we round to nearest: 10 (two digits kept).
  equal(formatUncertainty(10.47), "10");
});

Deno.test("formatIntervalAt() shows a calibration prediction's interval to its digits (issue 13)", () => {
  // issue 13: estimate 138.5 with interval [138.5, 138.5]; true [138.4974, 138.5033].
  // se_fit 0.00147 (two digits: 0.0015, last digit at 1e-4), so four decimals.
  equal(uncertaintyPlace(0.00147), -4);
  equal(formatEstimate(138.50036, 0.00147), "138.5004");
  equal(formatIntervalAt([138.49742, 138.50329], 0.00147, 138.50036), "[138.4974, 138.5033]");
});

Deno.test("formatIntervalAt() keeps trailing zeros of an intercept near 100 (issue 13)", () => {
  // issue 13: an intercept's interval read "99.996 … 100" and the CLI "PI [99.99, 100]".
  const sep = { open: "", sep: " … ", close: "" };
  equal(formatIntervalAt([99.99602, 100.00408], 0.0020, 100.00005, sep), "99.9960 … 100.0041");
  equal(formatIntervalAt([99.99371, 100.00639], 0.0031, 100.00005), "[99.9937, 100.0064]");
  equal(formatEstimate(100.00001, 0.0020), "100.0000");
});

Deno.test("uncertaintyPlace() moves a decade when two digits round up to 100 (GUM §7.2.6 rule)", () => {
  // 0.0996 to two significant digits is 0.10: the last digit sits at 1e-2, not 1e-3.
  equal(uncertaintyPlace(0.0996), -2);
  equal(formatUncertainty(0.0996), "0.10");
  equal(formatEstimate(2.34567, 0.0996), "2.35");
  equal(uncertaintyPlace(0.001), -4); // an exact power of ten: two digits "0.0010"
  equal(formatUncertainty(0.001), "0.0010");
  equal(uncertaintyPlace(0), null);
  equal(uncertaintyPlace(null), null);
});

Deno.test("formatEstimate() rounds to tens above an uncertainty of 10, and shares an exponent when tiny (our rule)", () => {
  equal(formatUncertainty(123.4), "120");
  equal(formatEstimate(2512.3, 123.4), "2510");
  equal(formatEstimate(2.34567e-7, 1.2e-9), "2.346e-7");
  equal(formatIntervalAt([2.3222e-7, 2.3691e-7], 1.2e-9, 2.34567e-7), "[2.322e-7, 2.369e-7]");
  equal(formatEstimate(-0.00004, 0.02), "0.000"); // never "-0.000"
  // Without an uncertainty (an exact fit, a parameter held at a bound): six significant digits.
  equal(formatEstimate(138.50036, null), "138.5");
  equal(formatEstimate(1.2345678, 0), "1.23457");
});

Deno.test("formatNearOne() never prints a fraction near 1 as 1 (issue 13)", () => {
  // issue 13: R² 0.9999999904 must not show 1.00000.
  equal(formatNearOne(0.9999999904), "0.9999999904");
  equal(formatR2(0.9999999904), "0.9999999904");
  equal(formatNearOne(0.96341), "0.9634");
  equal(formatNearOne(1), "1.0000");
  equal(formatNearOne(1 - 2 ** -52), "1 − 2.2e-16");
});

Deno.test("formatNumber() and formatP() never print a value near 1 as 1 (issue 13)", () => {
  equal(formatNumber(0.99999, 4), "0.99999");
  equal(formatNumber(-0.999996, 3), "-0.999996");
  equal(formatNumber(1, 4), "1");
  equal(formatP(0.99996), "0.999960");
  equal(formatP(0.996), "0.9960");
  equal(formatP(3.2e-27), "3.2e-27");
  equal(formatP(0.0123), "0.012");
});

Deno.test("distinctTexts() prints distinct criteria differently (issue 13)", () => {
  // AICc of two candidates 0.007 apart: four significant digits print both as 182.2.
  deepEqual(distinctTexts([182.234, 182.241, 190.5], (x, e) => formatNumber(x, 4 + e)), [
    "182.23",
    "182.24",
    "190.5",
  ]);
  // Equal values may share a text; nulls stay dashes.
  deepEqual(distinctTexts([0.5, 0.5, null], (x, e) => formatNumber(x, 2 + e)), ["0.5", "0.5", "—"]);
  // R² of nested fits that agree to seven digits.
  deepEqual(distinctTexts([0.99911234, 0.99911261], formatNearOne), ["0.999112", "0.999113"]);
  // p-values
  deepEqual(distinctTexts([0.0412, 0.0414], formatP), ["0.0412", "0.0414"]);
});
