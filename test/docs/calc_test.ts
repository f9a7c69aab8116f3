/**
 * docs/calc.md against the code, both ways: every cell it shows either is a
 * cell of an example, word for word, or runs (current) when added to the
 * example whose cells it reads; every number its prose quotes is what those
 * runs give, as an inline value shows it; and its table of refusals quotes
 * exactly the sentences the sandbox says. docs/run-json.md lists exactly the
 * fields of a calc cell's result.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { resolveValue } from "../../ui/inline_value.ts";
import { summarizeCalc } from "../../cells/calc/result.ts";
import { plumbRunJson } from "../examples/_plumb_run.ts";

const ROOT = new URL("../../", import.meta.url);
const read = (path: string) => Deno.readTextFileSync(new URL(path, ROOT));
const DOC = read("docs/calc.md");
const EXAMPLES = ["examples/fade/fade.md", "examples/calibration/nitrite.md"];

interface Shown {
  kind: string;
  name: string;
  body: string;
}

/** The cells shown in the page's ````markdown blocks. */
function shownCells(): Shown[] {
  const out: Shown[] = [];
  for (const block of DOC.matchAll(/^````markdown\n([\s\S]*?)^````$/gm)) {
    for (const m of block[1].matchAll(/^```([a-z]+) ([A-Za-z0-9_-]+)\n([\s\S]*?)^```$/gm)) {
      out.push({ kind: m[1], name: m[2], body: m[3] });
    }
  }
  return out;
}

/** The cells of a document by name: kind and body as written. */
function cellsOf(path: string): Map<string, Shown> {
  const text = read(path);
  const out = new Map<string, Shown>();
  for (const m of text.matchAll(/^```([a-z]+) ([A-Za-z0-9_-]+)\n([\s\S]*?)^```$/gm)) {
    out.set(m[2], { kind: m[1], name: m[2], body: m[3] });
  }
  return out;
}

