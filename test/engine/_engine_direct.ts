/**
 * Helpers of the engine-level suites: an engine process asked directly (past
 * Plumb's query check, with the permissions a test gives), and how far an
 * R factor is from the rows it factors.
 *
 * @module
 */

const CHILD = new URL("../../kernel/engine/_engine_child.ts", import.meta.url).pathname;
const CONFIG = new URL("../../deno.json", import.meta.url).pathname;

/** One answer line of an engine process. */
export interface ChildAnswer {
  id?: number;
  ok: boolean;
  why?: string;
  /** "" when the answer is ok. */
  message: string;
  value?: unknown;
  host?: string;
  port?: number;
}

/**
 * Starts kernel/engine/_engine_child.ts, writes the requests, closes its
 * input and reads every answer and its whole standard error.
 *
 * @param flags Permissions (`--allow-ffi`, `--allow-env=…`).
 * @param args The process's own arguments (`duckdb <file>`, `postgres <VAR>`, `probe <VAR>`).
 * @param env Its environment (nothing else of this process's).
 * @param requests Request lines.
 * @returns The answers in order and the standard error's text.
 */
export async function askEngineProcess(
  flags: string[],
  args: string[],
  env: Record<string, string>,
  requests: object[],
): Promise<{ answers: ChildAnswer[]; stderr: string }> {
  const child = new Deno.Command(Deno.execPath(), {
    args: ["run", "--config", CONFIG, "--quiet", "--no-prompt", ...flags, CHILD, ...args],
    clearEnv: true,
    env: { NO_COLOR: "1", ...env },
    stdin: "piped",
    stdout: "piped",
    stderr: "piped",
  }).spawn();
  const w = child.stdin.getWriter();
  await w.write(new TextEncoder().encode(requests.map((r) => JSON.stringify(r) + "\n").join("")));
  await w.close();
  const out = await child.output();
  const answers = new TextDecoder().decode(out.stdout).split("\n").filter((l) => l.trim() !== "")
    .map((l) => ({ message: "", ...JSON.parse(l) }) as ChildAnswer);
  return { answers, stderr: new TextDecoder().decode(out.stderr) };
}

/**
 * The largest entry of |RᵀR − XᵀX| relative to the largest |XᵀX| entry.
 *
 * @param r k×k row-major upper triangle.
 * @param k Columns.
 * @param cols X by columns.
 * @returns The relative difference.
 */
export function gramError(r: Float64Array, k: number, cols: Float64Array[]): number {
  let worst = 0, scale = 0;
  const diffs: number[] = [];
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      let xtx = 0;
      for (let t = 0; t < cols[i].length; t++) xtx += cols[i][t] * cols[j][t];
      let rtr = 0;
      for (let m = 0; m <= Math.min(i, j); m++) rtr += r[m * k + i] * r[m * k + j];
      scale = Math.max(scale, Math.abs(xtx));
      diffs.push(Math.abs(rtr - xtx));
    }
  }
  for (const d of diffs) worst = Math.max(worst, d / scale);
  return worst;
}
