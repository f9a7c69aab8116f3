/**
 * What the command-line suites share: running `plumb` the way a user does
 * (through `deno task --config <repo>/deno.json` from another folder, or an
 * installed shim), and a scratch folder outside the repository.
 *
 * @module
 */
import { join } from "node:path";

/** The repository's folder. */
export const REPO = new URL("../../", import.meta.url).pathname.replace(/\/$/, "");

/** What a finished command printed. */
export interface Printed {
  code: number;
  stdout: string;
  stderr: string;
}

/**
 * Runs a program to its end in a folder, as a user standing there would.
 * INIT_CWD is set to that folder: `deno task` keeps an INIT_CWD it inherits
 * (this suite's own, when run by `deno task test`), and a user's shell has
 * none or the folder itself.
 *
 * @param cwd The folder the command is typed in.
 * @param program The executable.
 * @param args Its arguments.
 * @param env More environment variables (e.g. SOURCE_DATE_EPOCH).
 * @returns Exit status and output (no colour codes).
 */
export async function runIn(
  cwd: string,
  program: string,
  args: string[],
  env: Record<string, string> = {},
): Promise<Printed> {
  const out = await new Deno.Command(program, {
    args,
    cwd,
    stdin: "null",
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1", INIT_CWD: cwd, ...env },
  }).output();
  const dec = new TextDecoder();
  return { code: out.code, stdout: dec.decode(out.stdout), stderr: dec.decode(out.stderr) };
}

/**
 * `deno task --config <repo>/deno.json <task> …args` typed in `cwd`.
 *
 * @param cwd The folder the command is typed in.
 * @param task The task's name.
 * @param args Arguments after the task's name.
 * @returns Exit status and output.
 */
export function task(cwd: string, task: string, ...args: string[]): Promise<Printed> {
  return runIn(cwd, Deno.execPath(), [
    "task",
    "-q",
    "--config",
    join(REPO, "deno.json"),
    task,
    ...args,
  ]);
}

/**
 * Runs `fn` with a fresh folder outside the repository, removed afterwards.
 *
 * @param fn The test body, given the folder.
 */
export async function inScratch(fn: (dir: string) => Promise<void>): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-cli-anywhere-" });
  try {
    await fn(dir);
  } finally {
    await Deno.chmod(dir, 0o755).catch(() => {});
    await Deno.remove(dir, { recursive: true });
  }
}

/**
 * A line of output with no stack trace: what a user should see on a failure.
 *
 * @param text Standard error.
 * @returns True when it is exactly one non-empty line and no call site.
 */
export function oneClearLine(text: string): boolean {
  const lines = text.trim().split("\n");
  return lines.length === 1 && lines[0] !== "" && !/\bat .*:\d+:\d+|error: Uncaught/.test(text);
}

/** A `plumb serve` started through a task. */
export interface Serving {
  /** The URL it printed, with the token. */
  url: string;
  /** The document it says it serves. */
  document: string;
  /** Stops it (SIGTERM to the task, which passes it on) and waits for the end. */
  close(): Promise<void>;
}

/**
 * Starts `deno task --config <repo>/deno.json <task> …args` typed in `cwd`
 * and waits (at most 60 s) for the URL.
 *
 * @param cwd The folder the command is typed in.
 * @param name The task (`start` or `plumb`).
 * @param args Arguments after the task's name.
 * @returns The running server.
 * @throws {Error} When it ends or prints no URL in time.
 */
export async function serving(cwd: string, name: string, ...args: string[]): Promise<Serving> {
  const child = new Deno.Command(Deno.execPath(), {
    args: ["task", "-q", "--config", join(REPO, "deno.json"), name, ...args],
    cwd,
    stdin: "null",
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1", INIT_CWD: cwd },
  }).spawn();
  const reader = child.stdout.pipeThrough(new TextDecoderStream()).getReader();
  const errors = new Response(child.stderr).text();
  const drained = Promise.withResolvers<void>();
  const close = async () => {
    try {
      child.kill("SIGTERM");
    } catch { /* gone */ }
    await child.status;
    await drained.promise;
    await errors;
  };
  let out = "";
  const deadline = setTimeout(() => child.kill("SIGTERM"), 60_000);
  try {
    while (!/Open http:\/\/\S+\n/.test(out)) {
      const { value, done } = await reader.read();
      if (done) throw new Error(`${name} printed no URL: ${out}${await errors}`);
      out += value;
    }
  } catch (err) {
    drained.resolve();
    await close();
    throw err;
  } finally {
    clearTimeout(deadline);
  }
  (async () => {
    while (!(await reader.read()).done) { /* keep the pipe flowing */ }
    drained.resolve();
  })();
  return {
    url: /Open (http:\/\/\S+)\n/.exec(out)![1],
    document: /Plumb is serving (.+)\n/.exec(out)?.[1] ?? "",
    close,
  };
}
