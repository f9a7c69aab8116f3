/**
 * Makes the invented later data of the demo (nothing here was measured):
 *
 *   data/batch7-later.csv  cycles 605…800, every fifth: the weeks of cycling after batch7.csv
 *
 * Append its rows (without the header line) to data/batch7.csv to see the run
 * history report what changed: the fade speeds up after cycle 500, so the root
 * law's rate leaves its earlier interval and the comparison prefers another law.
 *
 * Truth behind the numbers: capacity = 2512.3 − 9.88·√cycle − 0.00035·(cycle − 500)²
 * mAh (the root law of batch7.csv and a loss that sets in late), plus normal
 * noise of σ = 1.7 mAh; chamber temperature 25.0 °C with σ = 0.2 °C; from the
 * project's seeded generator (seed 605).
 *
 * Re-create the file byte for byte from the repository root:
 *
 *   npx -y deno@2.9.6 run --allow-write=examples/fade/data examples/fade/generate_later.ts
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";

/** The later file's text. */
export function makeLater(): string {
  const random = seededRandom(605);
  const rows = ["cycle,capacity,temperature"];
  for (let cycle = 605; cycle <= 800; cycle += 5) {
    const capacity = 2512.3 - 9.88 * Math.sqrt(cycle) - 0.00035 * (cycle - 500) ** 2 +
      1.7 * random.normal();
    const temperature = 25.0 + 0.2 * random.normal();
    rows.push(`${cycle},${capacity.toFixed(1)},${temperature.toFixed(1)}`);
  }
  return rows.join("\n") + "\n";
}

if (import.meta.main) {
  await Deno.writeTextFile(new URL("./data/batch7-later.csv", import.meta.url), makeLater());
}
