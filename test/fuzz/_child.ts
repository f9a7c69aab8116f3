/**
 * The fuzz child process: checks a range of inputs of one job and writes one
 * JSON line per input to standard output (index, milliseconds, and any
 * defect with the input, shrunk). The parent (`_driver.ts`) watches the
 * lines: silence past the hang limit means the input after the last line
 * hangs (a synchronous loop cannot be stopped inside a process, so the
 * parent kills this one and starts another after it).
 *
 * Usage: `deno run -A test/fuzz/_child.ts <job.json> <from> <to>`.
 *
 * @module
 */
import process from "node:process";
import { loadCorpus } from "./_corpus.ts";
import { Defect, signature, uncaught } from "./_oracle.ts";
import { inputRng } from "./_rng.ts";
import { shrink } from "./_shrink.ts";
import { targetNamed } from "./targets/mod.ts";
import type { Target } from "./targets/_target.ts";

/** What the parent asks for: generated inputs of one target, or listed inputs to replay. */
export type Job =
  | { mode: "generate"; target: string; seed: number; limitMs: number; shrink: boolean }
  | { mode: "replay"; items: { target: string; input: unknown }[]; limitMs: number };

const encoder = new TextEncoder();
function emit(line: unknown): void {
  Deno.stdout.writeSync(encoder.encode(JSON.stringify(line) + "\n"));
}

/** Processor time of this process so far (ms), all threads (the run target's worker too). */
function cpuNow(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

interface Timed {
  /** Processor time (ms): what the limit judges, steady on a busy machine. */
  ms: number;
  /** Time on the clock (ms). */
  wall: number;
  defect: Defect | null;
}

async function timed(target: Target, input: unknown): Promise<Timed> {
  const t0 = performance.now(), c0 = cpuNow();
  let defect: Defect | null = null;
  try {
    await target.check(input);
  } catch (err) {
    defect = uncaught(err, "check");
  }
  return { ms: cpuNow() - c0, wall: performance.now() - t0, defect };
}

/** Checks one input: a defect, or a slow answer confirmed by a second try. */
async function checkOne(target: Target, input: unknown, limitMs: number) {
  const first = await timed(target, input);
  if (first.defect !== null || first.ms <= limitMs) return first;
  const again = await timed(target, input);
  if (again.defect !== null || again.ms <= limitMs) return again;
  const ms = Math.min(first.ms, again.ms);
  const message = `took ${Math.round(first.ms)} ms, then ${
    Math.round(again.ms)
  } ms of processor time (limit ${limitMs} ms)`;
  return { ms, wall: Math.min(first.wall, again.wall), defect: new Defect("slow", message) };
}

function inputOf(job: Job, i: number): { target: Target; input: unknown } {
  if (job.mode === "replay") {
    return { target: targetNamed(job.items[i].target), input: job.items[i].input };
  }
  const target = targetNamed(job.target);
  return { target, input: target.make(inputRng(job.seed, target.name, i), loadCorpus()) };
}

async function main(): Promise<void> {
  const [jobPath, fromText, toText] = Deno.args;
  const job: Job = JSON.parse(Deno.readTextFileSync(jobPath));
  loadCorpus();
  const shrunk = new Set<string>();
  emit({ ready: true });
  for (let i = Number(fromText); i < Number(toText); i++) {
    const { target, input } = inputOf(job, i);
    const { ms: cpu, wall, defect } = await checkOne(target, input, job.limitMs);
    const ms = Math.round(cpu * 10) / 10;
    if (defect === null) {
      emit({ i, ms, wall: Math.round(wall * 10) / 10 });
      continue;
    }
    const d = { kind: defect.kind, message: defect.message, where: defect.where };
    // Shrink the first failure of each kind only: a run of 100,000 may repeat one defect hundreds of times.
    const sig = signature(target.name, defect);
    const fresh = !shrunk.has(sig);
    shrunk.add(sig);
    const small = job.mode === "generate" && job.shrink && defect.kind !== "slow" && fresh
      ? await shrink(
        target,
        input,
        defect,
        async (x) => (await checkOne(target, x, job.limitMs)).defect,
      )
      : input;
    emit({ i, ms, wall: Math.round(wall * 10) / 10, defect: d, input, shrunk: small });
  }
  for (const t of ["document", "yaml", "csv", "expr", "run"]) targetNamed(t).close?.();
}

globalThis.addEventListener("unhandledrejection", (e) => {
  e.preventDefault();
  const r = (e as PromiseRejectionEvent).reason;
  // FUZZ_STACK=1 prints where it was thrown (run the child alone with the driver's flags).
  if (Deno.env.get("FUZZ_STACK")) console.error(r?.stack ?? r);
  emit({ fatal: String(r).slice(0, 500) });
  Deno.exit(3);
});

if (import.meta.main) await main();
