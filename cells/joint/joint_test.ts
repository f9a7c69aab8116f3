/**
 * The joint kind against exact identities and independent computations:
 *
 * - every parameter per group: the joint fit is the fit kind's fit of each
 *   table on its own (the stacked least-squares problem separates into the
 *   groups' problems; exact arithmetic of the objective, no source needed);
 * - every parameter shared: the fit kind's fit of the pooled rows (the same
 *   estimator on the same rows);
 * - the sharing F statistic against its definition (Bates & Watts 1988,
 *   §3.10; Motulsky & Christopoulos 2004; from memory) computed here from
 *   independent fit-kind fits;
 * - a shared rate: the fit kind's fit of the pooled rows with indicator
 *   columns, y = (a₁d₁ + a₂d₂ + a₃d₃)·exp(−k·t) + b₁d₁ + b₂d₂ + b₃d₃, a
 *   reparametrisation that is the same least-squares problem.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { fitKind } from "../fit/mod.ts";
import type { Fit, FitResult } from "../fit/mod.ts";
import { fisherF } from "../../kernel/stats/mod.ts";
import { parseContext, runContext } from "../fit/_fixtures_test.ts";
import { decayTables, makeTable, runJointCell } from "./_fixtures_test.ts";
import type { Table } from "../../kernel/contract/mod.ts";

const MODEL = "y = a*exp(-k*t) + b";
const START = { a: 50, k: 0.2, b: 4 };

function fitOf(table: Table, model = MODEL, start: Record<string, number> = START): FitResult {
  const spec = fitKind.parse(parseContext("f", { on: "data", model, start }));
  const out = fitKind.run(spec, runContext("f", "data", table)) as Fit;
  return fitKind.summary(out, spec);
}

function close(got: number | null, want: number, tol: number, what: string) {
  ok(got !== null, `${what}: null`);
  const err = Math.abs(got - want) / Math.max(Math.abs(want), 1e-300);
  ok(err <= tol, `${what}: ${got} vs ${want} (relative ${err.toExponential(2)})`);
}

/** The rows of several tables in one table, with a group column and 0/1 indicators d1, d2, …. */
function pooled(tables: Table[]): Table {
  const t: number[] = [], y: number[] = [], group: string[] = [];
  const d = tables.map(() => [] as number[]);
  tables.forEach((tab, g) => {
    const [tc, yc] = tab.columns.map((c) => c.values as Float64Array);
    for (let i = 0; i < tc.length; i++) {
      t.push(tc[i]);
      y.push(yc[i]);
      group.push(`g${g + 1}`);
      d.forEach((col, h) => col.push(h === g ? 1 : 0));
    }
  });
  return makeTable({ t, y, group, ...Object.fromEntries(d.map((c, h) => [`d${h + 1}`, c])) });
}

const TABLES = decayTables();
const NAMES = Object.keys(TABLES);

Deno.test("joint: every parameter per group equals the fit kind's separate fits (estimates to 1e-10, RSS the sum)", () => {
  const { result, warnings } = runJointCell({ tables: NAMES, model: MODEL, start: START }, TABLES);
  ok(warnings.some((w) => w.includes("shares no parameter")), warnings.join("\n"));
  let rss = 0;
  NAMES.forEach((name) => {
    const fit = fitOf(TABLES[name]);
    rss += fit.rss;
    for (const p of fit.parameters) {
      const got = result.parameters.find((q) => q.name === `${p.name}[${name}]`)!;
      equal(got.table, name);
      // Exact identity (the problem separates); 1e-10 relative.
      close(got.estimate, p.estimate, 1e-10, `${p.name}[${name}]`);
    }
  });
  close(result.rss, rss, 1e-10, "RSS = Σ separate RSS");
  deepEqual(result.sharing, []);
});

Deno.test("joint: every parameter shared equals the fit kind's fit of the pooled rows (estimates, SE, RSS, criteria)", () => {
  const { result } = runJointCell(
    { tables: NAMES, model: MODEL, start: START, shared: ["a", "k", "b"] },
    TABLES,
  );
  const fit = fitOf(pooled(NAMES.map((n) => TABLES[n])));
  // Same estimator, same rows: exact up to the solvers' rounding (1e-10 relative).
  for (const p of fit.parameters) {
    const got = result.parameters.find((q) => q.name === p.name)!;
    equal(got.table, null);
    close(got.estimate, p.estimate, 1e-10, p.name);
    close(got.std_error, p.std_error!, 1e-8, `se ${p.name}`);
    close(got.ci![0], p.ci![0], 1e-8, `ci ${p.name}`);
  }
  close(result.rss, fit.rss, 1e-10, "RSS");
  close(result.sigma, fit.sigma!, 1e-10, "σ");
  for (const c of ["log_likelihood", "aic", "aicc", "bic"] as const) {
    close(result[c], fit[c]!, 1e-10, c);
  }
  equal(result.k, fit.k);
});

