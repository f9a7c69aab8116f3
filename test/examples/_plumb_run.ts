/**
 * `plumb run --json` of a document in a subprocess, as the example and docs
 * suites run it: read permission, the two log variables, and running this
 * Deno (calc cells are checked and run in child processes of it, as
 * `deno task plumb` allows).
 */

const MAIN = new URL("../../cells/main.ts", import.meta.url).pathname;

/**
 * Runs `plumb run <doc> --json` with further flags.
 *
 * @param doc The document's path.
 * @param flags Further flags (`--no-history`).
 * @returns The exit code, the parsed RUN-JSON and standard error.
 */
export async function plumbRunJson(
  doc: string,
  ...flags: string[]
): Promise<{ code: number; json: unknown; stderr: string }> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-env=LOG_TOKENS,LOG_STREAM",
      `--allow-run=${Deno.execPath()}`,
      MAIN,
      "run",
      doc,
      "--json",
      ...flags,
    ],
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const dec = new TextDecoder();
  return {
    code: out.code,
    json: JSON.parse(dec.decode(out.stdout)),
    stderr: dec.decode(out.stderr),
  };
}
