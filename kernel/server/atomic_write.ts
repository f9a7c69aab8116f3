/**
 * Writing a file so that a reader (or a crash) sees the old content or the
 * new, never a mix:
 *
 * ```
 *  folder/.plumb-save-<name>-<12 hex>.tmp ◀─ write all bytes, fsync
 *         │ rename (atomic within one file system)
 *         ▼
 *  folder/name ; fsync the folder so the rename itself is durable
 * ```
 *
 * The temporary file sits in the target's own folder (a rename across file
 * systems is not atomic) and is removed when any step fails; a crash can
 * leave one behind, which {@link isOwnTemp} recognises for the clean-up
 * (kernel/server/stray_temps.ts). Watchers skip names starting with
 * {@link TEMP_PREFIX}. The save path's compare-and-replace is in
 * kernel/server/replace_if_unchanged.ts.
 *
 * @module
 */
import { basename, dirname, join } from "node:path";

/** Prefix of the temporary files this module writes. */
export const TEMP_PREFIX = ".plumb-save-";

/**
 * A new temporary name beside `path`: `.plumb-save-<name>-<12 hex digits>.tmp`.
 *
 * @param path The file the temporary one stands in for.
 * @returns The temporary file's path (in the same folder).
 * @example
 * ```ts
 * import { tempPathFor } from "./atomic_write.ts";
 * if (!/\/d\/\.plumb-save-a\.md-[0-9a-f]{12}\.tmp$/.test(tempPathFor("/d/a.md"))) throw new Error();
 * ```
 */
export function tempPathFor(path: string): string {
  const hex = Array.from(crypto.getRandomValues(new Uint8Array(6)), (b) => b.toString(16))
    .map((h) => h.padStart(2, "0")).join("");
  return join(dirname(path), `${TEMP_PREFIX}${basename(path)}-${hex}.tmp`);
}

/**
 * Whether a folder entry's name is one of our temporary files for `docName`
 * (6 to 12 hex digits: earlier versions wrote unpadded digits).
 *
 * @param docName The document's file name (no folder).
 * @param entry The entry's name.
 * @returns True for `.plumb-save-<docName>-<hex>.tmp` only.
 * @example
 * ```ts
 * import { isOwnTemp } from "./atomic_write.ts";
 * if (!isOwnTemp("a.md", ".plumb-save-a.md-0a1b2c.tmp")) throw new Error("missed");
 * if (isOwnTemp("a.md", ".plumb-save-b.md-0a1b2c.tmp") || isOwnTemp("a.md", "a.md")) throw new Error();
 * ```
 */
export function isOwnTemp(docName: string, entry: string): boolean {
  const head = `${TEMP_PREFIX}${docName}-`;
  return entry.startsWith(head) && /^[0-9a-f]{6,12}\.tmp$/.test(entry.slice(head.length));
}

/**
 * Writes bytes to a new temporary file beside `path` and flushes it to disk.
 *
 * @param path The file the temporary one will replace.
 * @param bytes The content.
 * @param mode Permission bits to give it (the target's, when it exists).
 * @returns The temporary file's path.
 * @throws {Deno.errors.PermissionDenied} Or any other file-system error; no temporary file is left.
 */
export async function writeTemp(path: string, bytes: Uint8Array, mode?: number): Promise<string> {
  const temp = tempPathFor(path);
  try {
    const file = await Deno.open(temp, { write: true, createNew: true, mode: mode ?? 0o644 });
    try {
      for (let done = 0; done < bytes.length;) done += await file.write(bytes.subarray(done));
      await file.sync();
    } finally {
      file.close();
    }
    if (mode !== undefined && Deno.build.os !== "windows") await Deno.chmod(temp, mode & 0o7777);
    return temp;
  } catch (err) {
    await Deno.remove(temp).catch(() => {});
    throw err;
  }
}

/**
 * The permission bits of a file, or undefined when it does not exist.
 *
 * @param path The file.
 * @returns Its mode.
 */
export async function modeOf(path: string): Promise<number | undefined> {
  try {
    return (await Deno.stat(path)).mode ?? undefined;
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return undefined;
    throw err;
  }
}

/**
 * Replaces a file's content atomically (temporary file, fsync, rename, fsync of the folder).
 * The file keeps its permission bits when it existed.
 *
 * @param path The file to write.
 * @param data The new content (text is written as UTF-8).
 * @throws {Deno.errors.PermissionDenied} Or any other file-system error; the target is then unchanged.
 * @example
 * ```ts
 * import { writeFileAtomic } from "./atomic_write.ts";
 * const dir = await Deno.makeTempDir();
 * await writeFileAtomic(`${dir}/a.md`, "# New\n");
 * if (await Deno.readTextFile(`${dir}/a.md`) !== "# New\n") throw new Error("not written");
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  const temp = await writeTemp(path, bytes, await modeOf(path));
  try {
    await Deno.rename(temp, path);
  } catch (err) {
    await Deno.remove(temp).catch(() => {});
    throw err;
  }
  await syncFolder(dirname(path));
}

/**
 * Flushes a folder's entries (a rename) to disk; a platform without folder handles skips it.
 *
 * @param dir The folder.
 */
export async function syncFolder(dir: string): Promise<void> {
  if (Deno.build.os === "windows") return;
  const handle = await Deno.open(dir, { read: true });
  try {
    await handle.sync();
  } finally {
    handle.close();
  }
}
