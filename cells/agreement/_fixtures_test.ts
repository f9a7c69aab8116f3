/**
 * Test support for the agreement kind: tables built by hand, a context and
 * a runner. Nothing here was measured.
 *
 * @module
 */
import type { Column, DocSettings, RunContext, Table } from "../../kernel/contract/mod.ts";
import { seededRandom } from "../../kernel/random.ts";
import { agreementKind } from "./mod.ts";
import type { AgreementResult } from "./result.ts";
import type { Agreement } from "./agreement.ts";

/** Document settings of the tests. */
export const SETTINGS: DocSettings = {
  title: "test",
  confidence: 0.95,
  seed: 1,
  criterion: "aicc",
  maxFileBytes: 1e9,
  extra: {},
};

/** A table of number columns (NaN missing) and text columns (null missing). */
export function table(cols: Record<string, number[] | (string | null)[]>): Table {
  const columns: Column[] = Object.entries(cols).map(([name, v]) =>
    typeof v.find((x) => x !== null) === "string"
      ? {
        name,
        type: "text",
        unit: null,
        values: v as (string | null)[],
        missing: v.filter((x) => x === null).length,
      }
      : {
        name,
        type: "number",
        unit: null,
        values: Float64Array.from(v as number[]),
        lo: null,
        missing: (v as number[]).filter(Number.isNaN).length,
      }
  );
  const m = columns[0].values.length;
  return {
    type: "Table",
    columns,
    rows: Int32Array.from({ length: m }, (_, i) => i + 1),
    rowsRead: m,
    excluded: [],
    sha256: null,
    source: null,
  };
}

/**
 * Invented readings of `n` samples: true levels spread over 2…20, method x
 * with SD `sx`, method y = a + b·level with SD `sy`, seeded; `reps` rows per
 * sample (a sample column "id" when reps > 1).
 */
export function readings(
  n: number,
  { a = 0, b = 1, sx = 0.2, sy = 0.2, reps = 1, seed = 3 } = {},
): Table {
  const random = seededRandom(seed);
  const id: string[] = [], x: number[] = [], y: number[] = [];
  for (let i = 0; i < n; i++) {
    const level = 2 + 18 * random();
    for (let r = 0; r < reps; r++) {
      id.push(`s${i + 1}`);
      x.push(level + sx * random.normal());
      y.push(a + b * level + sy * random.normal());
    }
  }
  return table(reps > 1 ? { id, x, y } : { x, y });
}

/** Parses and runs an agreement cell on `readings`: its output, RUN-JSON result and warnings. */
export function runAgreementCell(
  options: Record<string, unknown>,
  readingsTable: Table,
  name = "meters",
): { out: Agreement; result: AgreementResult; warnings: string[] } {
  const warnings: string[] = [];
  const spec = agreementKind.parse({
    name,
    kind: "agreement",
    body: "",
    options: { on: "readings", x: "x", y: "y", ...options },
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
  });
  const ctx: RunContext = {
    name,
    settings: SETTINGS,
    inputs: { readings: readingsTable },
    files: {},
    warn: (m) => warnings.push(m),
    progress: () => {},
  };
  const out = agreementKind.run(spec, ctx) as Agreement;
  return { out, result: agreementKind.summary(out, spec), warnings };
}
