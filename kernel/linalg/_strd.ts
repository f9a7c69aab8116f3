/**
 * Test support: reads a NIST StRD set (Statistical Reference Datasets,
 * https://www.itl.nist.gov/div898/strd/) from the shared reference folder
 * `/work/shared/reference/strd/` — located relative to the repository, never
 * copied into it — and checks the file's SHA-256 against `manifest.json`.
 *
 * When the folder is missing the caller skips with one console line, unless
 * the environment sets PLUMB_REQUIRE_REFERENCE=1, when it fails.
 *
 * @module
 */
import { parseDecimal } from "../csv/mod.ts";

/** The shared reference folder, `../shared/reference/` beside the repository. */
export const REFERENCE_DIR = new URL("../../../shared/reference/", import.meta.url);

/** One StRD set: its data columns and NIST's certified values (from manifest.json). */
export interface StrdSet {
  name: string;
  /** Column names as in the file's `Data:` line, response first. */
  columns: string[];
  /** One Float64Array per column. */
  data: Float64Array[];
  /** Per column, each number as printed less its double (kernel/csv `parseDecimal`). */
  lo: Float64Array[];
  parameters: { name: string; estimate: number; std_dev: number }[];
  residual_sum_of_squares: number;
  residual_std_dev: number;
  r_squared: number;
  degrees_of_freedom: number;
}

interface ManifestSet {
  name: string;
  file: string;
  sha256: string;
  data: { first_line: number; last_line: number; columns: string[]; n_rows: number };
  parameters: { name: string; estimate: number; std_dev: number }[];
  residual_sum_of_squares: number;
  residual_std_dev: number;
  r_squared: number;
  degrees_of_freedom: number;
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const d = new Uint8Array(await crypto.subtle.digest("SHA-256", bytes as BufferSource));
  return Array.from(d, (b) => b.toString(16).padStart(2, "0")).join("");
}

/**
 * Loads a set by name (from `base`, default {@link REFERENCE_DIR}), or returns null (after one console line) when the
 * reference folder is absent and PLUMB_REQUIRE_REFERENCE is not "1".
 */
export async function loadStrd(name: string, base: URL = REFERENCE_DIR): Promise<StrdSet | null> {
  let manifestText: string;
  try {
    manifestText = await Deno.readTextFile(new URL("strd/manifest.json", base));
  } catch (e) {
    if (!(e instanceof Deno.errors.NotFound)) throw e;
    if (Deno.env.get("PLUMB_REQUIRE_REFERENCE") === "1") {
      throw new Error(
        `Reference data missing: "${base.pathname}" not found and PLUMB_REQUIRE_REFERENCE=1`,
      );
    }
    console.log(`skipped: NIST StRD ${name} check, no reference data at ${base.pathname}`);
    return null;
  }
  const set = (JSON.parse(manifestText).sets as ManifestSet[]).find((s) => s.name === name);
  if (!set) throw new Error(`Reference set "${name}" is not in the StRD manifest`);
  const bytes = await Deno.readFile(new URL(`strd/${set.file}`, base));
  const digest = await sha256Hex(bytes);
  if (digest !== set.sha256) {
    throw new Error(
      `Reference file "${set.file}" has SHA-256 ${digest}, manifest says ${set.sha256}`,
    );
  }
  const lines = new TextDecoder().decode(bytes).split("\n");
  const rows = lines.slice(set.data.first_line - 1, set.data.last_line)
    .map((l) => l.trim()).filter((l) => l !== "")
    .map((l) => l.split(/\s+/).map((t) => parseDecimal(t)));
  if (rows.length !== set.data.n_rows) {
    throw new Error(
      `Reference file "${set.file}": ${rows.length} rows, expected ${set.data.n_rows}`,
    );
  }
  const data = set.data.columns.map((_, j) => Float64Array.from(rows, (r) => r[j][0]));
  const lo = set.data.columns.map((_, j) => Float64Array.from(rows, (r) => r[j][1]));
  return {
    name,
    columns: set.data.columns,
    data,
    lo,
    parameters: set.parameters,
    residual_sum_of_squares: set.residual_sum_of_squares,
    residual_std_dev: set.residual_std_dev,
    r_squared: set.r_squared,
    degrees_of_freedom: set.degrees_of_freedom,
  };
}

/** Number of correct significant digits of `got` against `want` (LRE, McCullough 1998), capped at 15. */
export function digits(got: number, want: number): number {
  if (got === want) return 15;
  const rel = want === 0 ? Math.abs(got) : Math.abs(got - want) / Math.abs(want);
  return Math.min(15, -Math.log10(rel));
}
