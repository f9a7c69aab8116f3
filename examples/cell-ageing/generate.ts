/**
 * Makes the invented data of this example (nothing here was measured):
 *
 *   data/first-300.csv   cycles 10…300, what the first month of testing gave
 *   data/through-900.csv cycles 10…900, the same first 30 rows and the rest
 *
 * Truth behind the numbers: capacity = 3120 − 9.0·√cycle − 0.060·cycle mAh
 * (a surface-layer term and a slow linear loss), plus normal noise of
 * σ = 2.2 mAh, from the project's seeded generator (seed 78). The
 * linear term is too small to show in 300 cycles and plain by 900.
 *
 * Re-create the files byte for byte from the repository root:
 *
 *   npx -y deno@2.9.6 run --allow-write=examples/cell-ageing/data examples/cell-ageing/generate.ts
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";

/** The file names and their text, written by {@link main}. */
export function makeData(): Record<string, string> {
  const random = seededRandom(78);
  const header = "cycle,capacity,chamber\n";
  const rows: string[] = [];
  for (let cycle = 10; cycle <= 900; cycle += 10) {
    const capacity = 3120 - 9.0 * Math.sqrt(cycle) - 0.060 * cycle + 2.2 * random.normal();
    const chamber = 25 + 0.3 * random.normal();
    rows.push(`${cycle},${capacity.toFixed(1)},${chamber.toFixed(1)}`);
  }
  return {
    "first-300.csv": header + rows.slice(0, 30).join("\n") + "\n",
    "through-900.csv": header + rows.join("\n") + "\n",
  };
}

if (import.meta.main) {
  const folder = new URL("./data/", import.meta.url);
  for (const [name, text] of Object.entries(makeData())) {
    await Deno.writeTextFile(new URL(name, folder), text);
  }
}
