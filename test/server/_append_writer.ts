/**
 * An editor for the save-race suite, run as its own process: appends lines
 * `editor <n>` to a file every 15–25 ms (seeded) and prints `<n>` on stdout
 * once each append has returned (the write the editor considers done).
 *
 * Usage: `deno run --allow-read --allow-write _append_writer.ts <file> <count> <seed> <append|rename>`
 * `append` opens the file with O_APPEND for each line (an editor writing in
 * place); `rename` reads it, writes `<file>.editor-swap` and renames that over
 * it (an editor saving atomically).
 *
 * @module
 */
const [path, countText, seedText, mode] = Deno.args;
let seed = Number(seedText) >>> 0;
const random = () => { // mulberry32 (common practice, no source)
  seed = (seed + 0x6d2b79f5) >>> 0;
  let t = seed;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
};
const enc = new TextEncoder();
for (let n = 1; n <= Number(countText); n++) {
  const line = enc.encode(`editor ${n}\n`);
  if (mode === "rename") {
    const now = Deno.readFileSync(path);
    const next = new Uint8Array(now.length + line.length);
    next.set(now);
    next.set(line, now.length);
    Deno.writeFileSync(`${path}.editor-swap`, next);
    Deno.renameSync(`${path}.editor-swap`, path);
  } else {
    Deno.writeFileSync(path, line, { append: true });
  }
  await Deno.stdout.write(enc.encode(`${n}\n`));
  await new Promise((r) => setTimeout(r, 15 + 10 * random()));
}
