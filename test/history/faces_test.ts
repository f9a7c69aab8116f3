/**
 * The kinds' history faces (cells/<kind>/history.ts) on real runs: the fade
 * example (invented data) before and after its later rows, through a session
 * that keeps what each kind keeps; and each face's edge cases on hand-made
 * kept values: rows changed in place or removed, large tables compared by
 * blocks, records of older versions with fields missing.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import type { Change, ChangeContext } from "../../kernel/contract/mod.ts";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { compareParameter } from "../../cells/fit/history.ts";
import { BLOCK_ROWS } from "../../cells/table/history.ts";
import { copyDir } from "../_copy_dir.ts";

const REPO = new URL("../../", import.meta.url).pathname;
const ctx = (cell: string, rows: ChangeContext["rows"] = null): ChangeContext => ({
  cell,
  level: 0.95,
  rows,
});
const face = (kind: string) => registry.get(kind)!.history!;

/** Each cell's kept value of a run of `doc` in `dir`. */
async function keptOf(dir: string, doc: string): Promise<Map<string, unknown>> {
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir,
    history: true,
    lean: true,
  });
  try {
    const report = await session.run(await Deno.readTextFile(join(dir, doc)));
    return new Map(report.cells.map((c) => [c.name, c.kept]));
  } finally {
    session.close();
  }
}

