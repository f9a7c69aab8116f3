/**
 * Type-checking a user program before it runs: Deno's own checker in a child
 * process (`deno run --check` over standard input, no permissions, an empty
 * environment, a heap cap), so its diagnostics are exactly the runtime's
 * TypeScript's.
 *
 * The checker loads every module the program names, and a program can name
 * one without the word `import` (code that closes the function it was put in
 * and writes `export * from "…"`). Two guards:
 *
 * - an import map sends every `file:` specifier to a host that `--no-remote`
 *   refuses, so no file of the machine is read: a file's text would come
 *   back in the checker's report, and a script would run;
 * - `deno run` evaluates the module after a clean check, dependencies first:
 *   the program's first line imports a module that throws, so no other
 *   module (a `data:` URL of the code's making) and no user text runs there.
 *
 * A check costs about a second of the compiler's start-up; results are kept
 * by the program's SHA-256, so code whose inputs changed value but not shape
 * is not checked again.
 *
 * @module
 */
import { sha256Hex } from "../hash.ts";
import { cannotStart, spawnDeno } from "./_spawn.ts";

/** One error of the checker, at a 1-based line and column of the program. */
export interface Diagnostic {
  /**
   * TypeScript's error number, e.g. 2551; 0 for an error of Deno's own parser
   * (which stops before TypeScript runs and gives no number).
   */
  code: number;
  message: string;
  line: number;
  column: number;
}

/** The outcome of a check. */
export type CheckAnswer =
  | { ok: true; ms: number }
  | { ok: false; diagnostics: Diagnostic[]; ms: number; message?: string };

/** How long a check may take (s): the compiler's start-up is about 1 s here. */
const CHECK_SECONDS = 60;
/** Checks kept (by program digest). */
const KEEP = 256;

const kept = new Map<string, CheckAnswer>();

/** What the guard throws; seen in the report, the check passed and nothing else ran. */
const MARK = "plumb-sandbox: checked, not run";
/**
 * The line put before the module: the first module it imports throws when
 * evaluated, and modules are evaluated in the order they are named, so no
 * later one runs.
 */
const GUARD = `import "data:application/javascript,throw%20${
  encodeURIComponent(JSON.stringify(MARK))
}";`;
/** Where file: specifiers go: a host `--no-remote` refuses (`.invalid` is never a real name, RFC 2606). */
const NOWHERE = "https://plumb-sandbox.invalid/";
/** The import map, as a data: URL (no file to write). */
const IMPORT_MAP = "data:application/json," +
  encodeURIComponent(JSON.stringify({ imports: { "file:///": NOWHERE } }));
/** Heap cap of the checker (MB): a check of a calc module peaks near 220 MB resident here. */
const CHECK_HEAP_MB = 1024;

/**
 * The diagnostics in the checker's report, in order (the first location
 * after each error header is the error's own; related notes are skipped).
 *
 * @param text The checker's output (colour off).
 * @returns The errors found.
 * @example
 * ```ts
 * import { parseDiagnostics } from "./check.ts";
 * const d = parseDiagnostics(
 *   "TS2551 [ERROR]: Property 'parms' does not exist. Did you mean 'params'?\n" +
 *     "  x.parms\n    at file:///a/$deno$stdin.mts:3:27\n",
 * );
 * if (d[0].code !== 2551 || d[0].line !== 3 || d[0].column !== 27) throw new Error("parsed");
 * ```
 */
export function parseDiagnostics(text: string): Diagnostic[] {
  const out: Diagnostic[] = [];
  let open: { code: number; message: string } | null = null;
  for (const line of text.split("\n")) {
    // Deno parses the module before TypeScript checks it: "error: SyntaxError: …", then its place.
    const parse = /^error: SyntaxError: (.*)$/.exec(line);
    if (parse) {
      open = { code: 0, message: parse[1].trim() };
      continue;
    }
    const head = /^TS(\d+) \[ERROR\]: (.*)$/.exec(line);
    if (head) {
      // An indented message is a note on the error before it ("The parser expected…").
      open = /^\s/.test(head[2]) ? null : { code: Number(head[1]), message: head[2].trim() };
      continue;
    }
    const at = /^\s+at .*:(\d+):(\d+)\s*$/.exec(line);
    if (at && open) {
      out.push({ ...open, line: Number(at[1]), column: Number(at[2]) });
      open = null;
    }
  }
  return out;
}

