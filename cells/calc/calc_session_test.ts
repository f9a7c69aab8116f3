/**
 * The calc cell through the kernel: a session with the product's kinds and
 * worker runs documents whose calc cells read a table and a fit, give a
 * table that a fit reads, fail a type check at the code's line, and are
 * cached by their code and their inputs' keys.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { registry } from "../mod.ts";
import { Session } from "../../kernel/session/session.ts";

const WORKER = new URL("../worker.ts", import.meta.url);

function cell(kind: string, name: string, body: string): string {
  return "```" + `${kind} ${name}\n${body}\n` + "```\n\n";
}

// Invented data for this test: y = 1 + 2x exactly at x = 1..5.
const TABLE = cell(
  "table",
  "pts",
  "columns: [x, y]\nrows: [[1, 3], [2, 5], [3, 7], [4, 9], [5, 11]]\nunits: { y: mV }",
);
const FIT = cell("fit", "line", "on: pts\nmodel: y = a + b*x");

async function withSession(fn: (s: Session) => Promise<void>) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-calc-" });
  const s = new Session({ registry, workerUrl: WORKER, dir });
  try {
    await fn(s);
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
}

const find = (r: Awaited<ReturnType<Session["run"]>>, name: string) =>
  r.cells.find((c) => c.name === name)!;

Deno.test("a calc cell reads a table and a fit and gives named numbers", async () => {
  const calc = cell(
    "calc",
    "numbers",
    "reads: pts, line\n---\nconst at6 = line.evaluate({ x: 6 });\nconsole.log('n', pts.n);\n" +
      "return { at6, b: line.estimates.b, unit: pts.units.y, sum: pts.columns.y.reduce((s, v) => s + v, 0) };",
  );
  await withSession(async (s) => {
    const r = await s.run(TABLE + FIT + calc);
    const c = find(r, "numbers");
    equal(c.state, "current", c.error?.message);
    const res = c.result as { value: Record<string, unknown>; console: string; gives: string };
    // Exact arithmetic: the line through the five points is y = 1 + 2x, so y(6) = 13; Σy = 35.
    ok(Math.abs((res.value.at6 as number) - 13) < 1e-12);
    ok(Math.abs((res.value.b as number) - 2) < 1e-12);
    equal(res.value.unit, "mV");
    equal(res.value.sum, 35);
    equal(res.console, "n 5\n");
    equal(res.gives, "value");
  });
});

Deno.test("a calc cell that gives a table is read by a fit as any table", async () => {
  const calc = cell(
    "calc",
    "doubled",
    "reads: pts\ngives: table\n---\nconst x = pts.columns.x;\n" +
      "return { columns: { x, y2: Array.from(pts.columns.y, (v) => 2 * v) }, units: { y2: 'mV' } };",
  );
  const fit2 = cell("fit", "line2", "on: doubled\nmodel: y2 = c + d*x");
  await withSession(async (s) => {
    const r = await s.run(TABLE + calc + fit2);
    const f = find(r, "line2");
    equal(f.state, "current", f.error?.message ?? find(r, "doubled").error?.message);
    const est = (f.result as { parameters: { name: string; estimate: number }[] }).parameters;
    // Exact arithmetic: 2y = 2 + 4x.
    ok(Math.abs(est[0].estimate - 2) < 1e-12 && Math.abs(est[1].estimate - 4) < 1e-12);
    const t = find(r, "doubled").result as {
      table: { rows_used: number; columns: { name: string; unit: string | null }[] };
    };
    equal(t.table.rows_used, 5);
    deepEqual(t.table.columns.map((c) => [c.name, c.unit]), [["x", null], ["y2", "mV"]]);
  });
});

Deno.test("a misspelled field fails the type check at its line and column, with the near miss", async () => {
  const calc = cell(
    "calc",
    "oops",
    "reads: line\n---\nconst r = line.r2;\nreturn line.estimats.a;",
  );
  await withSession(async (s) => {
    const source = TABLE + FIT + calc;
    const r = await s.run(source);
    const c = find(r, "oops");
    equal(c.state, "failed");
    match(
      c.error!.message,
      /^Type error: Property 'estimats' does not exist .*Did you mean 'estimates'\?/,
    );
    const lines = source.split("\n");
    const line = lines.findIndex((l) => l.startsWith("return line.estimats")) + 1;
    equal(c.error!.line, line);
    equal(c.error!.column, "return line.".length + 1);
    equal(find(r, "line").state, "current", "the other cells keep their results");
  });
});

Deno.test("a syntax error reads as one, at its line: TypeScript's parser errors are numbered 1000-1999 (TypeScript's diagnosticMessages.json)", async () => {
  const calc = cell(
    "calc",
    "broken",
    "reads: line\n---\nconst a = line.estimates.a;\nreturn (a +;",
  );
  await withSession(async (s) => {
    const source = TABLE + FIT + calc;
    const r = await s.run(source);
    const c = find(r, "broken");
    equal(c.state, "failed");
    match(c.error!.message, /^Syntax error: Expression expected/);
    const line = source.split("\n").findIndex((l) => l.startsWith("return (a +;")) + 1;
    equal(c.error!.line, line);
    equal(find(r, "line").state, "current", "the other cells keep their results");
  });
});

Deno.test("a calc cell is cached by its code and its inputs: a prose edit reruns nothing, a code edit reruns it", async () => {
  const calc = (k: number) =>
    cell("calc", "k", `reads: line\n---\nreturn { v: line.estimates.a * ${k} };`);
  await withSession(async (s) => {
    let r = await s.run(TABLE + FIT + calc(2));
    equal(find(r, "k").state, "current", find(r, "k").error?.message);
    r = await s.run("Some prose.\n\n" + TABLE + FIT + calc(2));
    deepEqual(r.ran, []);
    r = await s.run(TABLE + FIT + calc(3));
    deepEqual(r.ran, ["k"]);
    // Exact arithmetic: a = 1.
    ok(Math.abs(((find(r, "k").result as { value: { v: number } }).value.v) - 3) < 1e-12);
  });
});

Deno.test("a misspelled cell in reads is an error at its place, naming the nearest cell", async () => {
  const calc = cell("calc", "near", "reads: pts, lien\n---\nreturn 1;");
  await withSession(async (s) => {
    const source = TABLE + FIT + calc;
    const c = find(await s.run(source), "near");
    equal(c.state, "failed");
    match(c.error!.message, /Unknown cell "lien" in "near".*did you mean "line"\?/);
    equal(c.error!.line, source.split("\n").findIndex((l) => l.startsWith("reads: pts, lien")) + 1);
    equal(c.error!.column, "reads: pts, ".length + 1);
  });
});

Deno.test("a runtime error in calc code points at its line", async () => {
  const calc = cell(
    "calc",
    "boom",
    "---\nconst a = 1;\nthrow new Error('no crossing below 2000 mAh');",
  );
  await withSession(async (s) => {
    const source = calc;
    const r = await s.run(source);
    const c = find(r, "boom");
    equal(c.state, "failed");
    equal(c.error!.message, "The code threw no crossing below 2000 mAh");
    equal(c.error!.line, source.split("\n").findIndex((l) => l.startsWith("throw")) + 1);
  });
});

Deno.test("a calc cell reads a joint fit as its RUN-JSON result: parameters by group, sharing tests, per-row fields", async () => {
  // Invented data for this test: two groups with their own intercepts and one slope.
  const g1 = [[1, 3.1], [2, 4.9], [3, 7.0], [4, 9.1]];
  const g2 = [[1, 5.0], [2, 7.1], [3, 8.9], [4, 11.0]];
  const tables = cell("table", "g1", `columns: [x, y]\nrows: ${JSON.stringify(g1)}`) +
    cell("table", "g2", `columns: [x, y]\nrows: ${JSON.stringify(g2)}`);
  const joint = cell("joint", "both", "tables: [g1, g2]\nmodel: y = a + b*x\nshared: [b]");
  const calc = cell(
    "calc",
    "read",
    "reads: both\n---\n" +
      "const b = both.parameters.find((p) => p.name === 'b')!;\n" +
      "const own = both.parameters.filter((p) => p.table !== null).map((p) => [p.table, p.estimate]);\n" +
      "return { b: b.estimate, se: b.std_error, own, groups: both.groups.map((g) => g.name),\n" +
      "  shareable: both.sharing[0].shareable, rows: both.residuals.length,\n" +
      "  residuals_typed: both.residuals instanceof Float64Array };",
  );
  const misspelled = cell("calc", "oops", "reads: both\n---\nreturn both.sharng.length;");
  await withSession(async (s) => {
    const r = await s.run(tables + joint + calc + misspelled);
    const c = find(r, "read");
    equal(c.state, "current", c.error?.message ?? find(r, "both").error?.message);
    const v = (c.result as { value: Record<string, unknown> }).value;
    const res = find(r, "both").result as {
      parameters: { name: string; estimate: number; std_error: number }[];
    };
    // The code sees the joint result itself: the same numbers.
    const b = res.parameters.find((p) => p.name === "b")!;
    equal(v.b, b.estimate);
    equal(v.se, b.std_error);
    deepEqual(v.own, [["g1", res.parameters[0].estimate], ["g2", res.parameters[1].estimate]]);
    deepEqual(v.groups, ["g1", "g2"]);
    equal(v.shareable, true);
    equal(v.rows, 8);
    equal(v.residuals_typed, true);
    // Exact arithmetic: with an intercept per group and one slope, b is the pooled within-group
    // slope Σ_g Sxy_g / Σ_g Sxx_g.
    let sxy = 0, sxx = 0;
    for (const g of [g1, g2]) {
      const xBar = g.reduce((t, p) => t + p[0], 0) / g.length;
      const yBar = g.reduce((t, p) => t + p[1], 0) / g.length;
      for (const [x, y] of g) {
        sxy += (x - xBar) * (y - yBar);
        sxx += (x - xBar) ** 2;
      }
    }
    ok(Math.abs((v.b as number) - sxy / sxx) < 1e-12, `${v.b} against ${sxy / sxx}`);
    // Its shape is declared from the result: a misspelled field is a type error with the near miss.
    const oops = find(r, "oops");
    equal(oops.state, "failed");
    match(
      oops.error!.message,
      /^Type error: Property 'sharng' does not exist .*Did you mean 'sharing'\?/,
    );
  });
});
