import { deepEqual, equal, ok } from "node:assert/strict";
import type { Change } from "../../kernel/contract/mod.ts";
import { cellRun, changeContext, fadeRun } from "../compare/_history_fixtures_test.ts";
import { wiggle } from "../compare/_fixtures_test.ts";
import { fitOf } from "../predict/_fixtures_test.ts";
import { checkKind } from "./mod.ts";
import { checkHistory, type CheckKept, ROWS_KEPT } from "./history.ts";
import type { CheckResult, Diagnostics } from "./result.ts";
import type { CheckSpec } from "./spec.ts";

const codes = (cs: Change[]) => cs.map((c) => `${c.code} ${c.weight}`);

/** The fade example's check of root (examples/fade/fade.md), before and after batch7-later.csv. */
async function fadeCheck(later: boolean) {
  const { fits } = await fadeRun(later);
  return await cellRun<CheckResult, CheckKept>(checkKind, "root-residuals", { fit: "root" }, {
    root: fits.root,
  });
}

/** A check of a straight line through y = 1 + 2x plus a small fixed wiggle, x = 1…20; `jump` adds row 21 that far above the line. */
async function lineCheck(jump: number | null) {
  const n = jump === null ? 20 : 21;
  const x = Array.from({ length: n }, (_, i) => i + 1);
  const w = wiggle(20, 0.3);
  const y = x.map((v, i) => 1 + 2 * v + (i < 20 ? w[i] : jump!));
  return await cellRun<CheckResult, CheckKept>(checkKind, "judge", { fit: "model" }, {
    model: fitOf({ x, y }, "y = a + b*x"),
  });
}

Deno.test("checkHistory.keep() keeps the findings with their rows and the main test statistics", async () => {
  const { result, kept } = await fadeCheck(true);
  deepEqual(
    kept.findings,
    result.findings.map((f) => ({
      code: f.code,
      rows: f.rows,
      row_count: f.rows.length,
      message: f.message,
    })),
  );
  equal(kept.n, result.n);
  equal(kept.significance, 0.05);
  equal(kept.durbin_watson, result.durbin_watson);
  equal(kept.durbin_watson_p, result.durbin_watson_test!.p_value);
  equal(kept.breusch_pagan_p, result.breusch_pagan!.p_value);
  equal(kept.shapiro_wilk_p, result.shapiro_wilk!.p_value);
  equal(kept.condition_number, result.condition_number);
  // The cycle counts do not repeat: no lack-of-fit test.
  equal(kept.lack_of_fit_p, null);
  deepEqual(JSON.parse(JSON.stringify(kept)), kept);
});

Deno.test("checkHistory.keep() keeps at most 50 rows of a finding and how many it names", () => {
  const rows = Array.from({ length: 120 }, (_, i) => i + 1);
  const r = {
    fit: "f",
    n: 500,
    significance: 0.05,
    findings: [{ code: "high-leverage", rows, message: "120 rows have leverage above 2p/n" }],
    durbin_watson: null,
    durbin_watson_test: null,
    breusch_pagan: null,
    shapiro_wilk: null,
    condition_number: null,
    lack_of_fit: null,
  } as unknown as CheckResult;
  const kept = checkHistory.keep(null as unknown as Diagnostics, null as unknown as CheckSpec, r);
  equal(ROWS_KEPT, 50);
  deepEqual(kept.findings[0].rows, rows.slice(0, 50));
  equal(kept.findings[0].row_count, 120);
  // The same first 50 rows but 130 in all: other rows, said with the count.
  const more = structuredClone(kept);
  more.findings[0].row_count = 130;
  const c = checkHistory.changes(kept, more, changeContext("c"));
  deepEqual(codes(c), ["finding-rows-changed minor"]);
  equal(
    c[0].sentence,
    "c: the finding of high leverage now names rows 1–50, 130 rows in all (was rows 1–50, 120 rows in all).",
  );
});

Deno.test("checkHistory.changes() on the fade example: findings that appeared, went, or name other rows", async () => {
  const before = await fadeCheck(false), after = await fadeCheck(true);
  const c = checkHistory.changes(before.kept, after.kept, changeContext("root-residuals"));
  // The plumb run of this invented data: the root law misses the later curvature, and its
  // residuals then fail the tests the findings read (findings.ts).
  deepEqual(codes(c), [
    "finding-appeared notable",
    "finding-rows-changed minor",
    "finding-appeared notable",
    "finding-appeared notable",
    "finding-appeared notable",
    "finding-appeared notable",
    "finding-gone notable",
  ]);
  deepEqual(c.map((x) => x.numbers.finding), [
    "outlier",
    "high-leverage",
    "curvature",
    "non-constant-variance",
    "non-normal",
    "autocorrelation",
    "alternation",
  ]);
  // The rows are the check's own, carried over unchanged.
  const rowsOf = (r: CheckResult, code: string) => r.findings.find((f) => f.code === code)!.rows;
  deepEqual(c[0].numbers.rows, rowsOf(after.result, "outlier"));
  deepEqual(c[1].numbers.before, rowsOf(before.result, "high-leverage"));
  deepEqual(c[1].numbers.after, rowsOf(after.result, "high-leverage"));
  equal(
    c[1].sentence,
    "root-residuals: the finding of high leverage now names rows 1–11 (was rows 1–8).",
  );
  ok(c[0].sentence.startsWith("root-residuals: new finding, outlier. Rows 159 and 160 have"));
  equal(c[6].sentence, "root-residuals: the finding of alternation is no longer made.");
  // Shapiro–Wilk, Breusch–Pagan and Durbin–Watson crossed 0.05, but their findings say so.
  ok(!c.some((x) => x.code === "test-crossed"));
});

