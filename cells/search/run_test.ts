/**
 * The search against brute force: every subset fitted from scratch by the
 * `fit` kind (the project's certified least squares) and scored as `compare`
 * scores it (`_testing.ts` `bruteForce`). That independent route is the
 * source of every expected ranking and value below; the tolerance, 1e-9
 * relative, is far above the rounding of either route (both are QR least
 * squares) and far below any gap between neighbouring subsets here.
 */
import { deepEqual, equal, ok, rejects } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import type { SearchCriterion } from "./spec.ts";
import type { SearchResult } from "./result.ts";
import { type Brute, bruteForce, bruteRanking, invented, search, tableOf } from "./_testing.ts";
import { binomial } from "./subset_tree.ts";

const CRITERIA: SearchCriterion[] = ["bic", "aic", "aicc", "adj_r2", "loo"];

function close(a: number | null, b: number | null, what: string): void {
  ok(a !== null && b !== null, `${what}: ${a} vs ${b}`);
  ok(Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b)), `${what}: ${a} vs ${b}`);
}

const near = (a: number | null, b: number | null) =>
  a !== null && b !== null && Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));

/**
 * A list equals the brute-force ranking value for value, and each entry is
 * the brute force's subset at that place or one tied with it (subsets with
 * the same column space, such as {x1, x3} and {x1, x8} when x8 = x1 − x3).
 */
function sameList(list: SearchResult["best"], ranking: Brute[], by: SearchCriterion, what: string) {
  equal(list.length, Math.min(ranking.length, list.length), what);
  list.forEach((m, i) => {
    const expected = ranking[i].values[by];
    close(m.criterion, expected, `${what} ${i}`);
    const tied = ranking.filter((b) => near(b.values[by], expected)).map((b) => b.chosen.join());
    ok(tied.includes(m.chosen.join()), `${what} ${i}: ${m.chosen} not in ${tied}`);
  });
}

/** The search's lists (per size and overall) are the brute-force rankings. */
function sameRanking(r: SearchResult, all: Brute[], by: SearchCriterion, keep: number): void {
  for (const s of r.sizes) {
    const ranking = bruteRanking(all, by, s.size);
    equal(s.best.length, Math.min(keep, ranking.length), `${by}, size ${s.size}`);
    sameList(s.best, ranking, by, `${by}, size ${s.size}`);
    ok(s.exact, `${by}, size ${s.size} exact`);
  }
  const overall = bruteRanking(all, by, null);
  equal(r.best.length, Math.min(keep, overall.length));
  sameList(r.best, overall, by, `${by} overall`);
  r.best.forEach((m, i) => equal(m.k, overall[i].k, "k counts the error variance as the fit does"));
  ok(r.exact);
}

Deno.test("search ranks 7 candidates as brute-force refitting does, by every criterion", async () => {
  const table = tableOf(invented(40, 7, 11));
  const candidates = ["x1", "x2", "x3", "x4", "x5", "x6", "x7"];
  const all = await bruteForce(table, "y", candidates);
  for (const by of CRITERIA) {
    const { result, warnings } = await search(table, { response: "y", candidates, by, keep: 4 });
    deepEqual(warnings, []);
    equal(result.subsets_evaluated, 128, "2^7 subsets (exact arithmetic)");
    equal(result.sizes.length, 8);
    sameRanking(result, all, by, 4);
  }
});

Deno.test("search keeps forced-in terms in every subset and ranks as brute force", async () => {
  const table = tableOf(invented(36, 7, 5));
  const candidates = ["x2", "x3", "x4", "x5", "x6", "x7"];
  const all = await bruteForce(table, "y", candidates, ["x1"]);
  for (const by of ["bic", "loo"] as const) {
    const { result } = await search(table, { response: "y", candidates, always: ["x1"], by });
    equal(result.subsets_evaluated, 64, "2^6 subsets (exact arithmetic)");
    sameRanking(result, all, by, 5);
    ok(result.best.every((m) => m.predictors[0] === "x1" && m.p === m.size + 2));
  }
});

