/**
 * Support for reference suites: where the shared reference data lives, the
 * skip-or-fail rule, running a real document through `plumb run --json`, and
 * NIST's log relative error.
 *
 * The data are read from `../shared/reference/` beside the repository at run
 * time and never copied in. Where that folder is absent every reference test
 * is registered as ignored (`ignore: withoutReference(suite)`, so Deno counts
 * it ignored, not passed) and the run prints one line, once, saying how to
 * get the data; with PLUMB_REQUIRE_REFERENCE=1 (CI) the suite fails instead.
 *
 * @module
 */
import { join } from "node:path";
import { printOnce } from "../_once.ts";

/** `../shared/reference/` beside the repository. */
export const REFERENCE_DIR = new URL("../../../shared/reference/", import.meta.url);

const MAIN = new URL("../../cells/main.ts", import.meta.url).pathname;

/**
 * Whether a reference suite's tests are ignored: true when the reference data
 * are absent (the run then says so once, with how to get them).
 *
 * @param suite The suite's name, for the message when the data are required.
 * @returns `ignore` for Deno.test.
 * @throws {Error} When the data are missing and PLUMB_REQUIRE_REFERENCE=1.
 */
export function withoutReference(suite: string): boolean {
  try {
    Deno.statSync(REFERENCE_DIR);
    return false;
  } catch {
    const where = REFERENCE_DIR.pathname;
    if (Deno.env.get("PLUMB_REQUIRE_REFERENCE") === "1") {
      throw new Error(
        `Reference data not found at ${where} and PLUMB_REQUIRE_REFERENCE=1: suite "${suite}" cannot run`,
      );
    }
    printOnce(
      "reference",
      `skip: reference suites (no ${where}): they come with the project's shared/ folder; ` +
        `place it beside this checkout as ../shared to run them`,
    );
    return true;
  }
}

/**
 * The `Deno.test` of a reference suite: each test registered as ignored
 * when the reference data are absent.
 *
 * @param suite The suite's name.
 * @returns A function registering one test by name and body.
 * @throws {Error} When the data are missing and PLUMB_REQUIRE_REFERENCE=1.
 */
export function referenceTests(
  suite: string,
): (name: string, fn: (t: Deno.TestContext) => Promise<void>) => void {
  const ignore = withoutReference(suite);
  return (name, fn) => Deno.test({ name, ignore, fn });
}

/**
 * Whether the reference data are present (the opposite of
 * `withoutReference`, with its message and its rule when they are required).
 *
 * @param suite The suite's name, for the message.
 * @returns True when the suite can run.
 * @throws {Error} When the data are missing and required.
 */
export function referenceAvailable(suite: string): boolean {
  return !withoutReference(suite);
}

/**
 * Reads a JSON file from the reference folder.
 *
 * @param path Path inside `../shared/reference/`.
 * @returns The parsed JSON.
 */
export async function readReferenceJson<T = unknown>(path: string): Promise<T> {
  return JSON.parse(await Deno.readTextFile(new URL(path, REFERENCE_DIR))) as T;
}

/**
 * Reads a text file from the reference folder.
 *
 * @param path Path inside `../shared/reference/`.
 * @returns Its text.
 */
export function readReferenceText(path: string): Promise<string> {
  return Deno.readTextFile(new URL(path, REFERENCE_DIR));
}

/** A cell of RUN-JSON (../shared/RUN-JSON.md). */
export interface RunCell {
  name: string;
  kind: string;
  state: string;
  line: number;
  error: { message: string; line: number; column: number } | null;
  warnings: string[];
  // deno-lint-ignore no-explicit-any
  result: any;
}

/** RUN-JSON of a whole document. */
export interface RunJson {
  plumb: string;
  document: string;
  ok: boolean;
  cells: RunCell[];
}

/**
 * Writes a document and its data files into a fresh folder and runs it with
 * `plumb run --json` in a subprocess with the CLI's own permissions.
 *
 * @param doc The analysis document's text.
 * @param files Data files by name (text).
 * @returns The parsed RUN-JSON and the exit status.
 */
export async function runDocument(
  doc: string,
  files: Record<string, string> = {},
): Promise<RunJson & { exitCode: number }> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-ref-" });
  try {
    for (const [name, text] of Object.entries(files)) {
      await Deno.writeTextFile(join(dir, name), text);
    }
    const path = join(dir, "analysis.md");
    await Deno.writeTextFile(path, doc);
    const out = await new Deno.Command(Deno.execPath(), {
      args: [
        "run",
        "--allow-read",
        "--allow-env=LOG_TOKENS,LOG_STREAM",
        MAIN,
        "run",
        path,
        "--json",
      ],
      stdout: "piped",
      stderr: "piped",
    }).output();
    const stdout = new TextDecoder().decode(out.stdout);
    if (out.code === 2) {
      throw new Error(`plumb run failed: ${new TextDecoder().decode(out.stderr)}`);
    }
    return { ...JSON.parse(stdout), exitCode: out.code };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

/**
 * Log relative error as NIST defines it for StRD: −log₁₀(|x − c| / |c|), or
 * −log₁₀|x| when the certified value c is 0; capped at the digits certified.
 *
 * @param x The computed value.
 * @param c The certified value.
 * @param cap Largest LRE reported (15 for linear sets, 11 for nonlinear).
 * @returns The number of agreeing significant digits (0 when x is not finite).
 * @example
 * ```ts
 * import { lre } from "./_reference.ts";
 * if (Math.abs(lre(1.0000001, 1) - 7) > 1e-6) throw new Error();
 * ```
 */
export function lre(x: number, c: number, cap = 15): number {
  if (!Number.isFinite(x)) return 0;
  if (x === c) return cap;
  const e = c === 0 ? Math.abs(x) : Math.abs(x - c) / Math.abs(c);
  return Math.max(0, Math.min(cap, -Math.log10(e)));
}

/** The part of a StRD manifest entry that locates its data lines. */
export interface StrdData {
  name: string;
  data: { first_line: number; columns: string[]; n_rows: number };
}

/**
 * A StRD set's data lines (NIST .dat text) as CSV, each number string copied
 * exactly as printed, so a table sees the data as printed.
 *
 * @param set The set's manifest entry.
 * @param text The .dat file's text.
 * @returns CSV with the manifest's column names as header.
 * @throws {Error} When the row count differs from the manifest's.
 */
export function strdCsv(set: StrdData, text: string): string {
  const rows = text.split("\n").slice(set.data.first_line - 1)
    .map((l) => l.trim()).filter((l) => l !== "")
    .map((l) => l.split(/\s+/).join(","));
  if (rows.length !== set.data.n_rows) {
    throw new Error(`${set.name}: ${rows.length} data rows, the manifest says ${set.data.n_rows}`);
  }
  return [set.data.columns.join(","), ...rows].join("\n") + "\n";
}
