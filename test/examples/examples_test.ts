/**
 * The example analyses under examples/: each runs with `plumb run --json`
 * (exit 0, every cell current, no document error), every inline value in its
 * prose names a field its result has, its seeded generator re-creates its
 * data byte for byte, and its numbers tell the story its prose tells (the
 * demo's calc cell: the power law's crossing of 2,300 mAh and its delta-method
 * uncertainty, recomputed here from the fit's RUN-JSON).
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { basename, join } from "node:path";
import { findInlineRefs, parseDocument } from "../../kernel/document/mod.ts";
import { resolveValue } from "../../ui/inline_value.ts";
import { plumbRunJson } from "./_plumb_run.ts";

const EXAMPLES = new URL("../../examples/", import.meta.url).pathname;

interface Cell {
  name: string;
  kind: string;
  state: string;
  error: unknown;
  result: Record<string, unknown> | null;
}
interface RunJson {
  ok: boolean;
  cells: Cell[];
  document_errors?: unknown[];
}

async function runJson(doc: string): Promise<{ code: number; json: RunJson; stderr: string }> {
  const { code, json, stderr } = await plumbRunJson(doc);
  return { code, json: json as RunJson, stderr };
}

/** Every example: a folder under examples/ with Markdown documents at its top. */
function examples(): { folder: string; documents: string[] }[] {
  const out = [];
  for (const entry of Deno.readDirSync(EXAMPLES)) {
    if (!entry.isDirectory) continue;
    const folder = join(EXAMPLES, entry.name);
    const documents = [...Deno.readDirSync(folder)]
      .filter((f) => f.isFile && f.name.endsWith(".md") && f.name !== "README.md")
      .map((f) => join(folder, f.name));
    if (documents.length > 0) out.push({ folder, documents });
  }
  return out.sort((a, b) => a.folder.localeCompare(b.folder));
}

function cell(json: RunJson, name: string): Record<string, unknown> {
  const c = json.cells.find((c) => c.name === name);
  ok(c?.result, `cell "${name}" has a result`);
  return c.result;
}

function num(value: unknown): number {
  equal(typeof value, "number");
  return value as number;
}

const ALL = examples();

Deno.test("examples/ holds the demo and the three issue-12 analyses", () => {
  const names = ALL.map((e) => basename(e.folder));
  for (const n of ["calibration", "cell-ageing", "extrusion", "fade"]) ok(names.includes(n), n);
});

for (const { documents } of ALL) {
  for (const doc of documents) {
    const shown = doc.slice(doc.indexOf("examples/"));
    Deno.test(`plumb run --json ${shown}: exit 0, every cell current, every inline value resolves`, async () => {
      const { code, json, stderr } = await runJson(doc);
      equal(code, 0, stderr);
      equal(json.ok, true);
      deepEqual(json.document_errors ?? [], []);
      const notCurrent = json.cells.filter((c) => c.state !== "current");
      deepEqual(notCurrent.map((c) => [c.name, c.state, c.error]), []);
      const results = new Map(json.cells.map((c) => [c.name, c.result]));
      const parsed = parseDocument(await Deno.readTextFile(doc));
      let refs = 0;
      for (const block of parsed.blocks) {
        if (block.type !== "prose") continue;
        const found = findInlineRefs(block);
        deepEqual(found.errors.map((e) => e.message), []);
        for (const ref of found.refs) {
          refs++;
          const r = resolveValue(results.get(ref.cell), ref.cell, ref.path, ref.digits ?? null);
          ok(r.ok, `${shown} line ${ref.line}: ${r.ok ? "" : r.error}`);
        }
      }
      if (!doc.endsWith("fade.md")) ok(refs >= 10, `${shown} shows its numbers inline (${refs})`);
    });
  }
}

for (const { folder } of ALL) {
  const script = join(folder, "generate.ts");
  const exists = (() => {
    try {
      return Deno.statSync(script).isFile;
    } catch {
      return false;
    }
  })();
  if (!exists) continue;
  Deno.test(`${basename(folder)}/generate.ts re-creates its data byte for byte`, async () => {
    const mod = await import(new URL(`file://${script}`).href);
    const files: Record<string, string> = mod.makeData();
    ok(Object.keys(files).length > 0);
    const onDisk = [...Deno.readDirSync(join(folder, "data"))]
      .map((f) => f.name).filter((n) => n.endsWith(".csv")).sort();
    deepEqual(Object.keys(files).sort(), onDisk, "the generator makes every data file");
    for (const [name, text] of Object.entries(files)) {
      const bytes = await Deno.readFile(join(folder, "data", name));
      deepEqual(new TextEncoder().encode(text), bytes, name);
    }
    const readme = await Deno.readTextFile(join(folder, "data", "README.md"));
    ok(/invented/i.test(readme), "the data are labelled as invented beside them");
    for (const doc of [...Deno.readDirSync(folder)].filter((f) => f.name.endsWith(".md"))) {
      const text = await Deno.readTextFile(join(folder, doc.name));
      ok(/invented data/i.test(text), `${doc.name} says its data are invented`);
    }
  });
}