Deno.test("search without an intercept ranks as brute force with uncentred R²", async () => {
  const table = tableOf(invented(30, 6, 23));
  const candidates = ["x1", "x2", "x3", "x4", "x5", "x6"];
  const all = await bruteForce(table, "y", candidates, [], false);
  for (const by of ["aicc", "adj_r2"] as const) {
    const { result } = await search(table, { response: "y", candidates, by, intercept: false });
    equal(result.subsets_evaluated, 63, "2^6 − 1: no empty model without an intercept");
    equal(result.sizes[0].size, 1);
    sameRanking(result, all, by, 5);
    ok(result.best[0].model.startsWith("y = b_x1*x1"), result.best[0].model);
  }
});

Deno.test("search ranks subsets holding a collinear candidate last, as the fit refuses them", async () => {
  // x8 = x1 − x3 exactly as doubles go: every subset holding x1, x3 and x8 is aliased.
  const cols = invented(30, 7, 3);
  cols.x8 = cols.x1.map((v, i) => v - cols.x3[i]);
  const table = tableOf(cols);
  const candidates = ["x1", "x3", "x4", "x5", "x6", "x7", "x8"];
  const all = await bruteForce(table, "y", candidates);
  const refused = all.filter((b) => b.aliased);
  equal(refused.length, 16, "2^4 supersets of {x1, x3, x8} (exact arithmetic)");
  const { result, warnings } = await search(table, { response: "y", candidates, keep: 3 });
  equal(result.aliased, refused.length);
  deepEqual(result.aliased_examples, [["x1", "x3", "x8"]]);
  ok(
    warnings.some((w) => /16 subsets .* aliased and ranked last.*\{x1, x3, x8\}/.test(w)),
    warnings[0],
  );
  sameRanking(result, all, "bic", 3);
  for (const s of result.sizes) {
    const aliased = refused.filter((b) => b.chosen.length === s.size).length;
    equal(s.aliased, aliased, `size ${s.size}`);
  }
});

Deno.test("search stops at `largest` candidates and counts the subsets it ranked", async () => {
  const table = tableOf(invented(40, 8, 2));
  const candidates = ["x1", "x2", "x3", "x4", "x5", "x6", "x7", "x8"];
  const { result } = await search(table, { response: "y", candidates, largest: 3 });
  const expected = [0, 1, 2, 3].reduce((s, k) => s + binomial(8, k), 0);
  equal(result.subsets_evaluated, expected, "Σ C(8, k), k ≤ 3 = 93 (exact arithmetic)");
  equal(result.largest, 3);
  deepEqual(result.sizes.map((s) => s.size), [0, 1, 2, 3]);
});

Deno.test("search leaves out rows with a missing value in any column, with a warning", async () => {
  const cols = invented(30, 5, 9);
  cols.x5[4] = NaN;
  cols.y[11] = NaN;
  const { result, warnings } = await search(tableOf(cols), { response: "y" });
  equal(result.n, 28);
  deepEqual(result.candidates, ["x1", "x2", "x3", "x4", "x5"], "every other number column");
  ok(
    warnings.some((w) =>
      w.startsWith('2 rows of "t" with a missing value') && /rows 5, 12/.test(w)
    ),
  );
});

Deno.test("search reports progress from 0 towards 1, never backwards", async () => {
  const table = tableOf(invented(50, 18, 4));
  const { fractions, result } = await search(table, { response: "y" });
  equal(result.subsets_evaluated, 2 ** 18);
  ok(fractions.length >= 4, String(fractions.length));
  ok(fractions.every((f, i) => f >= 0 && f <= 1 && (i === 0 || f >= fractions[i - 1])));
  ok(fractions.includes(0.9), "the tree walk ends at 90 % of the bar");
});

