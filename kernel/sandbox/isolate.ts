/**
 * Running user code in a disposable child process (DESIGN.md §2): `deno run`
 * with no `--allow` flags, an empty environment, a V8 heap cap, no code from
 * strings, no remote or npm modules, and a time limit; killed with SIGKILL
 * when it runs past the limit, grows past its memory (a thread in the child
 * watches the process's resident size, since array buffers and threads live
 * outside the V8 heap) or writes too much. A worker thread cannot be stopped mid-loop in
 * this Deno, a process can.
 *
 * ```
 *  runIsolated(job) ─▶ a spare child (started ahead, waiting on stdin)
 *                        │ stdin: job JSON, then EOF
 *                        ▼
 *                      _child.js: import the program (data: URL), run it,
 *                        │         check the value is data
 *                        ▼
 *   answer ◀── stdout: <nonce>{ok, value | why, message, line, column, console}
 *   watchdog: time ─▶ SIGKILL "stopped after 10 s"; memory ─▶ SIGKILL "used more than 256 MB"
 * ```
 *
 * Each child runs one job and ends, so every run starts from a clean state;
 * the next child is started as soon as one is taken, which keeps process
 * start-up (about 50 ms here) out of a run's round trip.
 *
 * @module
 */

/** What to run. */
export interface IsolateJob {
  /** A TypeScript module whose default export takes the input and returns the value. */
  program: string;
  /** The input as JSON text (typed arrays as `{"\u0000f64": base64}`, see `encodeData`). */
  input: string;
  /** `table`: the value must be `{ columns, units? }`; `value`: any data. */
  gives: "value" | "table";
  /** V8 heap cap and resident-size limit, MB. */
  memoryMb: number;
  /** Time limit, seconds. */
  seconds: number;
}

/** Why a run gave no value. */
export type IsolateStop =
  | "time"
  | "memory"
  | "denied"
  | "threw"
  | "not-data"
  | "too-large"
  | "exit"
  | "no-answer"
  | "cannot-start"
  | "stopped";

/** The answer of one run. */
export type IsolateAnswer =
  & { console: string; consoleCut: number; ms: number }
  & (
    | { ok: true; value: unknown }
    | { ok: false; why: IsolateStop; message: string; line: number | null; column: number | null }
  );

/** Console text kept per run (characters); lines past it are counted, not kept. */
export const CONSOLE_LIMIT = 64 * 1024;
/** The largest value a run may return (characters of JSON, about bytes). */
export const RESULT_LIMIT = 32 * 1024 * 1024;
/** Standard output beyond this is a flood: the child is stopped. */
const STDOUT_LIMIT = RESULT_LIMIT * 2 + CONSOLE_LIMIT * 2;
/** The resident size allowed above the heap cap (the runtime itself, about 40 MB here). */
const RSS_MARGIN_MB = 96;
/** What the child's memory watch writes on standard error past its cap (_child.js). */
const MEMORY_MARK = "plumb-sandbox: memory cap passed";

const CHILD = new URL("./_child.js", import.meta.url);

function childArgs(memoryMb: number): string[] {
  return [
    "run",
    "--no-config",
    "--no-lock",
    "--no-remote",
    "--no-npm",
    "--no-prompt",
    "--no-check",
    "--quiet",
    `--v8-flags=--max-old-space-size=${memoryMb},--disallow-code-generation-from-strings`,
    CHILD.href.startsWith("file:") ? decodeURIComponent(CHILD.pathname) : CHILD.href,
    String(memoryMb + RSS_MARGIN_MB),
  ];
}

function startChild(memoryMb: number): Deno.ChildProcess {
  const child = new Deno.Command(Deno.execPath(), {
    args: childArgs(memoryMb),
    clearEnv: true,
    env: { NO_COLOR: "1" },
    stdin: "piped",
    stdout: "piped",
    stderr: "piped",
  }).spawn();
  child.unref();
  return child;
}

/** One started child per heap cap, waiting for its job. */
const spares = new Map<number, Deno.ChildProcess>();
/** Children running a job, to stop on `stopAll`. */
const running = new Set<Deno.ChildProcess>();

function takeChild(memoryMb: number): Deno.ChildProcess {
  const spare = spares.get(memoryMb);
  spares.delete(memoryMb);
  const child = spare ?? startChild(memoryMb);
  try {
    spares.set(memoryMb, startChild(memoryMb));
  } catch { /* the next run starts its own */ }
  return child;
}

function kill(child: Deno.ChildProcess): void {
  try {
    child.kill("SIGKILL");
  } catch { /* already gone */ }
}

/**
 * Reads a stream into text, keeping at most `limit` bytes; calls `over` once
 * past it, and `seen` when a chunk holds `mark`.
 */
async function collect(
  stream: ReadableStream<Uint8Array>,
  limit: number,
  over: () => void,
  mark?: { text: string; seen: () => void },
): Promise<string> {
  const parts: Uint8Array[] = [];
  let size = 0;
  const decoder = new TextDecoder();
  for await (const chunk of stream) {
    if (mark && decoder.decode(chunk, { stream: true }).includes(mark.text)) mark.seen();
    if (size + chunk.length > limit) {
      over();
      continue;
    }
    parts.push(chunk);
    size += chunk.length;
  }
  const all = new Uint8Array(size);
  let at = 0;
  for (const p of parts) {
    all.set(p, at);
    at += p.length;
  }
  return new TextDecoder().decode(all);
}

