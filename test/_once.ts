/**
 * A line printed once in a whole `deno test` run. Deno runs each test
 * module in its own isolate of one process, so module state cannot tell
 * whether another suite already said it; a marker file in the temporary
 * folder named after the process id can (a marker older than two hours is
 * taken to be an earlier process's with the same id: a whole run takes
 * less).
 *
 * @module
 */
import { join } from "node:path";

/** A marker older than this is another, earlier process's that had the same id. */
const STALE_MS = 2 * 3600_000;

function tempFolder(): string {
  const granted = Deno.permissions.querySync({ name: "env", variable: "TMPDIR" }).state ===
    "granted";
  return (granted ? Deno.env.get("TMPDIR") : undefined) ?? "/tmp";
}

/**
 * Prints `line` unless this test process printed it (under `key`) before.
 * Where no marker can be written it prints every time.
 *
 * @param key What the line is about (one marker a key).
 * @param line The line.
 */
export function printOnce(key: string, line: string): void {
  const marker = join(tempFolder(), `plumb-test-said-${key}-${Deno.pid}`);
  try {
    Deno.writeTextFileSync(marker, line, { createNew: true });
  } catch (err) {
    if (err instanceof Deno.errors.AlreadyExists) {
      const age = Date.now() - (Deno.statSync(marker).mtime?.getTime() ?? 0);
      if (age < STALE_MS) return;
      Deno.writeTextFileSync(marker, line);
    }
  }
  console.log(line);
}
