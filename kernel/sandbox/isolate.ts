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
 * The child runs the user's code, so its answer is taken as untrusted text:
 * one line after the nonce, checked field by field (a table's columns, the
 * key `__proto__` refused anywhere), messages cut, and what the runtime
 * printed on standard error kept out of every message.
 *
 * Each child runs one job and ends, so every run starts from a clean state;
 * the next child is started as soon as one is taken, which keeps process
 * start-up (about 50 ms here) out of a run's round trip.
 *
 * @module
 */
import { cannotStart, spawnDeno } from "./_spawn.ts";
import { F64 } from "./data.ts";

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
  return spawnDeno(childArgs(memoryMb));
}

/** One started child per heap cap, waiting for its job. */
const spares = new Map<number, Deno.ChildProcess>();
/** Children running a job, to stop on `stopAll`. */
const running = new Set<Deno.ChildProcess>();

function takeChild(memoryMb: number): Deno.ChildProcess {
  const spare = spares.get(memoryMb);
  spares.delete(memoryMb);
  return spare ?? startChild(memoryMb);
}

/**
 * Starts a spare child for a heap cap now, unless one is waiting: a cell
 * that will run code asks while its inputs compute, so its first run finds
 * the process started (about 80-200 ms of a cold run here).
 *
 * @param memoryMb The heap cap the run will ask for.
 */
export function startAhead(memoryMb: number): void {
  if (spares.has(memoryMb)) return;
  try {
    spares.set(memoryMb, startChild(memoryMb));
  } catch { /* the run starts its own and says why it could not */ }
}

function kill(child: Deno.ChildProcess): void {
  try {
    child.kill("SIGKILL");
  } catch { /* already gone */ }
}

/**
 * Reads a stream into text, keeping at most `limit` bytes; calls `over` once
 * past it, and `seen` when the stream holds `mark` (also when a read splits it).
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
  let tail = "";
  for await (const chunk of stream) {
    if (mark) {
      const text = tail + decoder.decode(chunk, { stream: true });
      if (text.includes(mark.text)) mark.seen();
      tail = text.slice(-mark.text.length);
    }
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
  return mb >= 1024 ? `${+(mb / 1024).toFixed(1)} GB` : `${Math.round(mb)} MB`;
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
    return stopped("cannot-start", cannotStart(err, "a process for the calc cell"), ms());
  }
  running.add(child);
  // A spare is unreferenced (it must not keep Plumb alive); a running child is awaited, so it
  // keeps the event loop alive until its status comes, also after it is killed.
  child.ref();
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
  // The next run's process starts now, after this one, not beside it (two cores here).
  startAhead(job.memoryMb);
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
  const reply = at >= 0 && ended === null ? readReply(out, at + nonce.length, job.gives) : null;
  const console = reply !== null
    ? reply.console
    : out.slice(0, at < 0 ? CONSOLE_LIMIT : Math.min(at, CONSOLE_LIMIT));
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
    // What the runtime printed stays out of the message: it is the runtime's text (a
    // stack, a path), or the code's own writes to standard error.
    const how = status.signal
      ? `it was ended by ${status.signal}`
      : at >= 0
      ? "its answer could not be read"
      : `exit code ${status.code}`;
    const pending = /promise resolution is still pending|event loop/i.test(err);
    return stopped(
      "no-answer",
      pending
        ? "ended without a value: its promise never settled"
        : `ended without a value (${how})`,
      ms,
      console,
    );
  }
  if (reply.ok) return { ok: true, value: reply.value, console, consoleCut: reply.consoleCut, ms };
  let message = reply.message;
  // The child says "too-large" for a value over the limit (the parent knows the figure).
  if (reply.why === "too-large" && message === "too-large") {
    message = `returned more than ${formatMb(RESULT_LIMIT / 2 ** 20)} of data`;
  }
  if (reply.why === "memory") message = `${message}; its limit is ${formatMb(job.memoryMb)}`;
  return {
    ok: false,
    why: reply.why,
    message,
    line: reply.line,
    column: reply.column,
    console,
    consoleCut: reply.consoleCut,
    ms,
  };
}

/** What a child may give as the reason it has no value (the parent's own are not taken). */
const CHILD_STOPS: ReadonlySet<string> = new Set([
  "denied",
  "threw",
  "not-data",
  "too-large",
  "exit",
  "memory",
]);
/** The longest message taken from a child (characters). */
const MESSAGE_LIMIT = 2000;

