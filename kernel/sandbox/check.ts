/**
 * Type-checking a user program before it runs: Deno's own checker in a child
 * process (`deno run --check` over standard input, no permissions, an empty
 * environment), so its diagnostics are exactly the runtime's TypeScript's.
 * `deno run` evaluates the module after a clean check: a guard line put
 * before it throws first, so no user text runs there even if it escaped the
 * function it was put in (the process also has no permissions and a time limit).
 *
 * A check costs about a second of the compiler's start-up; results are kept
 * by the program's SHA-256, so code whose inputs changed value but not shape
 * is not checked again.
 *
 * @module
 */

/** One error of the checker, at a 1-based line and column of the program. */
export interface Diagnostic {
  /** TypeScript's error number, e.g. 2551. */
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
/** The line put before the module (`if`: a bare throw would make the rest unreachable code). */
const GUARD = `if (1) throw ${JSON.stringify(MARK)};`;

async function digest(text: string): Promise<string> {
  const d = await crypto.subtle.digest("SHA-256", new TextEncoder().encode(text));
  return [...new Uint8Array(d)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

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
    const head = /^TS(\d+) \[ERROR\]: (.*)$/.exec(line);
    if (head) {
      open = { code: Number(head[1]), message: head[2].trim() };
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
  const key = await digest(program);
  const known = kept.get(key);
  if (known) return { ...known, ms: 0 };
  const t0 = performance.now();
  let child: Deno.ChildProcess;
  try {
    child = new Deno.Command(Deno.execPath(), {
      args: [
        "run",
        "--check",
        "--no-config",
        "--no-lock",
        "--no-remote",
        "--no-npm",
        "--no-prompt",
        "--v8-flags=--disallow-code-generation-from-strings",
        "-",
      ],
      clearEnv: true,
      env: { NO_COLOR: "1" },
      stdin: "piped",
      stdout: "piped",
      stderr: "piped",
    }).spawn();
  } catch (err) {
    const denied = err instanceof Deno.errors.NotCapable ||
      err instanceof Deno.errors.PermissionDenied;
    return {
      ok: false,
      diagnostics: [],
      ms: performance.now() - t0,
      message: denied
        ? "calc cells need Plumb to be allowed to start a process (--allow-run)"
        : `could not start the type checker: ${(err as Error).message}`,
    };
  }
  child.unref();
  const timer = setTimeout(() => {
    try {
      child.kill("SIGKILL");
    } catch { /* gone */ }
  }, CHECK_SECONDS * 1000);
  try {
    const w = child.stdin.getWriter();
    // The guard line: the module is evaluated after a clean check, and ends at once, before
    // any user text that escaped its function could run (imports aside, which the calc refuses).
    await w.write(new TextEncoder().encode(`${GUARD}\n${program}`));
    await w.close();
  } catch { /* ended early */ }
  const done = await child.output().catch(() => null);
  clearTimeout(timer);
  const ms = performance.now() - t0;
  if (done === null) return { ok: false, diagnostics: [], ms, message: "the type checker stopped" };
  const text = new TextDecoder().decode(done.stdout) + "\n" + new TextDecoder().decode(done.stderr);
  // Lines as the caller numbered them: the guard took line 1.
  const diagnostics = parseDiagnostics(text).map((d) => ({ ...d, line: d.line - 1 }));
  const answer: CheckAnswer = diagnostics.length > 0
    ? { ok: false, diagnostics, ms }
    : text.includes(MARK)
    ? { ok: true, ms }
    : { ok: false, diagnostics, ms, message: text.trim().split("\n").slice(-1)[0].slice(0, 300) };
  if (kept.size >= KEEP) kept.delete(kept.keys().next().value!);
  if (answer.ok || diagnostics.length > 0) kept.set(key, answer);
  return answer;
}
