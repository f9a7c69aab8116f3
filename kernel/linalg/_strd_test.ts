import assert from "node:assert/strict";
import { digits, loadStrd } from "./_strd.ts";

const NOWHERE = new URL("./no-such-reference-folder/", import.meta.url);

Deno.test("loadStrd() skips with null when the reference folder is missing", async () => {
  const before = Deno.env.get("PLUMB_REQUIRE_REFERENCE");
  Deno.env.delete("PLUMB_REQUIRE_REFERENCE");
  try {
    assert.equal(await loadStrd("Norris", NOWHERE), null);
  } finally {
    if (before !== undefined) Deno.env.set("PLUMB_REQUIRE_REFERENCE", before);
  }
});

Deno.test("loadStrd() fails when the folder is missing and PLUMB_REQUIRE_REFERENCE=1", async () => {
  const before = Deno.env.get("PLUMB_REQUIRE_REFERENCE");
  Deno.env.set("PLUMB_REQUIRE_REFERENCE", "1");
  try {
    await assert.rejects(() => loadStrd("Norris", NOWHERE), {
      name: "Error",
      message:
        `Reference data missing: "${NOWHERE.pathname}" not found and PLUMB_REQUIRE_REFERENCE=1`,
    });
  } finally {
    if (before === undefined) Deno.env.delete("PLUMB_REQUIRE_REFERENCE");
    else Deno.env.set("PLUMB_REQUIRE_REFERENCE", before);
  }
});

Deno.test("loadStrd() reads Norris with 36 rows checked against its SHA-256", async () => {
  // Source: NIST StRD Norris.dat (36 observations, first row y = 0.1, x = 0.2).
  const set = await loadStrd("Norris");
  if (!set) return;
  assert.deepEqual(set.columns, ["y", "x"]);
  assert.equal(set.data[0].length, 36);
  assert.equal(set.data[0][0], 0.1);
  assert.equal(set.data[1][0], 0.2);
});

Deno.test("digits() counts agreeing significant digits", () => {
  // LRE = −log10(|got − want|/|want|) (McCullough 1998, from memory).
  assert.equal(digits(1, 1), 15);
  assert.ok(Math.abs(digits(1.0001, 1) - 4) < 1e-9);
});
