import { deepEqual, equal, ok } from "node:assert/strict";
import { COEFFICIENTS, INTERCEPT, PREDICTORS, SCALES, writeScaleCsv } from "./generate.ts";

const ROWS = 4000;

async function made(seed: number) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-scale-test-" });
  try {
    const path = `${dir}/data.csv`;
    const bytes = await writeScaleCsv(path, ROWS, seed);
    return { bytes, text: await Deno.readTextFile(path) };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

function sd(v: number[]): number {
  const m = v.reduce((a, b) => a + b, 0) / v.length;
  return Math.sqrt(v.reduce((a, b) => a + (b - m) ** 2, 0) / (v.length - 1));
}

Deno.test("writeScaleCsv() writes the header and one %.10g line a row, the same for the same seed", async () => {
  const a = await made(7), b = await made(7), c = await made(8);
  equal(a.text, b.text);
  ok(a.text !== c.text);
  equal(a.bytes, new TextEncoder().encode(a.text).length);
  const lines = a.text.trimEnd().split("\n");
  equal(lines[0], "x1,x2,x3,x4,x5,x6,x7,x8,x9,x10,y");
  equal(lines.length, ROWS + 1);
  for (const line of lines.slice(1)) {
    const fields = line.split(",");
    equal(fields.length, PREDICTORS + 1);
    // %.10g: at most 10 significant digits (the digits before any exponent, leading zeros aside).
    for (const f of fields) {
      ok(f.split("e")[0].replace(/[-.]/g, "").replace(/^0+/, "").length <= 10);
    }
  }
  ok(a.text.endsWith("\n"));
});

Deno.test("writeScaleCsv() scales column k by 10^(k/3) and makes y the stated combination plus N(0, 1)", async () => {
  const rows = (await made(11)).text.trimEnd().split("\n").slice(1).map((l) =>
    l.split(",").map(Number)
  );
  // Sample standard deviations of 4,000 normal draws lie within 10 % of σ: their
  // relative standard error is 1/√(2n) ≈ 1.1 %, so 10 % is nine of them
  // (sampling theory, common practice, no source).
  for (let k = 0; k < PREDICTORS; k++) {
    const s = sd(rows.map((r) => r[k]));
    ok(Math.abs(s / SCALES[k] - 1) < 0.1, `x${k + 1}: sd ${s} against ${SCALES[k]}`);
  }
  // The noise y − (2 + Σ bₖxₖ), from the printed values, is about N(0, 1).
  const noise = rows.map((r) =>
    r[PREDICTORS] - COEFFICIENTS.reduce((a, b, k) => a + b * r[k], INTERCEPT)
  );
  ok(Math.abs(sd(noise) - 1) < 0.1, `noise sd ${sd(noise)}`);
  ok(Math.abs(noise.reduce((a, b) => a + b, 0) / noise.length) < 0.1); // SE of the mean 1/√n ≈ 0.016
  // Term k varies with standard deviation (11 − k)/10 (exact arithmetic on the definitions).
  deepEqual(
    COEFFICIENTS.map((b, k) => Number((Math.abs(b) * SCALES[k]).toFixed(12))),
    [1, 0.9, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2, 0.1],
  );
});