function stopped(
  why: IsolateStop,
  message: string,
  ms: number,
  console = "",
  consoleCut = 0,
): IsolateAnswer {
  return { ok: false, why, message, line: null, column: null, console, consoleCut, ms };
}

function formatMb(mb: number): string {
  return mb >= 1024 ? `${+(mb / 1024).toFixed(1)} GB` : `${mb} MB`;
}

/**
 * Runs one job in a fresh child process and gives its answer; never throws.
 *
 * @param job The program, its input and its limits.
 * @param signal Aborting it kills the child (the run's inputs changed): answered as `stopped`.
 * @returns The value, or why there is none in plain words.
 */
export async function runIsolated(job: IsolateJob, signal?: AbortSignal): Promise<IsolateAnswer> {
  const t0 = performance.now();
  const ms = () => performance.now() - t0;
  let child: Deno.ChildProcess;
  try {
    child = takeChild(job.memoryMb);
  } catch (err) {
    const denied = err instanceof Deno.errors.NotCapable ||
      err instanceof Deno.errors.PermissionDenied;
    return stopped(
      "cannot-start",
      denied
        ? "calc cells need Plumb to be allowed to start a process (--allow-run)"
        : `could not start a process for the calc cell: ${(err as Error).message}`,
      ms(),
    );
  }
  running.add(child);
  let ended: IsolateStop | null = null;
  const end = (why: IsolateStop) => {
    ended ??= why;
    kill(child);
  };
  const onAbort = () => end("stopped");
  signal?.addEventListener("abort", onAbort);
  if (signal?.aborted) end("stopped");
  const timer = setTimeout(() => end("time"), job.seconds * 1000);
  const nonce = crypto.randomUUID();
  const stdout = collect(child.stdout, STDOUT_LIMIT, () => end("too-large"));
  const stderr = collect(child.stderr, 256 * 1024, () => {}, {
    text: MEMORY_MARK,
    seen: () => end("memory"),
  });
  try {
    const w = child.stdin.getWriter();
    const text = `{"nonce":${JSON.stringify(nonce)},"gives":${JSON.stringify(job.gives)},` +
      `"consoleLimit":${CONSOLE_LIMIT},"resultLimit":${RESULT_LIMIT},` +
      `"program":${JSON.stringify(job.program)},"input":${job.input}}`;
    await w.write(new TextEncoder().encode(text));
    await w.close();
  } catch { /* the child ended early: its status says why */ }
  const [status, out, err] = await Promise.all([child.status, stdout, stderr]);
  clearTimeout(timer);
  signal?.removeEventListener("abort", onAbort);
  running.delete(child);
  return interpret(job, nonce, status, out, err, ended, ms());
}

function interpret(
  job: IsolateJob,
  nonce: string,
  status: Deno.CommandStatus,
  out: string,
  err: string,
  ended: IsolateStop | null,
  ms: number,
): IsolateAnswer {
  const at = out.lastIndexOf(nonce);
  let reply: Record<string, unknown> | null = null;
  if (at >= 0 && ended === null) {
    try {
      reply = JSON.parse(out.slice(at + nonce.length));
    } catch { /* cut short */ }
  }
  const console = typeof reply?.console === "string"
    ? reply.console
    : out.slice(0, at < 0 ? CONSOLE_LIMIT : Math.min(at, CONSOLE_LIMIT));
  const cut = typeof reply?.consoleCut === "number" ? reply.consoleCut : 0;
  if (ended === "time") return stopped("time", `stopped after ${job.seconds} s`, ms, console);
  if (ended === "stopped") return stopped("stopped", "stopped: its inputs changed", ms, console);
  if (ended === "too-large") {
    return stopped(
      "too-large",
      `wrote more than ${formatMb(STDOUT_LIMIT / 2 ** 20)} of output`,
      ms,
    );
  }
  const memory = ended === "memory" ||
    /out of memory|heap limit|Allocation failed|invalid size error/i.test(err);
  if (memory && reply === null) {
    return stopped("memory", `used more than ${formatMb(job.memoryMb)}`, ms, console);
  }
  if (reply === null) {
    const code = status.signal ? `signal ${status.signal}` : `exit code ${status.code}`;
    const last = err.trim().split("\n").filter((l) => l.trim() !== "").slice(-1)[0] ?? "";
    const pending = /promise|event loop/i.test(err);
    return stopped(
      "no-answer",
      pending
        ? "ended without a value: its promise never settled"
        : `ended without a value (${code})${last ? `: ${last.slice(0, 200)}` : ""}`,
      ms,
      console,
    );
  }
  if (reply.ok === true) return { ok: true, value: reply.value, console, consoleCut: cut, ms };
  const why = String(reply.why) as IsolateStop;
  let message = String(reply.message);
  if (why === "too-large") {
    message = `returned more than ${formatMb(RESULT_LIMIT / 2 ** 20)} of data`;
  }
  if (why === "memory") message = `used more than ${formatMb(job.memoryMb)}: ${message}`;
  return {
    ok: false,
    why,
    message,
    line: typeof reply.line === "number" ? reply.line : null,
    column: typeof reply.column === "number" ? reply.column : null,
    console,
    consoleCut: cut,
    ms,
  };
}

/** Kills every child: spares and running ones (the process is ending). */
export function stopAllIsolated(): void {
  for (const c of spares.values()) kill(c);
  spares.clear();
  for (const c of running) kill(c);
}