/** A child's answer, checked field by field. */
type Reply =
  & { console: string; consoleCut: number }
  & (
    | { ok: true; value: unknown }
    | { ok: false; why: IsolateStop; message: string; line: number | null; column: number | null }
  );

/**
 * The answer line after the nonce, checked: the child runs the user's code,
 * which may have replaced what writes the answer, so nothing in it is taken
 * on trust. Null when it does not have the answer's shape.
 */
function readReply(out: string, from: number, gives: IsolateJob["gives"]): Reply | null {
  const nl = out.indexOf("\n", from);
  const line = out.slice(from, nl < 0 ? undefined : nl);
  let r: unknown;
  try {
    r = JSON.parse(line);
  } catch {
    return null;
  }
  if (r === null || typeof r !== "object" || Array.isArray(r)) return null;
  const o = r as Record<string, unknown>;
  const console = typeof o.console === "string" ? o.console.slice(0, CONSOLE_LIMIT) : "";
  const consoleCut = Number.isSafeInteger(o.consoleCut) && (o.consoleCut as number) >= 0
    ? o.consoleCut as number
    : 0;
  if (o.ok === true) {
    if (!Object.hasOwn(o, "value")) return null;
    // Only text holding the word, or an escape that could spell it, needs the walk.
    if ((line.includes("__proto__") || line.includes("\\u")) && hasProtoKey(o.value)) return null;
    if (gives === "table" && !isTableAnswer(o.value)) return null;
    return { ok: true, value: o.value, console, consoleCut };
  }
  if (o.ok !== false || typeof o.why !== "string" || !CHILD_STOPS.has(o.why)) return null;
  if (typeof o.message !== "string") return null;
  const place = (v: unknown) => Number.isSafeInteger(v) && (v as number) > 0 ? v as number : null;
  return {
    ok: false,
    why: o.why as IsolateStop,
    message: o.message.length > MESSAGE_LIMIT ? o.message.slice(0, MESSAGE_LIMIT) + "…" : o.message,
    line: place(o.line),
    column: place(o.column),
    console,
    consoleCut,
  };
}

/**
 * Whether parsed JSON holds the key `__proto__` anywhere (JSON.parse makes it
 * an own key; a receiver that assigns it sets a prototype instead).
 */
function hasProtoKey(v: unknown): boolean {
  const stack = [v];
  while (stack.length > 0) {
    const x = stack.pop();
    if (x === null || typeof x !== "object") continue;
    if (Array.isArray(x)) {
      for (const e of x) if (e !== null && typeof e === "object") stack.push(e);
      continue;
    }
    for (const k of Object.keys(x)) {
      if (k === "__proto__") return true;
      const e = (x as Record<string, unknown>)[k];
      if (e !== null && typeof e === "object") stack.push(e);
    }
  }
  return false;
}

/** Whether a value is a table answer: names, each an encoded column of one length, text units. */
function isTableAnswer(v: unknown): boolean {
  if (v === null || typeof v !== "object") return false;
  const t = v as Record<string, unknown>;
  const { columns, units, names } = t;
  if (!Array.isArray(names) || names.length === 0) return false;
  if (columns === null || typeof columns !== "object" || Array.isArray(columns)) return false;
  if (units === null || typeof units !== "object" || Array.isArray(units)) return false;
  const cols = columns as Record<string, unknown>;
  if (Object.keys(cols).length !== names.length) return false;
  let size = -1;
  for (const name of names) {
    if (typeof name !== "string" || !Object.hasOwn(cols, name)) return false;
    const c = cols[name];
    if (c === null || typeof c !== "object") return false;
    const b64 = (c as Record<string, unknown>)[F64];
    if (typeof b64 !== "string" || Object.keys(c).length !== 1) return false;
    if (size >= 0 && b64.length !== size) return false;
    size = b64.length;
    // Base64 of whole doubles: 8 bytes each, so a length that 4 · ⌈8n / 3⌉ can be.
    if (!/^[A-Za-z0-9+/]*={0,2}$/.test(b64) || b64.length % 4 !== 0) return false;
  }
  for (const k of Object.keys(units)) {
    if (!Object.hasOwn(cols, k) || typeof (units as Record<string, unknown>)[k] !== "string") {
      return false;
    }
  }
  return true;
}

/** Kills every child: spares and running ones (the process is ending). */
export function stopAllIsolated(): void {
  for (const c of spares.values()) kill(c);
  spares.clear();
  for (const c of running) kill(c);
}
