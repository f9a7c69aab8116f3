/**
 * NIST StRD nonlinear least squares (https://www.itl.nist.gov/div898/strd/):
 * all 19 sets of lower and average difficulty, from both of NIST's starting
 * points, through real analysis documents and `plumb run --json` (one
 * document per start: a `table` per set and a `fit` per set). Every certified
 * estimate, standard deviation and the residual sum of squares must agree in
 * at least 6 significant digits (LRE as NIST defines it, capped at the 11
 * digits certified).
 *
 * Each set's data lines are written to a CSV with the numeric strings copied
 * exactly as printed, so the table sees the data as printed (Lanczos1's RSS,
 * 1.4e−25, is at the rounding level of the data and needs them).
 *
 * @module
 */
import assert from "node:assert/strict";
import {
  lre,
  readReferenceJson,
  readReferenceText,
  referenceTests,
  runDocument,
  strdCsv as csvOf,
} from "./_reference.ts";

/** Ignored, and said once, without the reference data. */
const test = referenceTests("strd_nonlinear");

interface ManifestSet {
  name: string;
  kind: string;
  file: string;
  n_parameters: number;
  data: { first_line: number; columns: string[]; n_rows: number };
  parameters: { name: string; estimate: number; std_dev: number; start1: number; start2: number }[];
  residual_sum_of_squares: number;
}

const BAR = 6;
const CAP = 11;

/**
 * The NIST model of each set (the `Model:` block of its .dat file) in our
 * expression syntax: `**` as `^`, `exp[...]` as `exp(...)`, `arctan` as
 * `atan`; Roszman1's 31-digit pi and ENSO's pi are the constant `pi`.
 */
const MODELS: Record<string, string> = {
  Misra1a: "y = b1*(1-exp(-b2*x))",
  Chwirut2: "y = exp(-b1*x)/(b2+b3*x)",
  Chwirut1: "y = exp(-b1*x)/(b2+b3*x)",
  Lanczos3: "y = b1*exp(-b2*x) + b3*exp(-b4*x) + b5*exp(-b6*x)",
  Gauss1: "y = b1*exp(-b2*x) + b3*exp(-(x-b4)^2/b5^2) + b6*exp(-(x-b7)^2/b8^2)",
  Gauss2: "y = b1*exp(-b2*x) + b3*exp(-(x-b4)^2/b5^2) + b6*exp(-(x-b7)^2/b8^2)",
  DanWood: "y = b1*x^b2",
  Misra1b: "y = b1*(1-(1+b2*x/2)^(-2))",
  Kirby2: "y = (b1 + b2*x + b3*x^2)/(1 + b4*x + b5*x^2)",
  Hahn1: "y = (b1 + b2*x + b3*x^2 + b4*x^3)/(1 + b5*x + b6*x^2 + b7*x^3)",
  Nelson: "log(y) = b1 - b2*x1*exp(-b3*x2)",
  MGH17: "y = b1 + b2*exp(-x*b4) + b3*exp(-x*b5)",
  Lanczos1: "y = b1*exp(-b2*x) + b3*exp(-b4*x) + b5*exp(-b6*x)",
  Lanczos2: "y = b1*exp(-b2*x) + b3*exp(-b4*x) + b5*exp(-b6*x)",
  Gauss3: "y = b1*exp(-b2*x) + b3*exp(-(x-b4)^2/b5^2) + b6*exp(-(x-b7)^2/b8^2)",
  Misra1c: "y = b1*(1-(1+2*b2*x)^(-0.5))",
  Misra1d: "y = b1*b2*x*((1+b2*x)^(-1))",
  Roszman1: "y = b1 - b2*x - atan(b3/(x-b4))/pi",
  ENSO: "y = b1 + b2*cos(2*pi*x/12) + b3*sin(2*pi*x/12) + b5*cos(2*pi*x/b4) + " +
    "b6*sin(2*pi*x/b4) + b8*cos(2*pi*x/b7) + b9*sin(2*pi*x/b7)",
};

/** One document: a table and a fit per set, from NIST's start 1 or 2. */
function documentFor(sets: ManifestSet[], start: 1 | 2): string {
  const cells: string[] = [`# NIST StRD nonlinear sets, start ${start}`, ""];
  for (const set of sets) {
    const id = set.name.toLowerCase();
    const values = set.parameters.map((p) => `${p.name}: ${start === 1 ? p.start1 : p.start2}`);
    cells.push("```table " + `${id}-data`, `from: ${id}.csv`, "```", "");
    cells.push(
      "```fit " + id,
      `on: ${id}-data`,
      `model: ${MODELS[set.name]}`,
      `start: { ${values.join(", ")} }`,
      "```",
      "",
    );
  }
  return cells.join("\n");
}

interface Row {
  set: string;
  start: number;
  estimate: number;
  std_dev: number;
  rss: number;
}

test("NIST StRD nonlinear sets: both starts to 6 digits through plumb run", async () => {
  const manifest = await readReferenceJson<{ sets: ManifestSet[] }>("strd/manifest.json");
  const sets = manifest.sets.filter((s) => s.kind === "nonlinear");
  assert.equal(sets.length, 19);
  const files: Record<string, string> = {};
  for (const set of sets) {
    files[`${set.name.toLowerCase()}.csv`] = csvOf(
      set,
      await readReferenceText(`strd/${set.file}`),
    );
  }
  const runs = await Promise.all(
    ([1, 2] as const).map((s) => runDocument(documentFor(sets, s), files)),
  );
  const rows: Row[] = [];
  const failures: string[] = [];
  for (const start of [1, 2] as const) {
    for (const set of sets) {
      const cell = runs[start - 1].cells.find((c) => c.name === set.name.toLowerCase());
      assert.ok(cell, `${set.name}: fit cell missing`);
      if (cell.state !== "current") {
        failures.push(`${set.name} start ${start}: ${cell.error?.message}`);
        rows.push({ set: set.name, start, estimate: 0, std_dev: 0, rss: 0 });
        continue;
      }
      const r = cell.result;
      // Certified values: NIST StRD, set set.name (manifest.json, from the .dat file).
      let est = CAP, sd = CAP;
      set.parameters.forEach((c) => {
        const got = r.parameters.find((q: { name: string }) => q.name === c.name);
        est = Math.min(est, lre(got?.estimate ?? NaN, c.estimate, CAP));
        sd = Math.min(sd, lre(got?.std_error ?? NaN, c.std_dev, CAP));
      });
      const rss = lre(r.rss, set.residual_sum_of_squares, CAP);
      rows.push({ set: set.name, start, estimate: est, std_dev: sd, rss });
      const worst = Math.min(est, sd, rss);
      if (!(worst >= BAR)) {
        failures.push(`${set.name} start ${start} (worst LRE ${worst.toFixed(1)})`);
      }
    }
  }
  console.log(`NIST StRD nonlinear, worst LRE per set and start (cap ${CAP}, bar ${BAR}):`);
  console.table(rows.map((x) => ({
    set: x.set,
    start: x.start,
    estimate: x.estimate.toFixed(1),
    std_dev: x.std_dev.toFixed(1),
    rss: x.rss.toFixed(1),
  })));
  assert.deepEqual(failures, [], `below ${BAR} digits: ${failures.join("; ")}`);
});