/**
 * Type-checks a TypeScript module; never throws.
 *
 * @param program The module's text.
 * @returns ok, or the diagnostics (or a `message` when the checker could not run).
 */
export async function checkProgram(program: string): Promise<CheckAnswer> {
  const key = await sha256Hex(new TextEncoder().encode(program));
  const known = kept.get(key);
  if (known) return { ...known, ms: 0 };
  const t0 = performance.now();
  let child: Deno.ChildProcess;
  try {
    child = spawnDeno([
      "run",
      "--check",
      "--no-config",
      "--no-lock",
      "--no-remote",
      "--no-npm",
      "--no-prompt",
      `--import-map=${IMPORT_MAP}`,
      `--v8-flags=--max-old-space-size=${CHECK_HEAP_MB},--disallow-code-generation-from-strings`,
      "-",
    ]);
  } catch (err) {
    return {
      ok: false,
      diagnostics: [],
      ms: performance.now() - t0,
      message: cannotStart(err, "the type checker"),
    };
  }
  let late = false;
  const timer = setTimeout(() => {
    late = true;
    try {
      child.kill("SIGKILL");
    } catch { /* gone */ }
  }, CHECK_SECONDS * 1000);
  try {
    const w = child.stdin.getWriter();
    await w.write(new TextEncoder().encode(`${GUARD}\n${program}`));
    await w.close();
  } catch { /* ended early */ }
  const done = await child.output().catch(() => null);
  clearTimeout(timer);
  const ms = performance.now() - t0;
  if (done === null) return { ok: false, diagnostics: [], ms, message: "The type check stopped" };
  const text = new TextDecoder().decode(done.stdout) + "\n" + new TextDecoder().decode(done.stderr);
  // Lines as the caller numbered them: the guard took line 1.
  const diagnostics = parseDiagnostics(text).map((d) => ({ ...d, line: d.line - 1 }));
  const answer: CheckAnswer = diagnostics.length > 0
    ? { ok: false, diagnostics, ms }
    : text.includes(MARK) && !late
    ? { ok: true, ms }
    : { ok: false, diagnostics, ms, message: failedCheck(text, late) };
  if (kept.size >= KEEP) kept.delete(kept.keys().next().value!);
  if (answer.ok || diagnostics.length > 0) kept.set(key, answer);
  return answer;
}

/**
 * Why a check gave neither diagnostics nor a pass, in plain words: the
 * checker's report holds paths and code frames, which stay out.
 *
 * @param text The checker's report.
 * @param late Whether it was stopped at the time limit.
 * @returns A sentence.
 */
function failedCheck(text: string, late: boolean): string {
  if (late) return `The type check took longer than ${CHECK_SECONDS} s`;
  if (/out of memory|heap limit|Allocation failed/i.test(text)) {
    return `The type check used more than ${CHECK_HEAP_MB / 1024} GB`;
  }
  if (
    text.includes(NOWHERE.slice(8, -1)) ||
    /Requires import access|remote specifier|--no-remote|npm specifiers|--no-npm|jsr:/.test(text)
  ) {
    return "This code tries to load a module; code in the sandbox cannot import";
  }
  const error = /^error: (.*)$/m.exec(text)?.[1] ?? "";
  const said = error.replace(/\s+at \S+:\d+:\d+$/, "").replace(/[\s.]+$/, "").slice(0, 200);
  return said === "" ? "The type check could not run" : `The type check could not run: ${said}`;
}
