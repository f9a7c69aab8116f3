/**
 * Makes the invented data of this example (nothing here was measured):
 * `data/duplicates.csv`, 48 plasma samples each measured twice by a
 * laboratory analyser and by a point-of-care meter, the two readings of a
 * row taken on the same aliquot.
 *
 * Truth behind the numbers: each sample has a true glucose level between
 * 3 and 22 mmol/L (log-uniform). The analyser reads the level with a
 * coefficient of variation of 2 %; the meter reads 0.15 + 1.04·level with a
 * coefficient of variation of 4 %, so it reads about 4 % high with a small
 * constant offset, and its error variance is about four times the
 * analyser's. Normal draws from the project's seeded generator, seed
 * {@link SEED}.
 *
 * Re-create the file byte for byte from the repository root:
 *
 *   npx -y deno@2.9.6 run --allow-write=examples/glucose/data examples/glucose/generate.ts
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";

/** The seed of the random stream. */
export const SEED = 20;

/** The file names and their text, written when run as a script. */
export function makeData(): Record<string, string> {
  const random = seededRandom(SEED);
  const lines = ["sample,run,analyser,meter"];
  for (let s = 1; s <= 48; s++) {
    const level = 3 * Math.exp(Math.log(22 / 3) * random());
    for (let run = 1; run <= 2; run++) {
      const analyser = level * (1 + 0.02 * random.normal());
      const meter = (0.15 + 1.04 * level) * (1 + 0.04 * random.normal());
      lines.push(
        `P${String(s).padStart(2, "0")},${run},${analyser.toFixed(2)},${meter.toFixed(1)}`,
      );
    }
  }
  return { "duplicates.csv": lines.join("\n") + "\n" };
}

if (import.meta.main) {
  const folder = new URL("./data/", import.meta.url);
  for (const [name, text] of Object.entries(makeData())) {
    await Deno.writeTextFile(new URL(name, folder), text);
  }
}