/** The fade example's kept values before and after its later rows are appended. */
async function fadeBeforeAfter() {
  const dir = await Deno.makeTempDir({ prefix: "plumb-faces-" });
  try {
    copyDir(join(REPO, "examples/fade"), dir);
    const before = await keptOf(dir, "fade.md");
    const later = await Deno.readTextFile(join(dir, "data/batch7-later.csv"));
    await Deno.writeTextFile(join(dir, "data/batch7.csv"), later.split("\n").slice(1).join("\n"), {
      append: true,
    });
    return { before, after: await keptOf(dir, "fade.md") };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

const codes = (cs: Change[]) => cs.map((c) => c.code);

Deno.test("history faces on the fade example: rows, moved parameters, preferred law, findings, predictions", async () => {
  const { before, after } = await fadeBeforeAfter();
  const table = face("table").changes(before.get("cycles"), after.get("cycles"), ctx("cycles"));
  deepEqual(codes(table), ["rows-added"]);
  deepEqual(table[0].rows, { added: 40, removed: 0, changed: 0 });
  equal(table[0].numbers.count, 40);
  deepEqual((table[0].numbers.rows as number[]).slice(0, 3), [121, 122, 123]);
  const rows = table[0].rows!;

  const root = face("fit").changes(before.get("root"), after.get("root"), ctx("root", rows));
  const moved = root.filter((c) => c.code === "parameter-moved").map((c) => c.numbers.name);
  deepEqual(moved, ["q0", "a"], "both of root's parameters left their intervals");
  const a = root.find((c) => c.numbers.name === "a")!;
  // plumb run of the two data sets: a = 9.882 [9.828, 9.936], then 10.618 (invented data).
  ok(a.sentence.includes("9.882 [9.828, 9.936]"), a.sentence);
  equal(a.numbers.outside_previous_interval, true);

  const fade = face("compare").changes(before.get("fade"), after.get("fade"), ctx("fade", rows));
  const pref = fade.find((c) => c.code === "preferred-changed")!;
  deepEqual([pref.numbers.before, pref.numbers.after], ["root", "root-linear"]);
  ok((pref.numbers.delta_before as number) > 0 && (pref.numbers.delta_after as number) < 0);
  ok(pref.sentence.endsWith("with 40 new rows."), pref.sentence);

  const check = face("check").changes(
    before.get("root-residuals"),
    after.get("root-residuals"),
    ctx("c"),
  );
  ok(codes(check).includes("finding-appeared"));
  ok(check.filter((c) => c.code === "finding-appeared").every((c) => c.weight === "notable"));

  const pred = face("predict").changes(
    before.get("end-of-life"),
    after.get("end-of-life"),
    ctx("p"),
  );
  ok(codes(pred).includes("prediction-moved") && codes(pred).includes("solve-moved"));
  // Trends: one sample per parameter, with its interval and the rows used.
  const t = face("fit").trend!(after.get("root"));
  deepEqual(t.map((s) => [s.series, s.n]), [["q0", 159], ["a", 159]]);
});

Deno.test("fit: the difference test of two estimates", () => {
  // z = Δ/√(se₁² + se₂²) = 3/5 = 0.6 (3-4-5 triangle, exact); the two-sided p of the
  // standard normal at 0.6 is 0.548506 (normal table, e.g. Abramowitz & Stegun 26.2).
  const c = compareParameter(
    { name: "b", estimate: 10, std_error: 3, ci: [4, 16], unit: null },
    { name: "b", estimate: 13, std_error: 4, ci: [5, 21], unit: null },
    0.95,
  );
  equal(c.z, 0.6);
  ok(Math.abs(c.p_value! - 0.548506) < 1e-6);
  equal(c.p_value, 2 * standardNormal.upper(0.6));
  equal(c.outside_previous_interval, false);
  equal(c.significant, false);
  equal(c.relative, 0.3);
});

/** A table's kept value from row hashes and source row numbers (8 hex digits each). */
function tableKept(hashes: string[], rows: number[], extra: Record<string, unknown> = {}) {
  return {
    source: "a.csv",
    sha256: hashes.join(""),
    rows_read: rows.length,
    rows_used: rows.length,
    excluded: [],
    columns: [{ name: "x", type: "number", unit: "mm" }],
    row_runs: rows.map((r) => [r, r]),
    row_hashes: hashes.join(""),
    block_hashes: null,
    ...extra,
  };
}

Deno.test("table: rows changed in place, removed, excluded; a unit that changed", () => {
  const h = (n: number) => n.toString(16).padStart(8, "0");
  const a = tableKept([h(1), h(2), h(3), h(4)], [1, 2, 3, 4]);
  const b = tableKept([h(1), h(9), h(3)], [1, 2, 3], {
    excluded: [{ row: 4, why: "probe dropped" }],
    columns: [{ name: "x", type: "number", unit: "cm" }],
  });
  const c = face("table").changes(a, b, ctx("t"));
  deepEqual(codes(c), ["rows-removed", "rows-changed", "exclusions-added", "unit-changed"]);
  deepEqual(c[0].numbers.rows, [4]);
  deepEqual(c[1].numbers.rows, [2]);
  deepEqual(c[0].rows, { added: 0, removed: 1, changed: 0 });
  deepEqual(c[1].rows, { added: 0, removed: 0, changed: 1 });
  ok(c[2].sentence.includes("probe dropped"));
});

Deno.test("table: large tables are compared by blocks; an append is recognised", () => {
  const blocks = (n: number, seed: string) =>
    Array.from({ length: n }, (_, i) => `${seed}${i}`.padStart(8, "0")).join("");
  const big = (n: number, b: string) => ({
    ...tableKept([], []),
    rows_used: n,
    row_hashes: null,
    block_hashes: b,
    row_runs: [],
  });
  const a = big(3 * BLOCK_ROWS + 500, blocks(4, "a"));
  const appended = big(4 * BLOCK_ROWS + 20, blocks(3, "a") + "bbbbbbbb" + "cccccccc");
  const c = face("table").changes(a, appended, ctx("t"));
  deepEqual(codes(c), ["rows-added"]);
  equal(c[0].numbers.count, BLOCK_ROWS + 20 - 500);
  const edited = big(3 * BLOCK_ROWS + 500, "zzzzzzzz" + blocks(4, "a").slice(8));
  const e = face("table").changes(a, edited, ctx("t"));
  deepEqual(codes(e), ["rows-changed"]);
  equal(e[0].numbers.from_row, 1);
});

Deno.test("every face reads kept values of older versions without throwing", () => {
  for (const kind of ["table", "fit", "compare", "check", "predict"]) {
    const f = face(kind);
    for (const [a, b] of [[{}, {}], [null, null], [{ parameters: [] }, { rows: [] }]]) {
      ok(Array.isArray(f.changes(a, b, ctx("x"))), kind);
      if (f.trend) ok(Array.isArray(f.trend(b)), kind);
    }
  }
  // A fit kept without standard errors: compared by its interval only.
  const fit = face("fit").changes(
    { model: "y = a", converged: true, parameters: [{ name: "a", estimate: 1, ci: [0.5, 1.5] }] },
    { model: "y = a", converged: true, parameters: [{ name: "a", estimate: 2, ci: [1.5, 2.5] }] },
    ctx("f"),
  );
  deepEqual(codes(fit), ["parameter-moved"]);
  equal(fit[0].numbers.z, null);
});
