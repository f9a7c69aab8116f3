/**
 * Makes the invented data of this example (nothing here was measured):
 * `data/standards.csv`, seven nitrite standards read three times each.
 *
 * Truth behind the numbers: absorbance = 0.0040 + 0.520·conc − 0.045·conc²
 * (a slight bend at the top, as stray light gives), and a reading's standard
 * deviation is 0.0002 + 2 % of the true absorbance, so the scatter grows with
 * concentration. Normal noise from the project's seeded generator, seed
 * {@link SEED}; the rows are written in the order the standards were read
 * (three rounds, each round from low to high).
 *
 * Re-create the file byte for byte from the repository root:
 *
 *   npx -y deno@2.9.6 run --allow-write=examples/calibration/data examples/calibration/generate.ts
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";

/** The seed of the random stream. */
export const SEED = 1;

/** The standards' nominal concentrations, mg/L as nitrite-nitrogen. */
const LEVELS = [0.02, 0.05, 0.1, 0.2, 0.4, 0.7, 1.0];

/** The file names and their text, written when run as a script. */
export function makeData(): Record<string, string> {
  const random = seededRandom(SEED);
  const lines = ["round,conc,absorbance"];
  for (let round = 1; round <= 3; round++) {
    for (const conc of LEVELS) {
      const mean = 0.0040 + 0.520 * conc - 0.045 * conc * conc;
      const sd = 0.0002 + 0.02 * mean;
      lines.push(`${round},${conc},${(mean + sd * random.normal()).toFixed(4)}`);
    }
  }
  return { "standards.csv": lines.join("\n") + "\n" };
}

if (import.meta.main) {
  const folder = new URL("./data/", import.meta.url);
  for (const [name, text] of Object.entries(makeData())) {
    await Deno.writeTextFile(new URL(name, folder), text);
  }
}