Deno.test("cell-ageing: the later file moves the preferred law from root to root-linear", async () => {
  const folder = join(EXAMPLES, "cell-ageing");
  const early = (await runJson(join(folder, "ageing.md"))).json;
  equal(cell(early, "laws").preferred, "root");
  const ahead = cell(early, "ahead") as { at: { pi: number[] }[] };
  const dir = await Deno.makeTempDir({ prefix: "plumb-example-" });
  try {
    await Deno.mkdir(join(dir, "data"));
    for (const f of ["first-300.csv", "through-900.csv"]) {
      await Deno.copyFile(join(folder, "data", f), join(dir, "data", f));
    }
    const text = await Deno.readTextFile(join(folder, "ageing.md"));
    ok(text.includes("from: data/first-300.csv"));
    await Deno.writeTextFile(
      join(dir, "ageing.md"),
      text.replace("from: data/first-300.csv", "from: data/through-900.csv"),
    );
    const { code, json: later } = await runJson(join(dir, "ageing.md"));
    equal(code, 0);
    equal(cell(later, "laws").preferred, "root-linear");
    const findings = (cell(later, "root-check").findings as { code: string }[]).map((f) => f.code);
    ok(findings.includes("curvature") && findings.includes("autocorrelation"), String(findings));
    // The reading at cycle 900 falls below the interval the first 300 cycles gave.
    const csv = await Deno.readTextFile(join(folder, "data", "through-900.csv"));
    const at900 = Number(csv.split("\n").find((l) => l.startsWith("900,"))!.split(",")[1]);
    ok(at900 < ahead.at[1].pi[0], `${at900} below ${ahead.at[1].pi[0]}`);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("calibration: the 1/conc-weighted quadratic is preferred, passes its check, solves the unknowns; the replicate spreads (a calc table) cannot choose the weighting", async () => {
  const { json } = await runJson(join(EXAMPLES, "calibration", "nitrite.md"));
  const cmp = cell(json, "calibrations") as { preferred: string; weighting_basis: string | null };
  equal(cmp.preferred, "quad-x");
  ok(cmp.weighting_basis !== null, "the comparison says it weighs different weightings");
  const line = cell(json, "line-check") as { lack_of_fit: { p_value: number } };
  ok(line.lack_of_fit.p_value < 0.01, "the straight line misses the replicate means");
  deepEqual(cell(json, "quad-x-check").findings, []);
  const solve = cell(json, "unknowns").solve as { x: { conc: number }; ci: number[] }[];
  equal(solve.length, 3);
  for (const s of solve) {
    ok(s.ci[0] < s.x.conc && s.x.conc < s.ci[1] && s.ci[0] > 0.02 && s.ci[1] < 1.0);
  }
  // The calc cell's table: one row per standard; its spread law's slope is the least-squares slope
  // of ln sd on ln conc over the seven standards, recomputed here from the file (exact arithmetic:
  // the closed form Σ(x − x̄)(y − ȳ) / Σ(x − x̄)²).
  const spread = cell(json, "spread") as { gives: string; table: { rows_used: number } };
  equal(spread.gives, "table");
  equal(spread.table.rows_used, 7);
  const csv = await Deno.readTextFile(join(EXAMPLES, "calibration", "data", "standards.csv"));
  const byConc = new Map<number, number[]>();
  for (const line of csv.trim().split("\n").slice(1)) {
    const [, conc, absorbance] = line.split(",").map(Number);
    byConc.set(conc, [...(byConc.get(conc) ?? []), absorbance]);
  }
  const xs: number[] = [], ys: number[] = [];
  for (const [conc, r] of byConc) {
    const mean = r.reduce((s, v) => s + v, 0) / r.length;
    const sd = Math.sqrt(r.reduce((s, v) => s + (v - mean) ** 2, 0) / (r.length - 1));
    xs.push(Math.log(conc));
    ys.push(Math.log(sd));
  }
  const xBar = xs.reduce((s, v) => s + v, 0) / xs.length;
  const yBar = ys.reduce((s, v) => s + v, 0) / ys.length;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < xs.length; i++) {
    sxy += (xs[i] - xBar) * (ys[i] - yBar);
    sxx += (xs[i] - xBar) ** 2;
  }
  const law = cell(json, "spread-law") as {
    parameters: { name: string; estimate: number; ci: number[] }[];
  };
  const m = law.parameters.find((p) => p.name === "m")!;
  ok(Math.abs(m.estimate - sxy / sxx) < 1e-10, `${m.estimate} against ${sxy / sxx}`);
  // The prose: the interval holds both 0.5 (weights 1/conc) and 1 (weights 1/conc²).
  ok(m.ci[0] < 0.5 && m.ci[1] > 1, `${m.ci}`);
});

Deno.test("extrusion: collinear throughput and screw speed, throughput kept, run 29 high leverage", async () => {
  const { json } = await runJson(join(EXAMPLES, "extrusion", "extrusion.md"));
  const full = cell(json, "all-four-check") as { vif: Record<string, number> };
  ok(num(full.vif.b_throughput) > 10 && num(full.vif.b_screw_speed) > 10);
  equal(cell(json, "process").preferred, "by-throughput");
  const chosen = cell(json, "chosen-check") as {
    vif: Record<string, number>;
    findings: { code: string; rows: number[] }[];
  };
  ok(Object.values(chosen.vif).every((v) => v < 2));
  deepEqual(chosen.findings.map((f) => [f.code, f.rows]), [["high-leverage", [29]]]);
  const pi = (cell(json, "setpoint").at as { pi: number[] }[])[0].pi;
  ok(pi[1] < 140, "the set point stays below the 140 bar the prose names");
  // The robust (Huber) fit beside it: the throughput slope within a fifth of a standard error of
  // least squares' and no run weighted below one half, as the prose says (common practice, no
  // source: what "no run drives the fit" means here).
  const ls = cell(json, "by-throughput") as {
    parameters: { estimate: number; std_error: number }[];
  };
  const rob = cell(json, "by-throughput-robust") as {
    parameters: { estimate: number }[];
    robust: { loss: string; down_weighted: { weight: number }[] };
  };
  equal(rob.robust.loss, "huber");
  ok(
    Math.abs(rob.parameters[1].estimate - ls.parameters[1].estimate) <
      0.2 * ls.parameters[1].std_error,
  );
  ok(rob.robust.down_weighted.length > 0 && rob.robust.down_weighted.every((d) => d.weight > 0.5));
});

Deno.test("fade/generate_later.ts re-creates the demo's later file byte for byte", async () => {
  const { makeLater } = await import("../../examples/fade/generate_later.ts");
  const bytes = await Deno.readFile(join(EXAMPLES, "fade", "data", "batch7-later.csv"));
  deepEqual(new TextEncoder().encode(makeLater()), bytes);
  ok(/invented/i.test(await Deno.readTextFile(join(EXAMPLES, "fade", "data", "README.md"))));
});

Deno.test("fade: the calc cell's crossing and its delta-method uncertainty follow from the power fit", async () => {
  const { json } = await runJson(join(EXAMPLES, "fade", "fade.md"));
  const power = cell(json, "power") as {
    parameters: { name: string; estimate: number }[];
    covariance: number[][];
  };
  const got = (cell(json, "crossing") as {
    value: { threshold: number; cycle: number; u: number; u_without_correlation: number };
  }).value;
  equal(got.threshold, 2300);
  const names = power.parameters.map((p) => p.name);
  deepEqual(names, ["q0", "a", "b"]);
  const theta = power.parameters.map((p) => p.estimate);
  const crossing = ([q0, a, b]: number[]) => Math.pow((q0 - 2300) / a, 1 / b);
  // Exact arithmetic: q0 - a*t^b = 2300 solved for t.
  ok(Math.abs(got.cycle - crossing(theta)) < 1e-9 * got.cycle, `${got.cycle}`);
  // Delta method (JCGM 100:2008, GUM §5.2.2, the law of propagation of uncertainty for
  // correlated inputs): u² = gᵀVg, here with g by central differences (a step of 1e-5 relative;
  // truncation error O(h²), so about 8 digits of u agree with the cell's analytic gradient:
  // common practice, no source).
  const g = theta.map((_, i) => {
    const h = Math.abs(theta[i]) * 1e-5;
    const up = theta.slice(), down = theta.slice();
    up[i] += h;
    down[i] -= h;
    return (crossing(up) - crossing(down)) / (2 * h);
  });
  let variance = 0;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) variance += g[i] * power.covariance[i][j] * g[j];
  }
  ok(
    Math.abs(got.u - Math.sqrt(variance)) < 1e-6 * got.u,
    `${got.u} against ${Math.sqrt(variance)}`,
  );
  // The prose: ignoring the strong correlations overstates u many times over.
  ok(got.u_without_correlation > 10 * got.u, `${got.u_without_correlation} against ${got.u}`);
  // The prose: the root law's answer lies close by, its interval (one new measurement) much wider.
  const solve = (cell(json, "end-of-life").solve as { x: { cycle: number }; ci: number[] }[])[0];
  ok(solve.ci[0] < got.cycle && got.cycle < solve.ci[1]);
  ok(solve.ci[1] - solve.ci[0] > 4 * got.u);
});
