/**
 * Removes the temporary files a crashed save left beside a document. A save
 * interrupted between writing its temporary file and the rename (or the
 * server killed then) leaves `.plumb-save-<name>-<hex>.tmp`; the server
 * clears them when it starts and before each save (saves are serialised, so
 * none of ours is in flight then).
 *
 * Only this document's names in our own pattern ({@link isOwnTemp}), only in
 * the document's folder (no recursion), only regular files (`lstat`: a
 * symbolic link or a folder of that name is left alone).
 *
 * @module
 */
import { basename, dirname, join } from "node:path";
import { isOwnTemp } from "./atomic_write.ts";

/**
 * Deletes this document's stray temporary files.
 *
 * @param docPath The document.
 * @returns The names removed.
 * @example
 * ```ts
 * import { removeStrayTemps } from "./stray_temps.ts";
 * const dir = await Deno.makeTempDir();
 * await Deno.writeTextFile(`${dir}/.plumb-save-a.md-0a1b2c3d4e5f.tmp`, "half");
 * await Deno.writeTextFile(`${dir}/notes.tmp`, "kept");
 * const gone = await removeStrayTemps(`${dir}/a.md`);
 * if (gone.join() !== ".plumb-save-a.md-0a1b2c3d4e5f.tmp") throw new Error(gone.join());
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function removeStrayTemps(docPath: string): Promise<string[]> {
  const dir = dirname(docPath);
  const name = basename(docPath);
  const removed: string[] = [];
  for await (const entry of Deno.readDir(dir)) {
    if (!isOwnTemp(name, entry.name)) continue;
    const path = join(dir, entry.name);
    try {
      if (!(await Deno.lstat(path)).isFile) continue;
      await Deno.remove(path);
      removed.push(entry.name);
    } catch (err) {
      if (!(err instanceof Deno.errors.NotFound)) throw err;
    }
  }
  return removed.sort();
}
