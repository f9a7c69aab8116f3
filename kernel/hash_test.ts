import { equal, notEqual } from "node:assert/strict";
import { canonicalJson, hashString, hashValue, sha256Hex } from "./hash.ts";

Deno.test("canonicalJson() sorts keys at every depth and flattens typed arrays", () => {
  equal(
    canonicalJson({ b: { d: 1, c: 2 }, a: new Float64Array([1, 2]) }),
    '{"a":[1,2],"b":{"c":2,"d":1}}',
  );
});

Deno.test("hashValue() is equal for equal data and differs for a one-character change", () => {
  equal(hashValue({ x: 1, y: [1, 2] }), hashValue({ y: [1, 2], x: 1 }));
  notEqual(hashString("model: y = a + b*x"), hashString("model: y = a + b*z"));
  equal(hashString("").length, 32);
});

Deno.test('sha256Hex() gives the FIPS 180-2 digest of "abc"', async () => {
  // FIPS 180-2, Appendix B.1 (one-block message "abc").
  equal(
    await sha256Hex(new TextEncoder().encode("abc")),
    "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad",
  );
});