Deno.test("joint: the sharing F test of a shared rate equals its definition from independent separate fits", () => {
  const { result } = runJointCell(
    { tables: NAMES, model: MODEL, start: START, shared: ["k"] },
    TABLES,
  );
  const N = 42, T = 3;
  // With k per group every parameter is per group: the larger model is the three separate fits.
  const rssSep = NAMES.reduce((s, n) => s + fitOf(TABLES[n]).rss, 0);
  const df1 = T - 1, df2 = N - 3 * T;
  // F = ((RSS_shared − RSS_separate)/Δdf) / (RSS_separate/df_separate): its definition.
  const f = ((result.rss - rssSep) / df1) / (rssSep / df2);
  const test = result.sharing[0];
  deepEqual(test.parameters, ["k"]);
  equal(test.df1, df1);
  equal(test.df2, df2);
  close(test.rss_separate, rssSep, 1e-10, "RSS per group");
  close(test.f, f, 1e-8, "F");
  close(test.p_value, fisherF(df1, df2).upper(f), 1e-8, "p");
  // Invented rates 0.21, 0.20, 0.22 with σ = 0.4: one rate fits.
  equal(test.shareable, true, test.verdict);
  ok(test.verdict.startsWith(`Sharing "k" holds at the 95% level`), test.verdict);
  deepEqual(test.separate[0].estimates.map((e) => e.table), NAMES);
});

Deno.test("joint: a shared rate equals the fit kind's fit of the stacked rows with indicator columns", () => {
  const { result } = runJointCell(
    { tables: NAMES, model: MODEL, start: START, shared: ["k"] },
    TABLES,
  );
  const model = "y = (a1*d1 + a2*d2 + a3*d3)*exp(-k*t) + b1*d1 + b2*d2 + b3*d3";
  const start = { a1: 50, a2: 50, a3: 50, k: 0.2, b1: 4, b2: 4, b3: 4 };
  const fit = fitOf(pooled(NAMES.map((n) => TABLES[n])), model, start);
  const pairs: [string, string][] = [["k", "k"]];
  NAMES.forEach((n, g) => pairs.push([`a[${n}]`, `a${g + 1}`], [`b[${n}]`, `b${g + 1}`]));
  // The same least-squares problem reparametrised: estimates and SEs agree (1e-9 relative).
  for (const [ours, theirs] of pairs) {
    const a = result.parameters.find((p) => p.name === ours)!;
    const b = fit.parameters.find((p) => p.name === theirs)!;
    close(a.estimate, b.estimate, 1e-9, ours);
    close(a.std_error, b.std_error!, 1e-7, `se ${ours}`);
  }
  close(result.rss, fit.rss, 1e-10, "RSS");
  close(result.aicc, fit.aicc!, 1e-10, "AICc");
  // Covariance over all parameters: cov(k, a[g]) against the indicator fit's (1e-6 relative).
  const names = result.parameters.map((p) => p.name);
  const theirNames = fit.parameters.map((p) => p.name);
  const i = names.indexOf("k"), j = names.indexOf(`a[${NAMES[1]}]`);
  close(
    result.covariance[i][j],
    fit.covariance[theirNames.indexOf("k")][theirNames.indexOf("a2")]!,
    1e-6,
    "cov(k, a2)",
  );
});

Deno.test("joint: rows grouped by a column give the same fit as the list of tables", () => {
  const byList =
    runJointCell({ tables: NAMES, model: MODEL, start: START, shared: ["k"] }, TABLES).result;
  const byColumn = runJointCell(
    { on: "all", by: "group", model: MODEL, start: START, shared: ["k"] },
    { all: pooled(NAMES.map((n) => TABLES[n])) },
  ).result;
  deepEqual(byColumn.groups.map((g) => g.name), ["g1", "g2", "g3"]);
  byList.parameters.forEach((p, j) =>
    close(byColumn.parameters[j].estimate, p.estimate, 1e-12, p.name)
  );
  equal(byColumn.grouped_by, "group");
});

Deno.test("joint: different rates are told apart (sharing rejected), and the joint test with two shared", () => {
  const tables = decayTables([0.12, 0.2, 0.3], 5);
  const { result } = runJointCell(
    { tables: NAMES, model: MODEL, start: START, shared: ["k", "b"] },
    tables,
  );
  equal(result.sharing.length, 3);
  const k = result.sharing.find((s) => s.parameters.join() === "k")!;
  equal(k.shareable, false, k.verdict);
  ok(k.p_value! < 1e-6, String(k.p_value));
  ok(k.verdict.includes("is rejected"), k.verdict);
  const both = result.sharing[2];
  deepEqual(both.parameters, ["k", "b"]);
  equal(both.df1, 4);
  // Together: the larger model is the separate fits (common practice, no source: nested F).
  const rssSep = NAMES.reduce((s, n) => s + fitOf(tables[n]).rss, 0);
  close(both.rss_separate, rssSep, 1e-9, "RSS of separate fits");
  ok(result.verdict.includes(`the groups differ in "k"`), result.verdict);
});

Deno.test("joint: start values from the pooled fit when none are given (said in a warning)", () => {
  const { result, warnings } = runJointCell({ tables: NAMES, model: MODEL, shared: ["k"] }, TABLES);
  const given =
    runJointCell({ tables: NAMES, model: MODEL, start: START, shared: ["k"] }, TABLES).result;
  ok(warnings.some((w) => w.includes("came from a fit of the pooled rows")), warnings.join("\n"));
  close(result.rss, given.rss, 1e-10, "same minimum");
});
