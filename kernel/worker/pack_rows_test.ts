import { deepEqual, equal, ok } from "node:assert/strict";
import { PACK_FROM, packRows } from "./protocol.ts";
import { writeJson } from "../cli/json_stream.ts";

/** Invented per-row values: fractions, negatives, a negative zero, large integers. */
function values(n: number): number[] {
  return Array.from(
    { length: n },
    (_, i) => i % 7 === 0 ? -0 : (i - n / 2) / 3 + 2 ** 52 * (i % 2),
  );
}

async function jsonText(v: unknown): Promise<string> {
  const parts: Uint8Array[] = [];
  await writeJson(v, { write: (b) => (parts.push(b.slice()), Promise.resolve(b.length)) });
  return new TextDecoder().decode(new Uint8Array(parts.flatMap((p) => [...p])));
}

Deno.test("packRows moves long top-level number arrays as Float64Array, bit for bit", () => {
  const fitted = values(PACK_FROM);
  const { summary, buffers } = packRows({ n: 3, fitted, short: [1, 2] });
  const s = summary as { n: number; fitted: Float64Array; short: number[] };
  ok(s.fitted instanceof Float64Array);
  equal(buffers.length, 1);
  equal(buffers[0], s.fitted.buffer);
  // Exact: a double copied into a Float64Array is the same double (IEEE 754 binary64).
  ok(fitted.every((x, i) => Object.is(x, s.fitted[i])));
  deepEqual(s.short, [1, 2]);
  equal(s.n, 3);
});

Deno.test("packRows leaves arrays with a null or a string, nested arrays and non-objects alone", () => {
  const withNull: (number | null)[] = values(PACK_FROM);
  withNull[5] = null;
  const input = {
    withNull,
    nested: { rows: values(PACK_FROM) },
    text: values(PACK_FROM).map(String),
  };
  const { summary, buffers } = packRows(input);
  equal(summary, input); // nothing packed: the same object
  equal(buffers.length, 0);
  deepEqual(packRows([1, 2]).summary, [1, 2]);
  equal(packRows(null).summary, null);
});

Deno.test("RUN-JSON text of a packed summary equals JSON.stringify of the plain one", async () => {
  const plain = {
    name: "fit",
    fitted: values(PACK_FROM + 3),
    rows: values(PACK_FROM).map((_, i) => i + 1),
  };
  const { summary } = packRows(plain);
  equal(await jsonText(summary), JSON.stringify(plain, null, 2) + "\n");
});

Deno.test("packRows moves a summary's own Float64Arrays (rowValues) as they are, and no other typed array", async () => {
  const { rowValues } = await import("../arrays.ts");
  const own = rowValues(Float64Array.from(values(PACK_FROM)));
  const borrowed = Float64Array.from(values(PACK_FROM)); // an output's array: never moved
  const { summary, buffers } = packRows({ fitted: own, design: borrowed });
  const s = summary as { fitted: Float64Array; design: Float64Array };
  equal(s.fitted, own as unknown as Float64Array);
  equal(s.design, borrowed);
  deepEqual(buffers, [(own as unknown as Float64Array).buffer]);
});
