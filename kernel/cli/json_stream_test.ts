import { equal } from "node:assert/strict";
import { writeJson } from "./json_stream.ts";
import { plainDeep } from "../arrays.ts";

/** The streamed text of a value. */
async function streamed(value: unknown): Promise<string> {
  const parts: Uint8Array[] = [];
  let n = 0;
  await writeJson(value, {
    write: (b) => {
      // A sink that takes at most 1,000 bytes a call, as a pipe may.
      const took = b.subarray(0, 1000).slice();
      parts.push(took);
      n += took.length;
      return Promise.resolve(took.length);
    },
  });
  const all = new Uint8Array(n);
  let at = 0;
  for (const p of parts) all.set(p, (at += p.length) - p.length);
  return new TextDecoder().decode(all);
}

// The reference is JSON.stringify itself (ECMA-262 §25.5.2), of the value made plain.
const reference = (v: unknown) => JSON.stringify(plainDeep(v), null, 2) + "\n";

Deno.test("writeJson writes what JSON.stringify(value, null, 2) writes", async () => {
  const values: unknown[] = [
    null,
    0,
    -0,
    1e-320,
    'é \u2028 "quoted" \n',
    [],
    {},
    { a: undefined, b: () => 1, c: [undefined, 1], d: { e: [] } },
    [NaN, Infinity, -Infinity, 1.5, -2],
    { rows: new Int32Array([1, 2, 3]), fitted: new Float64Array([0.1, NaN, 1e300]) },
    { many: Array.from({ length: 100 }, (_, i) => i / 7) },
    { mixed: Array.from({ length: 100 }, (_, i) => (i % 2 ? i : `t${i}`)) },
    { nested: [[1, 2], [3, [4, { x: new Float32Array([0.5]) }]]] },
    { date: new Date(Date.UTC(2026, 11, 4)) },
  ];
  for (const v of values) equal(await streamed(v), reference(v), JSON.stringify(plainDeep(v)));
});

Deno.test("writeJson streams a million-value array through a small sink", async () => {
  const big = new Float64Array(1_000_000);
  for (let i = 0; i < big.length; i++) big[i] = Math.sin(i) * 1e3;
  const v = { cells: [{ result: { fitted: big, n: big.length } }] };
  equal(await streamed(v), reference(v));
});

Deno.test("writeJson writes whole numbers digit by digit as String does, beside blocks that are not", async () => {
  const rows = Float64Array.from({ length: 10_000 }, (_, i) => i + 1);
  const edges = Float64Array.of(0, -0, 7, -7, 2 ** 31 - 1, -(2 ** 31), 10, -10, 1_000_000);
  const mixed = Float64Array.from({ length: 5_000 }, (_, i) => (i < 3000 ? i - 1500 : i / 4));
  const wide = Float64Array.of(2 ** 31, -(2 ** 31) - 1, 1e21, 2 ** 53);
  const v = { rows, edges, mixed, wide, ints: Int32Array.from(rows), nested: [{ r: rows }] };
  equal(await streamed(v), reference(v));
});

Deno.test("writeJson writes whole numbers nested deeper than the integer writer's buffer allows as String does", async () => {
  // 300 levels: a separator of 602 bytes, too long for a block of 2,048 numbers in the 1 MiB buffer.
  let v: unknown = Float64Array.from({ length: 3000 }, (_, i) => i - 7);
  for (let d = 0; d < 300; d++) v = [v];
  equal(await streamed(v), reference(v));
});
