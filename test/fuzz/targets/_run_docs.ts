/**
 * Whole analysis documents that exercise every kind: a table (from a data
 * file beside the document or inline rows), fits with generated models,
 * compare, check, predict and chart over them, each option sometimes
 * replaced by a hostile value, and data with edge values, few rows, or
 * constant columns.
 *
 * @module
 */
import { NUMBER_EDGES } from "../_generators.ts";
import type { Rng } from "../_rng.ts";
import { exprText } from "./_expr_text.ts";
import { yamlValue } from "./_yaml_values.ts";

/** A data file: x, y, z with y a noisy function of x; some edge values. */
export function dataCsv(rng: Rng): string {
  const rows = rng.chance(0.1) ? rng.int(4) : rng.between(4, rng.chance(0.05) ? 3000 : 40);
  const slope = rng.next() * 10 - 5, bend = rng.chance(0.5) ? rng.next() : 0;
  let out = rng.pick(["x,y,z\n", "x,y,z\n", "x,y,constructor\n", "x,y\n"]);
  const cols = out.split(",").length;
  for (let i = 1; i <= rows; i++) {
    const x = rng.chance(0.1) ? 1 : i * (rng.chance(0.5) ? 1 : 0.37);
    const y = 2 + slope * x + bend * x * x + rng.next() - 0.5;
    const z = rng.chance(0.5) ? rng.int(4) : Math.exp(rng.next());
    const f = [x, y, z].map((v) => (rng.chance(0.004) ? rng.pick(NUMBER_EDGES) : String(v)));
    out += f.slice(0, cols).join(",") + "\n";
  }
  return out;
}

/** An option value: the sensible one mostly, sometimes any YAML value. */
function opt(rng: Rng, sensible: string): string {
  return rng.chance(0.93) ? sensible : yamlValue(rng, 3, "  ").replace(/^\n/, "\n");
}

const cell = (kind: string, name: string, lines: string[]) =>
  "```" + `${kind} ${name}\n${lines.join("\n")}\n` + "```\n\n";

function table(rng: Rng): string {
  const lines = rng.chance(0.75)
    ? [
      `from: ${
        opt(
          rng,
          rng.chance(0.9) ? "d.csv" : rng.pick(["../d.csv", "/etc/hostname", "sub", "none.csv"]),
        )
      }`,
    ]
    : ["columns: [x, y]", `rows: ${opt(rng, "[[1, 2], [2, 4.1], [3, 5.9], [4, 8.2], [5, 9.7]]")}`];
  if (rng.chance(0.2)) {
    lines.push(`exclude:\n  - rows: ${opt(rng, "[2]")}\n    why: ${opt(rng, "probe")}`);
  }
  if (rng.chance(0.2)) lines.push(`derive: { w: ${opt(rng, exprText(rng, 2))} }`);
  if (rng.chance(0.15)) lines.push(`where: ${opt(rng, "x > 1")}`);
  if (rng.chance(0.15)) {
    lines.push(`units: { x: ${opt(rng, "s")}, y: ${opt(rng, "mAh/cycles^0.5")} }`);
  }
  return cell("table", "t", lines);
}

function model(rng: Rng): string {
  return rng.pick([
    "y = a + b*x",
    "y = polynomial(x, 2)",
    "y = a*exp(-k*x) + c",
    "log(y) = a + b*x",
    "y = a*x^b",
    `y = ${exprText(rng, 3)}`,
  ]);
}

function fits(rng: Rng, n: number): string {
  let out = "";
  for (let i = 1; i <= n; i++) {
    const lines = ["on: t", `model: ${opt(rng, model(rng))}`];
    if (rng.chance(0.2)) lines.push(`start: ${opt(rng, "{ a: 1, b: 1, k: 0.1, c: 0 }")}`);
    if (rng.chance(0.1)) lines.push(`weights: ${opt(rng, "1/x")}`);
    if (rng.chance(0.1)) lines.push(`within: ${opt(rng, "{ b: [0, null] }")}`);
    out += cell("fit", `f${i}`, lines);
  }
  return out;
}

/**
 * A document with a table, one to three fits and the other kinds over them.
 *
 * @param rng The input's generator.
 * @returns The document text (it reads `d.csv`).
 */
export function runDocument(rng: Rng): string {
  const n = rng.between(1, 3);
  const list = `[${Array.from({ length: n }, (_, i) => `f${i + 1}`).join(", ")}]`;
  let doc = rng.chance(0.3)
    ? `---\nconfidence: ${opt(rng, "0.9")}\nseed: ${opt(rng, "3")}\n---\n\n`
    : "";
  doc += table(rng) + fits(rng, n);
  if (rng.chance(0.6)) {
    doc += cell("compare", "c", [`fits: ${opt(rng, list)}`, `by: ${opt(rng, "aicc")}`]);
  }
  if (rng.chance(0.6)) doc += cell("check", "k", [`fit: ${opt(rng, "f1")}`]);
  if (rng.chance(0.6)) {
    doc += cell("predict", "p", [
      `fit: ${opt(rng, "f1")}`,
      `at: ${opt(rng, "{ x: [1, 2.5] }")}`,
      ...(rng.chance(0.5) ? [`solve: ${opt(rng, "{ y: 3 }")}`] : []),
    ]);
  }
  if (rng.chance(0.6)) {
    doc += cell("chart", "g", [
      "on: t",
      "x: x",
      "y: y",
      `fits: ${opt(rng, list)}`,
      `band: ${opt(rng, "f1")}`,
    ]);
  }
  if (rng.chance(0.3)) doc += `The fit explains @(${opt(rng, "f1")}.r2, ${opt(rng, "3")}).\n`;
  return doc;
}
