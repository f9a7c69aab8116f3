/**
 * `deno task fuzz`: the standing fuzz suite on demand.
 *
 * ```
 * deno task fuzz [--count 100000] [--seed 1] [--target expr,csv] [--from 0]
 *                [--limit-ms 1000] [--hang-ms 10000] [--no-shrink] [--save]
 * deno task fuzz --replay      # each fixture under test/fuzz/fixtures/: passes or its defect
 * ```
 *
 * Prints progress on standard error and a JSON summary on standard output:
 * per target the inputs checked, failures and the slowest inputs; each
 * failure with its seed, index, defect, where it broke, the command that
 * reproduces it and its (shrunk) input. `--save` writes each failure as a
 * fixture under test/fuzz/fixtures/ (one per distinct signature). Exit
 * status 1 when anything failed.
 *
 * @module
 */
import { loadFixtures, saveFixture } from "./_fixtures.ts";
import { type Failure, fuzzTarget, replay, type TargetSummary } from "./_fuzz.ts";
import { KNOWN_OPEN } from "./known_open.ts";
import { TARGETS } from "./targets/mod.ts";

interface Args {
  count: number;
  seed: number;
  from: number;
  targets: string[];
  limitMs: number;
  hangMs: number;
  shrink: boolean;
  save: boolean;
  replay: boolean;
}

function parseArgs(argv: string[]): Args {
  const a: Args = {
    count: 100_000,
    seed: 1,
    from: 0,
    targets: TARGETS.map((t) => t.name),
    limitMs: 1000,
    hangMs: 10_000,
    shrink: true,
    save: false,
    replay: false,
  };
  for (let i = 0; i < argv.length; i++) {
    const flag = argv[i], value = argv[i + 1];
    const num = () => {
      const n = Number(value);
      if (!Number.isInteger(n) || n < 0) {
        throw new Error(`Option "${flag}" needs a whole number, not "${value}"`);
      }
      i++;
      return n;
    };
    if (flag === "--count") a.count = num();
    else if (flag === "--seed") a.seed = num();
    else if (flag === "--from") a.from = num();
    else if (flag === "--limit-ms") a.limitMs = num();
    else if (flag === "--hang-ms") a.hangMs = num();
    else if (flag === "--target") a.targets = (i++, value ?? "").split(",");
    else if (flag === "--no-shrink") a.shrink = false;
    else if (flag === "--save") a.save = true;
    else if (flag === "--replay") a.replay = true;
    else {throw new Error(
        `Unknown option "${flag}": use --count, --seed, --target, --from, --limit-ms, --hang-ms, --no-shrink, --save, --replay`,
      );}
  }
  return a;
}

/** A failure for the summary: the input in full when short, else its start and length. */
function reported(f: Failure) {
  const json = JSON.stringify(f.shrunk);
  return {
    target: f.target,
    seed: f.seed,
    index: f.index,
    kind: f.kind,
    message: f.message,
    where: f.where,
    signature: f.signature,
    reproduce: `deno task fuzz --target ${f.target} --seed ${f.seed} --from ${f.index} --count 1`,
    input: json.length <= 2000 ? f.shrunk : `${json.slice(0, 2000)}… (${json.length} characters)`,
  };
}

function save(failures: Failure[]): void {
  const seen = new Set<string>();
  for (const f of failures) {
    if (seen.has(f.signature)) continue;
    seen.add(f.signature);
    const name = `${f.target}-${f.kind}-s${f.seed}-i${f.index}`;
    const path = saveFixture({
      name,
      target: f.target,
      reproduces: `${f.message}${f.where ? ` at ${f.where}` : ""}`,
      found: { seed: f.seed, index: f.index },
      input: f.shrunk,
    });
    if (path) console.error(`saved ${path}`);
  }
}

/** Replays every fixture; prints each one's defect (null: passes) and whether it is known open. */
async function replayAll(a: Args): Promise<number> {
  const fixtures = loadFixtures();
  const items = fixtures.map((f) => ({ name: f.name, target: f.target, input: f.input }));
  const results = await replay(items, a);
  const out = fixtures.map((f) => {
    const r = results.get(f.name);
    return {
      fixture: f.name,
      known_open: f.name in KNOWN_OPEN,
      ms: r?.ms,
      defect: r?.defect ?? null,
    };
  });
  console.log(JSON.stringify(out, null, 2));
  return out.every((x) => (x.defect !== null) === x.known_open) ? 0 : 1;
}

async function main(): Promise<number> {
  const a = parseArgs(Deno.args);
  if (a.replay) return await replayAll(a);
  const summaries: TargetSummary[] = [];
  for (const target of a.targets) {
    console.error(`fuzz ${target}: ${a.count} inputs from ${a.from}, seed ${a.seed}`);
    const s = await fuzzTarget({
      ...a,
      target,
      onProgress: (n) =>
        console.error(`  ${target}: ${n} inputs, ${summaries.length} targets done`),
    });
    console.error(`  ${target}: ${s.inputs} inputs, ${s.failures.length} failures, ${s.seconds} s`);
    summaries.push(s);
  }
  const failures = summaries.flatMap((s) => s.failures);
  if (a.save) save(failures);
  console.log(JSON.stringify(
    {
      seed: a.seed,
      limit_ms: a.limitMs,
      targets: summaries.map((s) => ({
        target: s.target,
        inputs: s.inputs,
        failures: s.failures.length,
        slowest: s.slowest,
        seconds: s.seconds,
      })),
      failures: failures.map(reported),
    },
    null,
    2,
  ));
  return failures.length === 0 ? 0 : 1;
}

if (import.meta.main) {
  try {
    Deno.exit(await main());
  } catch (err) {
    console.error(err instanceof Error ? err.message : String(err));
    Deno.exit(2);
  }
}
