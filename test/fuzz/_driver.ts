/**
 * The fuzz driver: runs a job's inputs in child processes (`_child.ts`),
 * reads their JSON lines, and keeps going past what stops a child. Silence
 * past the hang limit: the input after the last answer is a "hang", the
 * child is killed (SIGKILL) and a new one starts after it. A child that
 * dies: that input is a "crash", the same way.
 *
 * ```
 *  parent ──job.json, from, to──▶ child ──{i, ms, defect?}──▶ parent
 *    │ no line for hangMs (processor time, _watchdog.ts): kill, report i+1
 *    │   as hang, restart at i+2
 *    │ exit ≠ 0 before `to`: report i+1 as crash, restart at i+2
 * ```
 *
 * @module
 */
import type { Job } from "./_child.ts";
import { Watchdog } from "./_watchdog.ts";

const ROOT = new URL("../../", import.meta.url);
const CHILD = new URL("./_child.ts", import.meta.url);
/** A child may take this long to load before its first line (a busy machine, a cold cache). */
const START_GRACE_MS = 60_000;

/** One input's answer, as the child wrote it (or as the driver made it for a hang or crash). */
export interface Answer {
  i: number;
  /** Processor time (ms). */
  ms: number;
  /** Time on the clock (ms). */
  wall?: number;
  defect?: { kind: string; message: string; where: string };
  input?: unknown;
  shrunk?: unknown;
}

/** Runs inputs [from, to) of the job; `onAnswer` gets every answer, in order. */
export async function runJob(
  job: Job,
  from: number,
  to: number,
  hangMs: number,
  onAnswer: (a: Answer) => void,
): Promise<void> {
  const jobPath = await Deno.makeTempFile({ prefix: "plumb-fuzz-job-", suffix: ".json" });
  try {
    await Deno.writeTextFile(jobPath, JSON.stringify(job));
    let next = from;
    while (next < to) {
      const stop = await runChild(jobPath, next, to, hangMs, onAnswer);
      if (stop.last + 1 >= to) break;
      const ms = stop.why === "hang" ? hangMs : 0;
      const message = stop.why === "hang" ? stop.detail : `the child process died: ${stop.detail}`;
      onAnswer({ i: stop.last + 1, ms, wall: ms, defect: { kind: stop.why, message, where: "" } });
      next = stop.last + 2;
    }
  } finally {
    await Deno.remove(jobPath).catch(() => {});
  }
}

interface Stop {
  last: number;
  why: "hang" | "crash";
  detail: string;
}

async function runChild(
  jobPath: string,
  from: number,
  to: number,
  hangMs: number,
  onAnswer: (a: Answer) => void,
): Promise<Stop> {
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-write",
      "--allow-env",
      CHILD.pathname,
      jobPath,
      `${from}`,
      `${to}`,
    ],
    cwd: ROOT.pathname,
    stdout: "piped",
    stderr: "piped",
    stdin: "null",
  }).spawn();
  const stop: Stop = { last: from - 1, why: "crash", detail: "" };
  let killed = false;
  const dog = new Watchdog(child.pid, hangMs, START_GRACE_MS, (why) => {
    killed = true;
    stop.why = "hang";
    stop.detail = why;
    try {
      child.kill("SIGKILL");
    } catch { /* gone */ }
  });
  const stderr = new Response(child.stderr).text();
  for await (const line of lines(child.stdout)) {
    dog.heard();
    const m = JSON.parse(line);
    if (m.ready) continue;
    if (m.fatal) stop.detail = m.fatal;
    else {
      stop.last = m.i;
      onAnswer(m as Answer);
    }
  }
  dog.stop();
  const status = await child.status;
  const err = (await stderr).trim().split("\n").slice(-6).join("\n");
  if (!killed) {
    stop.detail ||= `exit ${status.code}${status.signal ? ` (${status.signal})` : ""}: ${err}`;
  }
  if (!killed && status.success && stop.last + 1 < to) stop.detail = `stopped early: ${err}`;
  return stop;
}

/** Lines of a byte stream. */
async function* lines(stream: ReadableStream<Uint8Array>): AsyncGenerator<string> {
  const decoder = new TextDecoder();
  let rest = "";
  for await (const chunk of stream) {
    rest += decoder.decode(chunk, { stream: true });
    let nl;
    while ((nl = rest.indexOf("\n")) >= 0) {
      yield rest.slice(0, nl);
      rest = rest.slice(nl + 1);
    }
  }
  if (rest.trim() !== "") yield rest;
}
