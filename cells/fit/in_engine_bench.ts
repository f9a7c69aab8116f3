/**
 * The in-engine linear fit on 1,000,000 invented rows × 5 predictors in an
 * in-memory DuckDB (the test double of `_in_engine_testing.ts`: no engine
 * process, no file), by route. Run with
 * `deno bench --allow-read --allow-env --allow-ffi cells/fit/in_engine_bench.ts`;
 * the first run of each prints its passes' milliseconds.
 *
 * @module
 */
import { parseModel } from "../../kernel/expr/mod.ts";
import { fitInEngine, type InEngineFit } from "./_in_engine.ts";
import { DuckDbTestEngine, TEST_DB } from "./_in_engine_testing.ts";

const ROWS = 1_000_000;

/** Uniform on [0, 1) from DuckDB's hash of the row number and a stream number (seeded, no state). */
const u = (k: number) => `(hash(i, ${k}) % 4294967296) / 4294967296.0`;

const engine = await DuckDbTestEngine.open();
await engine.run(
  `CREATE TABLE big AS SELECT i AS t, 10 + 4 * ${u(1)} AS x1, 100 * ${u(2)} AS x2, ` +
    `3 + ${u(3)} AS x3, -5 + ${u(4)} AS x4, 1000 * (1 + ${u(5)}) AS x5, ${u(6)} - 0.5 AS noise ` +
    `FROM range(${ROWS}) AS r(i)`,
);
// Collinear x3' = 0.3·x1 + small noise: κ past the limit, so the rows are streamed through QR.
await engine.run(
  `CREATE TABLE readings AS SELECT t, x1, x2, x3, x4, x5, 0.3 * x1 + 0.01 * x3 AS x6, ` +
    `3 + 1.5 * x1 - 2 * x2 + 0.75 * x3 + 4 * x4 - 0.0025 * x5 + noise AS y FROM big`,
);
const columns = ["t", "x1", "x2", "x3", "x4", "x5", "x6", "y"];

async function fit(text: string, order: string | null): Promise<InEngineFit> {
  const got = await fitInEngine(
    {
      name: "bench",
      model: parseModel(text, columns),
      query: "SELECT * FROM readings",
      columns: new Map(columns.map((c) => [c, "number" as const])),
      order,
      confidence: 0.95,
      countVariance: true,
      warn: () => {},
    },
    engine,
    TEST_DB,
  );
  if (!got.ok) throw new Error(got.why);
  return got.fit;
}

const said = new Set<string>();
function say(label: string, f: InEngineFit): void {
  if (said.has(label)) return;
  said.add(label);
  const passes = f.passes.map((p) => `${p.name} ${p.ms.toFixed(0)} ms`).join("; ");
  console.log(`${label}: route ${f.route}, κ ${f.kappa.toPrecision(3)}: ${passes}`);
}

Deno.bench({
  name: "1,000,000 × 5, sums (passes 1–3)",
  group: "in-engine",
  n: 3,
  async fn() {
    say("sums", await fit("y = linear(x1, x2, x3, x4, x5)", null));
  },
});

Deno.bench({
  name: "1,000,000 × 5, sums and Durbin–Watson (pass 4)",
  group: "in-engine",
  n: 3,
  async fn() {
    say("sums + DW", await fit("y = linear(x1, x2, x3, x4, x5)", "t"));
  },
});

Deno.bench({
  name: "1,000,000 × 5, rows streamed through QR",
  group: "in-engine",
  n: 3,
  async fn() {
    say("qr", await fit("y = linear(x1, x2, x4, x5, x6)", null));
  },
});