Deno.test("checkHistory.changes() on a line with an appended row far off it: an outlier appears, naming the row", async () => {
  // Row 21 lies 5 above a line whose residuals are about ±0.3: its externally studentized
  // residual is far beyond ±3 (the rule in findings.ts, common practice).
  const before = await lineCheck(null), after = await lineCheck(5);
  const c = checkHistory.changes(
    before.kept,
    after.kept,
    changeContext("judge", { added: 1, removed: 0, changed: 0 }),
  );
  ok(c.every((x) => x.code === "finding-appeared" && x.weight === "notable"), codes(c).join());
  const outlier = c.find((x) => x.numbers.finding === "outlier")!;
  deepEqual(outlier.numbers.rows, [21]);
  ok(outlier.sentence.startsWith("judge: new finding, outlier. Row 21 has"), outlier.sentence);
  deepEqual(c.find((x) => x.numbers.finding === "influential")?.numbers.rows, [21]);
  // The same data again: nothing to say.
  deepEqual(checkHistory.changes(after.kept, after.kept, changeContext("judge")), []);
});

/** A kept check by hand: the findings' codes (no rows) and the p-values given. */
function handKept(findings: string[], p: Partial<CheckKept> = {}): CheckKept {
  return {
    fit: "f",
    n: 30,
    significance: 0.05,
    findings: findings.map((code) => ({ code, rows: [], row_count: 0, message: `${code}.` })),
    durbin_watson: 2,
    durbin_watson_p: 0.5,
    breusch_pagan_p: 0.5,
    shapiro_wilk_p: 0.5,
    condition_number: 10,
    lack_of_fit_p: 0.5,
    ...p,
  };
}

Deno.test("checkHistory.changes() says a test crossed the level only when no finding appeared or went with it", () => {
  // Lack of fit 0.2 → 0.01 crosses 0.05 while RESET keeps the curvature finding in both.
  const a = handKept(["curvature"], { lack_of_fit_p: 0.2 });
  const b = handKept(["curvature"], { lack_of_fit_p: 0.01 });
  const c = checkHistory.changes(a, b, changeContext("c"));
  deepEqual(codes(c), ["test-crossed notable"]);
  deepEqual(c[0].numbers, {
    test: "lack_of_fit_p",
    before: 0.2,
    after: 0.01,
    level: 0.05,
    finding: "curvature",
  });
  equal(
    c[0].sentence,
    "c: the lack-of-fit F test is now significant at 0.05 (p = 0.2 before, 0.01 now).",
  );
  // The curvature finding appears with it: the finding says it, the crossing is not repeated.
  deepEqual(
    codes(checkHistory.changes(handKept([], { lack_of_fit_p: 0.2 }), b, changeContext("c"))),
    ["finding-appeared notable"],
  );
  // Back above: no longer significant.
  equal(
    checkHistory.changes(b, a, changeContext("c"))[0].sentence,
    "c: the lack-of-fit F test is no longer significant at 0.05 (p = 0.01 before, 0.2 now).",
  );
});

Deno.test("checkHistory.changes() reads kept values with fields missing (older records) without guessing", () => {
  const now = handKept(["outlier"], { shapiro_wilk_p: 0.08, lack_of_fit_p: null });
  for (const old of [null, {}, { findings: "x" }]) {
    deepEqual(checkHistory.changes(old as never, now, changeContext("c")), []);
  }
  // No rows, no row count, no significance, no p-values: the finding is compared by its code
  // only, and the tests not at all (missing is not zero, so no p "rose from 0").
  const old = { findings: [{ code: "outlier" }, { rows: [3] }] } as unknown as CheckKept;
  deepEqual(checkHistory.changes(old, now, changeContext("c")), []);
  // Without the check's significance, 1 − the document's level: 0.08 crosses 0.1, not 0.05.
  const noLevel = (p: number) =>
    ({
      ...handKept([], { shapiro_wilk_p: p }),
      significance: undefined,
    }) as unknown as CheckKept;
  const at90 = { ...changeContext("c"), level: 0.9 };
  const c = checkHistory.changes(noLevel(0.3), noLevel(0.08), at90);
  deepEqual(codes(c), ["test-crossed notable"]);
  equal(c[0].numbers.level, 1 - 0.9);
  // A finding whose message is missing: still reported, without the sentence's second part.
  const bare = { ...now, findings: [{ code: "outlier", rows: [7] }] } as unknown as CheckKept;
  equal(
    checkHistory.changes(handKept([]), bare, changeContext("c"))[0].sentence,
    "c: new finding, outlier.",
  );
});
