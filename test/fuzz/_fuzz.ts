/**
 * Fuzzing one target and replaying fixtures, on top of the driver: answers
 * become a summary (inputs, failures with seed, index and input, the slowest
 * inputs), and a failure's input is made again in this process when the
 * child could not send it (hang, crash).
 *
 * @module
 */
import { loadCorpus } from "./_corpus.ts";
import { type Answer, runJob } from "./_driver.ts";
import { signature } from "./_oracle.ts";
import { inputRng } from "./_rng.ts";
import { targetNamed } from "./targets/mod.ts";

/** Limits of one input. */
export interface Limits {
  /** Over this (twice) an input is "slow" (ms). */
  limitMs: number;
  /** Silent this long, the child is killed and the input is a "hang" (ms). */
  hangMs: number;
}

/** One failing input. */
export interface Failure {
  target: string;
  seed: number;
  index: number;
  kind: string;
  message: string;
  where: string;
  signature: string;
  input: unknown;
  shrunk: unknown;
}

/** What one target's run found. */
export interface TargetSummary {
  target: string;
  seed: number;
  from: number;
  inputs: number;
  failures: Failure[];
  /** The slowest inputs by processor time (ms), with their time on the clock. */
  slowest: Slow[];
  seconds: number;
}

/** One of the slowest inputs. */
export interface Slow {
  index: number;
  ms: number;
  wall_ms: number;
}

const SLOWEST_KEPT = 5;

function keepSlowest(list: Slow[], a: Answer): void {
  if (list.length === SLOWEST_KEPT && a.ms <= list[SLOWEST_KEPT - 1].ms) return;
  list.push({ index: a.i, ms: a.ms, wall_ms: a.wall ?? a.ms });
  list.sort((x, y) => y.ms - x.ms);
  list.length = Math.min(list.length, SLOWEST_KEPT);
}

/**
 * Fuzzes inputs [from, from + count) of one target.
 *
 * @param o Target, seed, range, limits, whether to shrink, progress callback.
 * @returns The summary.
 */
export async function fuzzTarget(
  o: Limits & {
    target: string;
    seed: number;
    from: number;
    count: number;
    shrink: boolean;
    onProgress?: (done: number) => void;
  },
): Promise<TargetSummary> {
  const t0 = performance.now();
  const target = targetNamed(o.target);
  const s: TargetSummary = {
    target: o.target,
    seed: o.seed,
    from: o.from,
    inputs: 0,
    failures: [],
    slowest: [],
    seconds: 0,
  };
  const job = {
    mode: "generate" as const,
    target: o.target,
    seed: o.seed,
    limitMs: o.limitMs,
    shrink: o.shrink,
  };
  await runJob(job, o.from, o.from + o.count, o.hangMs, (a) => {
    s.inputs++;
    if (s.inputs % 1000 === 0) o.onProgress?.(s.inputs);
    keepSlowest(s.slowest, a);
    if (!a.defect) return;
    const input = a.input ?? target.make(inputRng(o.seed, o.target, a.i), loadCorpus());
    s.failures.push({
      target: o.target,
      seed: o.seed,
      index: a.i,
      ...a.defect,
      signature: signature(o.target, a.defect),
      input,
      shrunk: a.shrunk ?? input,
    });
  });
  s.seconds = Math.round(performance.now() - t0) / 1000;
  return s;
}

/** A replayed input's result: its defect (null: passes), time, signature. */
export interface Replayed {
  defect: Answer["defect"] | null;
  ms: number;
  signature: string | null;
}

/**
 * Replays listed inputs, each once, in one child (a hang or crash ends only that input).
 *
 * @param items Named inputs with their targets.
 * @param limits Time limits.
 * @returns Results by name.
 */
export async function replay(
  items: { name: string; target: string; input: unknown }[],
  limits: Limits,
): Promise<Map<string, Replayed>> {
  const out = new Map<string, Replayed>();
  const job = { mode: "replay" as const, items, limitMs: limits.limitMs };
  await runJob(job, 0, items.length, limits.hangMs, (a) => {
    const item = items[a.i];
    const sig = a.defect ? signature(item.target, a.defect) : null;
    out.set(item.name, { defect: a.defect ?? null, ms: a.ms, signature: sig });
  });
  return out;
}