/** The cells a shown calc reads (its `reads` line, aliases dropped). */
function readsOf(body: string): string[] {
  const line = /^reads:([^#\n]*)/m.exec(body)?.[1] ?? "";
  return line.split(",").map((p) => p.trim().split(/\s+/)[0]).filter((n) => n !== "");
}

interface Cell {
  name: string;
  state: string;
  error: { message: string } | null;
  result: Record<string, unknown> | null;
}

/** `plumb run --json` of an example with extra cells appended, in a copy of its folder. */
async function runWith(example: string, extra: Shown[]): Promise<Map<string, Cell>> {
  const folder = new URL(example.slice(0, example.lastIndexOf("/") + 1), ROOT).pathname;
  const dir = await Deno.makeTempDir({ prefix: "plumb-docs-calc-" });
  try {
    await Deno.mkdir(join(dir, "data"));
    for (const f of Deno.readDirSync(join(folder, "data"))) {
      if (f.isFile) await Deno.copyFile(join(folder, "data", f.name), join(dir, "data", f.name));
    }
    const added = extra.map((c) => "```" + `${c.kind} ${c.name}\n${c.body}` + "```\n").join("\n");
    const doc = join(dir, "doc.md");
    await Deno.writeTextFile(doc, `${read(example)}\n${added}`);
    const json = (await plumbRunJson(doc, "--no-history")).json as { cells: Cell[] };
    return new Map(json.cells.map((c) => [c.name, c]));
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

/** A field as prose shows it. */
function shown(cells: Map<string, Cell>, name: string, path: (string | number)[], digits: number) {
  const r = resolveValue(cells.get(name)?.result, name, path, digits);
  ok(r.ok, r.ok ? "" : r.error);
  return r.text;
}

/** Each example with the shown cells it does not hold (those it holds are checked verbatim). */
function placed(): Map<string, Shown[]> {
  const docs = new Map(EXAMPLES.map((e) => [e, cellsOf(e)]));
  const out = new Map<string, Shown[]>(EXAMPLES.map((e) => [e, []]));
  for (const c of shownCells()) {
    const home = EXAMPLES.find((e) => docs.get(e)!.has(c.name));
    if (home !== undefined) {
      const theirs = docs.get(home)!.get(c.name)!;
      equal(`${c.kind}\n${c.body}`, `${theirs.kind}\n${theirs.body}`, `${c.name} as in ${home}`);
      continue;
    }
    equal(c.kind, "calc", `${c.name}: a shown cell that is not a calc is one of an example's`);
    const reads = readsOf(c.body);
    const where = EXAMPLES.find((e) => reads.every((r) => docs.get(e)!.has(r)));
    ok(where !== undefined, `${c.name}: no example holds ${reads.join(", ")}`);
    out.get(where)!.push(c);
  }
  return out;
}

Deno.test("docs/calc.md: every cell it shows is an example's, word for word, or runs in one", async () => {
  const shownNames = shownCells().map((c) => c.name);
  ok(shownNames.length >= 5, shownNames.join(", "));
  for (const [example, extra] of placed()) {
    const cells = await runWith(example, extra);
    for (const c of extra) {
      const got = cells.get(c.name);
      equal(got?.state, "current", `${c.name} in ${example}: ${got?.error?.message}`);
    }
  }
});

Deno.test("docs/calc.md quotes the numbers the runs give", async () => {
  const where = placed();
  const fade = await runWith(EXAMPLES[0], where.get(EXAMPLES[0])!);
  const quoted: [Map<string, Cell>, string, (string | number)[], number][] = [
    [fade, "crossing", ["value", "cycle"], 4],
    [fade, "crossing", ["value", "u"], 2],
    [fade, "crossing", ["value", "u_without_correlation"], 2],
    [fade, "root-crossing", ["value", "cycle"], 4],
    [fade, "root-crossing", ["value", "u"], 2],
    [fade, "end-of-life", ["solve", 0, "ci", 0], 4],
    [fade, "end-of-life", ["solve", 0, "ci", 1], 4],
  ];
  const calibration = await runWith(EXAMPLES[1], where.get(EXAMPLES[1])!);
  quoted.push(
    [calibration, "spread", ["table", "rows_used"], 1],
    [calibration, "spread-law", ["m"], 2],
    [calibration, "spread-law", ["parameters", "m", "std_error"], 2],
    [calibration, "spread-law", ["parameters", "m", "ci", 0], 2],
    [calibration, "spread-law", ["parameters", "m", "ci", 1], 3],
  );
  for (const [cells, name, path, digits] of quoted) {
    const text = shown(cells, name, path, digits);
    ok(DOC.includes(text), `${name}.${path.join(".")} = ${text} is quoted`);
  }
  const columns = (calibration.get("spread")!.result!.table as { columns: unknown[] }).columns;
  const rowsUsed = (calibration.get("spread")!.result!.table as { rows_used: number }).rows_used;
  ok(DOC.includes(`${rowsUsed} rows and ${columns.length} columns`));
  // The page says the numerical root crossing agrees with the closed form ((q0 − Q)/a)² and its
  // analytic gradient (exact arithmetic: t = ((q0 − Q)/a)², ∂t/∂q0 = 2(q0 − Q)/a²,
  // ∂t/∂a = −2(q0 − Q)²/a³) to the digits shown.
  const root = fade.get("root")!.result as {
    parameters: { estimate: number }[];
    covariance: number[][];
  };
  const [q0, a] = root.parameters.map((p) => p.estimate);
  const t = ((q0 - 2300) / a) ** 2;
  const g = [2 * (q0 - 2300) / a ** 2, -2 * (q0 - 2300) ** 2 / a ** 3];
  const c = root.covariance;
  const u = Math.sqrt(g[0] * g[0] * c[0][0] + 2 * g[0] * g[1] * c[0][1] + g[1] * g[1] * c[1][1]);
  const got = fade.get("root-crossing")!.result!.value as { cycle: number; u: number };
  ok(Math.abs(got.cycle - t) < 1e-9 * t, `${got.cycle} against ${t}`);
  ok(Math.abs(got.u - u) < 1e-5 * u, `${got.u} against ${u}`);
});

Deno.test("docs/calc.md quotes every refusal the sandbox says, and only those", () => {
  const child = read("kernel/sandbox/_child.js");
  const denied = /const DENIED = \{([\s\S]*?)\};/.exec(child)![1];
  const said = [...denied.matchAll(/^\s+[a-z]+: "(.+)",$/gm)].map((m) => `This cell ${m[1]}`);
  ok(said.length >= 10, `${said.length} refusals`);
  const section = DOC.split("## What a calc cell cannot do")[1].split("\n\n").slice(1, 3).join(
    "\n",
  );
  const rows = section.split("\n").filter((l) => /^\|.*\|$/.test(l) && !/^\|\s*-/.test(l))
    .slice(1).map((l) => l.slice(1, -1).split("|")[1].trim());
  const sources = [
    child,
    read("kernel/sandbox/isolate.ts"),
    read("cells/calc/spec.ts"),
    read("cells/calc/run.ts"),
  ].join("\n");
  for (const r of rows) ok(sources.includes(r.replace(/^This cell /, "")), `"${r}" is said`);
  deepEqual(said.filter((s) => !rows.includes(s)), [], "every refusal is in the table");
});

Deno.test("docs/run-json.md lists exactly the fields of a calc cell's result", () => {
  const section = read("docs/run-json.md").split("## `calc`")[1].split("\n## ")[0];
  const block = /```jsonc\n([\s\S]*?)```/.exec(section)![1];
  const documented = [...block.matchAll(/^ {2}"([a-z_]+)":/gm)].map((m) => m[1]);
  const made = summarizeCalc({
    type: "Value",
    value: 1,
    console: "",
    consoleCut: 0,
    runMs: 1,
  });
  deepEqual(documented.sort(), Object.keys(made).sort());
});
