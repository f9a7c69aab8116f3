/**
 * Starting a child process of this Deno for user code, the one way both the
 * type check (check.ts) and the run (isolate.ts) do it: an empty environment
 * (colour off), the three standard streams piped, unreferenced (it must not
 * keep Plumb alive on its own); and the sentence for a start that failed.
 *
 * @module
 */

/**
 * Starts `deno <args>` with an empty environment and piped streams.
 *
 * @param args The arguments after the Deno binary.
 * @param inheritEnv Pass Plumb's environment on (an engine process that may
 *   read one variable of it; its permissions say which): Plumb itself need
 *   not be allowed to read it.
 * @returns The child, unreferenced.
 * @throws {Deno.errors.NotCapable} Without permission to run this Deno.
 */
export function spawnDeno(args: string[], inheritEnv = false): Deno.ChildProcess {
  const child = new Deno.Command(Deno.execPath(), {
    args,
    clearEnv: !inheritEnv,
    env: { NO_COLOR: "1" },
    stdin: "piped",
    stdout: "piped",
    stderr: "piped",
  }).spawn();
  child.unref();
  return child;
}

/**
 * Why a child could not be started, in plain words.
 *
 * @param err What {@link spawnDeno} threw.
 * @param what What was being started, for other failures ("the type checker").
 * @param who Whose need it is ("calc cells", "database tables").
 * @returns The sentence.
 * @example
 * ```ts
 * import { cannotStart } from "./_spawn.ts";
 * const s = cannotStart(new Deno.errors.NotCapable("no"), "the type checker");
 * if (!s.includes("--allow-run")) throw new Error(s);
 * ```
 */
export function cannotStart(err: unknown, what: string, who = "calc cells"): string {
  const denied = err instanceof Deno.errors.NotCapable ||
    err instanceof Deno.errors.PermissionDenied;
  return denied
    ? `${who} need Plumb to be allowed to start a process (--allow-run)`
    : `could not start ${what}: ${(err as Error).message}`;
}
