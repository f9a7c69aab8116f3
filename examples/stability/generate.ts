/**
 * Makes the invented data of this example (nothing here was measured):
 * `data/pulls.csv`, a stability study of one lot of a liquid enzyme reagent
 * stored at 5, 25 and 40 °C, two vials pulled at each of eight times per
 * temperature and read by the same kinetic assay.
 *
 * Truth behind the numbers: the assay reads
 *
 *   activity = blank + a0·exp(−k·day)   mAU/min,
 *
 * with the same initial activity a0 = 96 mAU/min (one lot) and the same
 * blank = 4 mAU/min (the substrate's own slow breakdown, one assay) at every
 * temperature, and a first-order loss whose rate grows with the storage
 * temperature: k = 0.0006 per day at 5 °C, 0.006 at 25 °C, 0.04 at 40 °C.
 * Each reading carries normal noise of σ = 1.2 mAU/min. The warmer the
 * storage, the sooner the pulls (the 40 °C arm ends at 56 days, the 25 °C
 * arm at 182, the 5 °C arm at 730). Normal draws from the project's seeded
 * generator, seed {@link SEED}.
 *
 * Re-create the file byte for byte from the repository root:
 *
 *   npx -y deno@2.9.6 run --allow-write=examples/stability/data examples/stability/generate.ts
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";

/** The seed of the random stream. */
export const SEED = 16;

/** The generating values (the test of the example's story reads them). */
export const TRUTH = {
  a0: 96,
  blank: 4,
  sigma: 1.2,
  /** First-order rate per day, by storage temperature (°C). */
  k: { 5: 0.0006, 25: 0.006, 40: 0.04 } as Record<number, number>,
};

/** The pull days of each storage temperature (°C). */
const PULLS: Record<number, number[]> = {
  5: [0, 91, 182, 273, 365, 456, 547, 730],
  25: [0, 7, 14, 28, 56, 91, 126, 182],
  40: [0, 2, 4, 7, 14, 21, 35, 56],
};

/** The file names and their text, written when run as a script. */
export function makeData(): Record<string, string> {
  const random = seededRandom(SEED);
  const lines = ["storage,day,vial,activity"];
  for (const storage of [5, 25, 40]) {
    for (const day of PULLS[storage]) {
      for (let vial = 1; vial <= 2; vial++) {
        const mean = TRUTH.blank + TRUTH.a0 * Math.exp(-TRUTH.k[storage] * day);
        const activity = mean + TRUTH.sigma * random.normal();
        lines.push(`${storage},${day},${vial},${activity.toFixed(1)}`);
      }
    }
  }
  return { "pulls.csv": lines.join("\n") + "\n" };
}

if (import.meta.main) {
  const folder = new URL("./data/", import.meta.url);
  for (const [name, text] of Object.entries(makeData())) {
    await Deno.writeTextFile(new URL(name, folder), text);
  }
}
