/**
 * The decimal corrections in WebAssembly (`printed_lo.wat`): the committed
 * bytes are what the text assembles to. Their values are tested against the
 * reference loop in cells/fit/printed_lo_test.ts.
 *
 * @module
 */
import assert from "node:assert/strict";
import { buildWasm, SOURCES } from "../wasm/build.ts";
import { PRINTED_LO_WASM } from "./_printed_lo_bytes.ts";
import { wasmCorrections } from "./printed_lo.ts";

Deno.test("_printed_lo_bytes.ts is what printed_lo.wat assembles to", async () => {
  const source = SOURCES.find((s) => s.name === "PRINTED_LO_WASM")!;
  assert.equal(
    await buildWasm(source.wat),
    PRINTED_LO_WASM,
    "run kernel/wasm/build.ts after editing",
  );
});

Deno.test("wasmCorrections() gives 0.1 its correction and integers none", () => {
  // The double 0.1 is 0.1000000000000000055511151231257827… (exact binary expansion, from
  // memory): the correction is about −5.55e−18.
  const out = new Float64Array(3);
  assert.equal(wasmCorrections(Float64Array.of(0.1, 2, -3), 0, 3, out), 1);
  assert.ok(out[0] < -5.55e-18 && out[0] > -5.56e-18, String(out[0]));
  assert.deepEqual([out[1], out[2]], [0, 0]);
});
