/**
 * The fuzz suite's CI pass (issue 11: nothing lost, nothing leaked, nothing
 * hangs): every regression fixture replayed, then a short seeded pass over
 * each target. `deno task fuzz` runs the long pass on demand.
 *
 * A fixture listed in known_open.ts must still fail (the test says so when
 * it starts to pass, so the list shrinks as fixes land); every other fixture
 * must pass. In the short pass, a failure with the signature of a known open
 * fixture is reported and tolerated; any other failure fails the test with
 * its seed, index, input and the command that reproduces it.
 */
import { loadFixtures } from "./_fixtures.ts";
import { type Failure, fuzzTarget, replay, type Replayed } from "./_fuzz.ts";
import { KNOWN_OPEN } from "./known_open.ts";

/** The CI pass's seed (`PLUMB_FUZZ_SEED` overrides it, to look further). */
const SEED = Number(Deno.env.get("PLUMB_FUZZ_SEED") ?? 11);
/**
 * Inputs per target in the CI pass, sized for about 35 s on a busy 2-core machine (measured,
 * clock time per input: document 4.5 ms, yaml 6.5, csv 1.9, expr 1.6, run 21; 24 s in all).
 */
const COUNTS: Record<string, number> = {
  document: 1500,
  yaml: 1200,
  csv: 3000,
  expr: 3000,
  run: 200,
};
/**
 * One second of processor time per input; a child silent for 2 s of processor time (10 s on
 * the clock) is killed (a slow input is tried twice).
 */
const LIMITS = { limitMs: 1000, hangMs: 2000 };

const fixtures = loadFixtures();
let replayed: Map<string, Replayed> | null = null;

/** Signatures of the known open fixtures, as replay found them. */
function knownSignatures(): Map<string, string> {
  const out = new Map<string, string>();
  for (const [name, r] of replayed ?? []) {
    if (name in KNOWN_OPEN && r.signature) out.set(r.signature, name);
  }
  return out;
}

Deno.test("fuzz fixtures: each replays clean, or still fails if listed as known open", async () => {
  const items = fixtures.map((f) => ({ name: f.name, target: f.target, input: f.input }));
  replayed = await replay(items, LIMITS);
  const problems: string[] = [];
  for (const name of Object.keys(KNOWN_OPEN)) {
    if (!fixtures.some((f) => f.name === name)) {
      problems.push(`known_open.ts lists "${name}": no such fixture`);
    }
  }
  for (const f of fixtures) {
    const r = replayed.get(f.name);
    const open = f.name in KNOWN_OPEN;
    if (r?.defect && open) console.log(`  KNOWN OPEN ${f.name}: ${KNOWN_OPEN[f.name]}`);
    else if (r?.defect) {
      problems.push(
        `${f.name} fails again: ${r.defect.kind}: ${r.defect.message} ${r.defect.where}`,
      );
    } else if (!r) problems.push(`${f.name} gave no answer`);
    else if (open) problems.push(`${f.name} passes now: remove it from known_open.ts`);
  }
  if (problems.length > 0) throw new Error(problems.join("\n"));
});

function describe(f: Failure): string {
  const input = JSON.stringify(f.shrunk);
  return `${f.kind} at seed ${f.seed} index ${f.index}: ${f.message}${
    f.where ? ` (${f.where})` : ""
  }\n` +
    `  reproduce: deno task fuzz --target ${f.target} --seed ${f.seed} --from ${f.index} --count 1\n` +
    `  input: ${
      input.length > 1500 ? input.slice(0, 1500) + `… (${input.length} characters)` : input
    }`;
}

for (const [target, count] of Object.entries(COUNTS)) {
  Deno.test(`fuzz ${target}: ${count} seeded inputs, no defect outside the known open ones`, async () => {
    const s = await fuzzTarget({ target, seed: SEED, from: 0, count, shrink: true, ...LIMITS });
    const known = knownSignatures();
    const fresh = s.failures.filter((f) => !known.has(f.signature));
    for (const f of s.failures.filter((f) => known.has(f.signature))) {
      console.log(
        `  KNOWN OPEN (${known.get(f.signature)}) at index ${f.index}: ${f.kind} ${f.where}`,
      );
    }
    const slowest = s.slowest.map((x) => `${x.index}: ${x.ms} ms (${x.wall_ms} ms clock)`).join(
      ", ",
    );
    console.log(`  ${target}: ${s.inputs} inputs in ${s.seconds} s, slowest ${slowest}`);
    if (s.inputs !== count) throw new Error(`${s.inputs} of ${count} inputs answered`);
    if (fresh.length > 0) throw new Error(fresh.map(describe).join("\n"));
  });
}