Deno.test("search refuses bad columns in plain words, at the option, with the near miss", async () => {
  const table = tableOf(invented(20, 4, 1));
  const refused = (
    options: Record<string, unknown>,
    message: RegExp,
    path: unknown[],
    on = table,
  ) =>
    rejects(() => search(on, options), (e: unknown) => {
      ok(e instanceof CellError, String(e));
      ok(message.test(e.message), e.message);
      deepEqual(e.path, path);
      return true;
    });
  await refused(
    { response: "y", candidates: ["x1", "x22"] },
    /Cannot search "s": unknown column "x22": did you mean "x2"\?/,
    ["candidates", 1],
  );
  await refused({ response: "yy" }, /unknown column "yy": did you mean "y"\?/, ["response"]);
  const cols = invented(20, 4, 1);
  cols.x4 = cols.x1.map((v, i) => 2 * v - cols.x2[i]);
  await rejects(
    () => search(tableOf(cols), { response: "y", always: ["x1", "x2", "x4"] }),
    /column "x4" in "always" is a linear combination of the intercept, "x1", "x2"/,
  );
  const flat = invented(20, 4, 1);
  flat.y.fill(2.5);
  await refused(
    { response: "y" },
    /the response "y" is 2.5 on every row used/,
    ["response"],
    tableOf(flat),
  );
});

Deno.test("search's model equations are fits of the listed subsets", async () => {
  const table = tableOf({ ...invented(25, 4, 8), b0: new Float64Array(25).fill(1) });
  const { result } = await search(table, { response: "y", candidates: ["x1", "x2", "x3", "x4"] });
  const empty = result.sizes[0].best[0];
  equal(empty.model, "y = c0", "the intercept-only model avoids the column b0");
  const two = result.sizes[2].best[0];
  equal(two.model, `y = linear(${two.chosen.join(", ")})`);
});

Deno.test("search by loo proves each list by PRESS ≥ RSS without fitting every subset", async () => {
  // Three strong predictors among ten: past the subsets holding all three, RSS outgrows every PRESS kept.
  const cols = invented(30, 10, 17);
  const { x1, x3, x4 } = cols;
  // The same noise, a tenth as large, under larger effects.
  cols.y = cols.y.map((v, i) => {
    const noise = v - (3 + 2 * x1[i] - 1.5 * x3[i] + 0.8 * x4[i]);
    return 3 + 5 * x1[i] - 4 * x3[i] + 3 * x4[i] + 0.1 * noise;
  });
  const table = tableOf(cols);
  const candidates = Array.from({ length: 10 }, (_, j) => `x${j + 1}`);
  const all = await bruteForce(table, "y", candidates);
  const { result, warnings } = await search(table, { response: "y", candidates, by: "loo" });
  deepEqual(warnings, []);
  ok(result.sizes.some((s) => s.subsets > 50), "some sizes have more subsets than the pool");
  sameRanking(result, all, "loo", 5);
});

Deno.test("search by loo says so when a size's list is exact only among the subsets fitted", async () => {
  // One real predictor and eleven of noise on many rows: mid-size subsets tie within PRESS − RSS.
  const cols = invented(400, 12, 6);
  cols.y = cols.x1.map((v, i) => v + cols.x12[i] * 0.01 + Math.sin(i));
  const { result, warnings } = await search(tableOf(cols), { response: "y", by: "loo" });
  const inexact = result.sizes.filter((s) => !s.exact);
  ok(inexact.length > 0);
  ok(inexact.every((s) => s.subsets > 50), "only sizes with more subsets than the pool");
  ok(
    warnings.some((w) =>
      /Leave-one-out lists of search "s" for sizes? [\d, ]+ rank the 50/.test(w)
    ),
    warnings.join("\n"),
  );
});

Deno.test("search gives leave-one-out errors beyond 100,000 rows only when ranking by them", async () => {
  const table = tableOf(invented(120_000, 4, 3));
  const bic = (await search(table, { response: "y", keep: 1 })).result;
  equal(bic.loo_given, false);
  ok(bic.best.every((m) => m.loo_rmse === null));
  ok(bic.method.includes("leave-one-out errors only up to 100,000 rows"), bic.method);
  const loo = (await search(table, { response: "y", keep: 1, by: "loo" })).result;
  equal(loo.loo_given, true);
  ok(loo.best[0].loo_rmse !== null && loo.best[0].loo_rmse > 0);
});
