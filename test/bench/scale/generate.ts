/**
 * The benchmark data of issue 16: a seeded CSV of `rows` rows, ten
 * standard-normal predictors x1…x10 with column k scaled by 10^(k/3), and
 * a response y, a linear combination of them plus standard-normal noise:
 *
 *   y = 2 + Σₖ bₖ·xₖ + ε,   bₖ = (−1)^(k+1) · (11 − k)/10 · 10^(−k/3),
 *
 * so that term k varies with standard deviation (11 − k)/10, the first
 * five terms weigh most and a five-predictor fit is a fair rival. Values
 * are printed as C's `%.10g` (format_g.ts), as a logger in C or Python
 * writes them; y is computed from the unrounded predictors. About 138
 * bytes a row.
 *
 * Written streaming through one reused buffer (touching new memory costs
 * about 2.5 ms per MB on the benchmark machine), into a cache folder
 * outside the repository, and kept there: a later run with the same rows
 * and seed reads the file already made. The file appears under its name
 * only when complete (written under a temporary name, then renamed).
 *
 * Invented data (kernel/random.ts: Mulberry32 and Box–Muller).
 *
 * @module
 */
import { seededRandom } from "../../../kernel/random.ts";
import { formatG } from "./format_g.ts";

/** The seed of the benchmark data. */
export const SCALE_SEED = 20261216;

/** Predictors in the data. */
export const PREDICTORS = 10;

/** The intercept of the response (invented). */
export const INTERCEPT = 2;

/** The coefficients b₁…b₁₀ of the response (invented): term k varies with sd (11 − k)/10. */
export const COEFFICIENTS: readonly number[] = Array.from(
  { length: PREDICTORS },
  (_, i) => (i % 2 === 0 ? 1 : -1) * ((10 - i) / 10) * 10 ** (-(i + 1) / 3),
);

/** Column k's scale, 10^(k/3). */
export const SCALES: readonly number[] = Array.from(
  { length: PREDICTORS },
  (_, i) => 10 ** ((i + 1) / 3),
);

const BUFFER_BYTES = 1 << 20;
const MAX_ROW_BYTES = 16 * 24; // 11 fields of at most 17 characters and a separator

/** Writes all of `bytes` (a write may take fewer). */
async function writeAll(file: Deno.FsFile, bytes: Uint8Array): Promise<void> {
  for (let done = 0; done < bytes.length;) done += await file.write(bytes.subarray(done));
}

/**
 * Writes the benchmark CSV to `path`.
 *
 * @param path Where to write (created or truncated).
 * @param rows Data rows.
 * @param seed The seed; equal seeds give equal bytes.
 * @returns The bytes written.
 */
export async function writeScaleCsv(path: string, rows: number, seed = SCALE_SEED) {
  const random = seededRandom(seed);
  const buf = new Uint8Array(BUFFER_BYTES);
  let len = 0, total = 0;
  const put = (s: string) => {
    for (let i = 0; i < s.length; i++) buf[len++] = s.charCodeAt(i);
  };
  const file = await Deno.open(path, { write: true, create: true, truncate: true });
  try {
    put(Array.from({ length: PREDICTORS }, (_, i) => `x${i + 1},`).join("") + "y\n");
    for (let r = 0; r < rows; r++) {
      let y = INTERCEPT;
      for (let k = 0; k < PREDICTORS; k++) {
        const x = random.normal() * SCALES[k];
        y += COEFFICIENTS[k] * x;
        put(formatG(x, 10));
        buf[len++] = 0x2c;
      }
      put(formatG(y + random.normal(), 10));
      buf[len++] = 0x0a;
      if (len > BUFFER_BYTES - MAX_ROW_BYTES) {
        await writeAll(file, buf.subarray(0, len));
        total += len, len = 0;
      }
    }
    await writeAll(file, buf.subarray(0, len));
    return total + len;
  } finally {
    file.close();
  }
}

/** The folder the benchmark data is kept in: the user's cache folder, else a temporary one. */
async function cacheFolder(): Promise<string> {
  const base = Deno.env.get("XDG_CACHE_HOME") ??
    (Deno.env.get("HOME") ? `${Deno.env.get("HOME")}/.cache` : undefined);
  if (base === undefined) return await Deno.makeTempDir({ prefix: "plumb-bench-" });
  const dir = `${base}/plumb-bench`;
  await Deno.mkdir(dir, { recursive: true });
  return dir;
}

/**
 * The benchmark CSV of `rows` rows, made once and kept in the cache folder.
 *
 * @param rows Data rows.
 * @param seed The seed.
 * @returns The file's folder, path and size in bytes, and whether it was made now.
 */
export async function scaleCsv(rows: number, seed = SCALE_SEED) {
  const dir = await cacheFolder();
  const name = `scale-${rows}-${seed}.csv`;
  const path = `${dir}/${name}`;
  try {
    return { dir, name, path, bytes: (await Deno.stat(path)).size, made: false };
  } catch (e) {
    if (!(e instanceof Deno.errors.NotFound)) throw e;
  }
  const partial = `${path}.partial-${Deno.pid}`;
  try {
    const bytes = await writeScaleCsv(partial, rows, seed);
    await Deno.rename(partial, path);
    return { dir, name, path, bytes, made: true };
  } catch (e) {
    await Deno.remove(partial).catch(() => {});
    throw e;
  }
}

if (import.meta.main) {
  const rows = Number(Deno.args[0] ?? 1_000_000);
  const t0 = performance.now();
  const csv = await scaleCsv(rows);
  const s = ((performance.now() - t0) / 1000).toFixed(1);
  console.log(
    `${csv.path}: ${(csv.bytes / 1e6).toFixed(1)} MB, ${csv.made ? `made in ${s} s` : "kept"}`,
  );
}
