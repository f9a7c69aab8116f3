/**
 * Reference cases with expected predictions from `../shared/reference/checks/`
 * (README there: `model.predict_at` gives three values per predictor, paired
 * element by element; `expected.prediction` holds fit, se_fit,
 * ci95_lower/upper and pi95_lower/upper with se_prediction² = se_fit² + s²),
 * run through a real document with a fit and a predict cell by
 * `plumb run --json`, and compared to 1e-8 relative (1e-6 for nonlinear
 * cases). Each value's source is the case's `source` field (statsmodels
 * 0.13.5 / scipy 1.10.1), printed beside every failure.
 *
 * @module
 */
import assert from "node:assert/strict";
import { readReferenceJson, REFERENCE_DIR, referenceTests, runDocument } from "./_reference.ts";

/** Ignored, and said once, without the reference data. */
const test = referenceTests("checks_predict");

const CASES = new URL("checks/", REFERENCE_DIR);

interface Prediction {
  fit: number[];
  se_fit: number[];
  ci95_lower: number[];
  ci95_upper: number[];
  pi95_lower: number[];
  pi95_upper: number[];
}

interface Case {
  id: string;
  source: string;
  data: Record<string, number[]>;
  model: {
    type: string;
    response: string;
    predictors: string[];
    intercept?: boolean;
    predict_at?: Record<string, number[]>;
  };
  expected: { result?: string; prediction?: Prediction };
}

/** Every case with expected predictions, read at test time (never copied in). */
async function cases(): Promise<Case[]> {
  const out: Case[] = [];
  for await (const e of Deno.readDir(CASES)) {
    if (!e.name.endsWith(".json")) continue;
    const c = await readReferenceJson<Case>(`checks/${e.name}`);
    if (c.model.predict_at && c.expected.prediction) out.push(c);
  }
  return out.sort((a, b) => a.id.localeCompare(b.id));
}

function csvOf(data: Record<string, number[]>): string {
  const names = Object.keys(data);
  const lines = [names.join(",")];
  for (let i = 0; i < data[names[0]].length; i++) {
    lines.push(names.map((k) => String(data[k][i])).join(","));
  }
  return lines.join("\n") + "\n";
}

function documentOf(c: Case): string {
  const terms = c.model.predictors.map((p) => `b_${p}*${p}`).join(" + ");
  const rhs = c.model.intercept === false ? terms : `b0 + ${terms}`;
  const at = Object.entries(c.model.predict_at!).map(([k, v]) => `${k}: [${v.join(", ")}]`);
  return [
    "---\nconfidence: 0.95\n---\n",
    "```table data\nfrom: data.csv\n```\n",
    "```fit model\non: data\nmodel: " + `${c.model.response} = ${rhs}` + "\n```\n",
    "```predict at\nfit: model\nat: { " + at.join(", ") + " }\n```\n",
  ].join("\n");
}

function check(got: unknown, want: number, tol: number, what: string) {
  assert.equal(typeof got, "number", `${what}: got ${got}`);
  const err = Math.abs((got as number) - want);
  assert.ok(
    err <= tol * Math.abs(want),
    `${what}: ${got} vs ${want}, relative ${err / Math.abs(want)}`,
  );
}

test("predict cells reproduce every reference case with expected predictions", async () => {
  const all = await cases();
  assert.ok(all.length >= 3, "the sensor calibration and the two multi-predictor cases at least");
  for (const c of all) {
    // Source of every expected value below: c.source (statsmodels 0.13.5 / scipy 1.10.1).
    const src = `${c.id}: ${c.source}`;
    const tol = c.model.type === "nls" ? 1e-6 : 1e-8;
    const run = await runDocument(documentOf(c), { "data.csv": csvOf(c.data) });
    assert.equal(run.exitCode, 0, `${src}: ${JSON.stringify(run.cells.map((x) => x.error))}`);
    const r = run.cells.find((x) => x.name === "at")!.result;
    const e = c.expected.prediction!;
    assert.equal(r.level, 0.95, src);
    assert.equal(r.at.length, e.fit.length, `${src}: paired, not a grid`);
    e.fit.forEach((want, i) => {
      const p = r.at[i], tag = `${src}, point ${i + 1}`;
      for (const [k, v] of Object.entries(c.model.predict_at!)) assert.equal(p.x[k], v[i], tag);
      check(p.estimate, want, tol, `${tag} estimate`);
      check(p.se_fit, e.se_fit[i], tol, `${tag} se_fit`);
      check(p.ci[0], e.ci95_lower[i], tol, `${tag} ci95 lower`);
      check(p.ci[1], e.ci95_upper[i], tol, `${tag} ci95 upper`);
      check(p.pi[0], e.pi95_lower[i], tol, `${tag} pi95 lower`);
      check(p.pi[1], e.pi95_upper[i], tol, `${tag} pi95 upper`);
    });
  }
});
