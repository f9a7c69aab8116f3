/**
 * Makes the invented data of this example (nothing here was measured):
 * `data/runs.csv`, 32 production runs of a compounding extruder.
 *
 * Truth behind the numbers: the melt pressure at the die depends on the
 * throughput, the barrel temperature and the filler fraction,
 *
 *   pressure = 62 + 0.55·throughput − 0.38·(barrel − 200) + 2.1·filler  bar,
 *
 * with normal noise of σ = 2.5 bar. Screw speed is set by the operators
 * to match the throughput (2.4 rpm per kg/h, give or take 4 rpm), so
 * it carries almost the same information and no effect of its own. Run 29
 * is a trial with twice the usual filler. Normal draws from the project's
 * seeded generator, seed {@link SEED}.
 *
 * Re-create the file byte for byte from the repository root:
 *
 *   npx -y deno@2.9.6 run --allow-write=examples/extrusion/data examples/extrusion/generate.ts
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";

/** The seed of the random stream. */
export const SEED = 5;

/** The file names and their text, written when run as a script. */
export function makeData(): Record<string, string> {
  const random = seededRandom(SEED);
  const lines = ["run,throughput,screw_speed,barrel,filler,pressure"];
  for (let run = 1; run <= 32; run++) {
    const throughput = 40 + 50 * random();
    const screw = 2.4 * throughput + 4 * random.normal();
    const barrel = 190 + 20 * random();
    const filler = run === 29 ? 24 : 6 + 6 * random();
    const pressure = 62 + 0.55 * throughput - 0.38 * (barrel - 200) + 2.1 * filler +
      2.5 * random.normal();
    lines.push(
      [
        run,
        throughput.toFixed(1),
        screw.toFixed(0),
        barrel.toFixed(1),
        filler.toFixed(1),
        pressure.toFixed(1),
      ]
        .join(","),
    );
  }
  return { "runs.csv": lines.join("\n") + "\n" };
}

if (import.meta.main) {
  const folder = new URL("./data/", import.meta.url);
  for (const [name, text] of Object.entries(makeData())) {
    await Deno.writeTextFile(new URL(name, folder), text);
  }
}
