/**
 * SVG snapshot comparison for chart tests: decimals rounded, ids
 * renumbered, then compared with the stored file. A mismatch writes
 * `<name>-changed.svg` beside the snapshot (git-ignored) and fails; a
 * missing snapshot is written and passes, except under CI (`CI=true`),
 * where it fails.
 *
 * @module
 */

/**
 * Normalises SVG markup: numbers with decimals rounded to 2 places, ids
 * (and their `#id` / `url(#id)` uses) renumbered in order of appearance.
 *
 * @param svg SVG markup.
 * @returns Comparable markup.
 * @example
 * ```ts
 * import { normalizeSvg } from "./_snapshot.ts";
 * const s = normalizeSvg('<svg><clipPath id="plot-clip-7"/><g clip-path="url(#plot-clip-7)" x="1.23456"/></svg>');
 * if (s !== '<svg><clipPath id="id-1"/><g clip-path="url(#id-1)" x="1.23"/></svg>') throw new Error(s);
 * ```
 */
export function normalizeSvg(svg: string): string {
  const ids = new Map<string, string>();
  for (const m of svg.matchAll(/\bid="([^"]+)"/g)) {
    if (!ids.has(m[1])) ids.set(m[1], `id-${ids.size + 1}`);
  }
  let out = svg.replace(/-?\d+\.\d+(e-?\d+)?/g, (n) => {
    const v = Math.round(Number(n) * 100) / 100;
    return String(Object.is(v, -0) ? 0 : v);
  });
  for (const [from, to] of ids) {
    const q = from.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
    out = out.replace(new RegExp(`(id="|#)${q}(?=["')])`, "g"), `$1${to}`);
  }
  return out;
}

/**
 * Compares normalised SVG with the snapshot file.
 *
 * @param svg SVG markup.
 * @param file The snapshot's URL (`….svg`).
 * @throws {Error} On a mismatch (after writing `…-changed.svg`), or when the
 *   snapshot is missing under CI.
 */
export async function assertSvgSnapshot(svg: string, file: URL): Promise<void> {
  const actual = normalizeSvg(svg) + "\n";
  let expected: string | null = null;
  try {
    expected = await Deno.readTextFile(file);
  } catch (e) {
    if (!(e instanceof Deno.errors.NotFound)) throw e;
  }
  const changed = new URL(file.href.replace(/\.svg$/, "-changed.svg"));
  if (expected === null) {
    if (Deno.env.get("CI") === "true") throw new Error(`Snapshot "${file.pathname}" is missing`);
    await Deno.writeTextFile(file, actual);
    return;
  }
  if (expected === actual) {
    await Deno.remove(changed).catch(() => {});
    return;
  }
  await Deno.writeTextFile(changed, actual);
  throw new Error(`Snapshot "${file.pathname}" differs: see "${changed.pathname}"`);
}
