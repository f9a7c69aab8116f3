import { equal, ok } from "node:assert/strict";
import { FIT_PALETTE, fitColor, fnv1a } from "./palette.ts";

Deno.test("fnv1a() matches published 32-bit FNV-1a values", () => {
  // FNV-1a 32-bit test vectors (Noll's FNV test suite; from memory).
  equal(fnv1a(""), 0x811c9dc5);
  equal(fnv1a("a"), 0xe40c292c);
  equal(fnv1a("foobar"), 0xbf9cf968);
});

Deno.test("fitColor() depends on the name only and stays in the palette", () => {
  equal(FIT_PALETTE.length, 8);
  equal(fitColor("root"), FIT_PALETTE[fnv1a("root") % 8]);
  ok(new Set(["line", "root", "root-linear"].map(fitColor)).size === 3, "the demo's fits differ");
});
