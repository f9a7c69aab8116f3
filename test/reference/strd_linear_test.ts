/**
 * NIST StRD linear least squares (https://www.itl.nist.gov/div898/strd/):
 * all 11 sets through one real analysis document and `plumb run --json`.
 * Every certified estimate, standard deviation, residual standard deviation
 * and R² must agree in at least 12 significant digits (LRE as NIST defines
 * it; for a certified zero, absolute error below 1e−12). NoInt1 and NoInt2
 * certify the uncentred R² (manifest notes), which is what a fit without an
 * intercept reports.
 *
 * Each set's data lines are written to a CSV with the numeric strings copied
 * exactly as printed, so the table sees the data as printed.
 *
 * @module
 */
import assert from "node:assert/strict";
import {
  lre,
  readReferenceJson,
  readReferenceText,
  referenceAvailable,
  runDocument,
  strdCsv as csvOf,
} from "./_reference.ts";

interface ManifestSet {
  name: string;
  kind: string;
  file: string;
  n_parameters: number;
  data: { first_line: number; columns: string[]; n_rows: number };
  parameters: { name: string; estimate: number; std_dev: number }[];
  residual_std_dev: number;
  r_squared: number;
}

const BAR = 12;

/** Model text for a set: polynomials in x by `polynomial`, Longley by `linear`, NoInt by hand. */
function modelOf(set: ManifestSet): string {
  const p = set.n_parameters;
  if (set.name === "NoInt1" || set.name === "NoInt2") return "y = B1*x";
  if (set.name === "Longley") return "y = linear(x1, x2, x3, x4, x5, x6)";
  if (p === 2) return "y = B0 + B1*x";
  return `y = polynomial(x, ${p - 1})`;
}

Deno.test("NIST StRD linear sets: every certified value to 12 digits through plumb run", async () => {
  if (!referenceAvailable("strd_linear")) return;
  const manifest = await readReferenceJson<{ sets: ManifestSet[] }>("strd/manifest.json");
  const sets = manifest.sets.filter((s) => s.kind === "linear");
  assert.equal(sets.length, 11);
  const files: Record<string, string> = {};
  const cells: string[] = ["# NIST StRD linear sets", ""];
  for (const set of sets) {
    const id = set.name.toLowerCase();
    files[`${id}.csv`] = csvOf(set, await readReferenceText(`strd/${set.file}`));
    cells.push("```table " + `${id}-data`, `from: ${id}.csv`, "```", "");
    cells.push("```fit " + id, `on: ${id}-data`, `model: ${modelOf(set)}`, "```", "");
  }
  const run = await runDocument(cells.join("\n"), files);
  const rows: { set: string; estimate: number; std_dev: number; sigma: number; r2: number }[] = [];
  const failures: string[] = [];
  for (const set of sets) {
    const cell = run.cells.find((c) => c.name === set.name.toLowerCase());
    assert.ok(cell, `${set.name}: fit cell missing`);
    assert.equal(cell.state, "current", `${set.name}: ${cell.error?.message}`);
    const r = cell.result;
    // Certified values: NIST StRD, set set.name (manifest.json, from the .dat file).
    let est = 15, sd = 15;
    set.parameters.forEach((c, j) => {
      const got = r.parameters[j];
      est = Math.min(est, lre(got.estimate, c.estimate));
      sd = Math.min(sd, lre(got.std_error ?? NaN, c.std_dev));
    });
    const sigma = lre(r.sigma, set.residual_std_dev);
    const r2 = lre(r.r2, set.r_squared);
    rows.push({ set: set.name, estimate: est, std_dev: sd, sigma, r2 });
    const worst = Math.min(est, sd, sigma, r2);
    if (!(worst >= BAR)) failures.push(`${set.name} (worst LRE ${worst.toFixed(1)})`);
  }
  console.log("NIST StRD linear, worst LRE per set (cap 15):");
  console.table(rows.map((x) => ({
    set: x.set,
    estimate: x.estimate.toFixed(1),
    std_dev: x.std_dev.toFixed(1),
    sigma: x.sigma.toFixed(1),
    r2: x.r2.toFixed(1),
  })));
  assert.deepEqual(failures, [], `below ${BAR} digits: ${failures.join(", ")}`);
});
