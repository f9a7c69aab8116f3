/**
 * Writing a file so that a reader (or a crash) sees the old content or the
 * new, never a mix:
 *
 * ```
 *  folder/.plumb-save-<random>.tmp ◀─ write all bytes, fsync
 *         │ rename (atomic within one file system)
 *         ▼
 *  folder/name ; fsync the folder so the rename itself is durable
 * ```
 *
 * The temporary file sits in the target's own folder (a rename across file
 * systems is not atomic) and is removed when any step fails. Watchers skip
 * names starting with {@link TEMP_PREFIX}.
 *
 * @module
 */
import { basename, dirname, join } from "node:path";

/** Prefix of the temporary files this module writes. */
export const TEMP_PREFIX = ".plumb-save-";

/**
 * Replaces a file's content atomically (temporary file, fsync, rename, fsync of the folder).
 * The file keeps its permission bits when it existed.
 *
 * @param path The file to write.
 * @param text The new content (written as UTF-8).
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
export async function writeFileAtomic(path: string, text: string): Promise<void> {
  const dir = dirname(path);
  const suffix = Array.from(crypto.getRandomValues(new Uint8Array(6)), (b) => b.toString(16))
    .join("");
  const temp = join(dir, `${TEMP_PREFIX}${basename(path)}-${suffix}.tmp`);
  let mode: number | undefined;
  try {
    mode = (await Deno.stat(path)).mode ?? undefined;
  } catch (err) {
    if (!(err instanceof Deno.errors.NotFound)) throw err;
  }
  try {
    const file = await Deno.open(temp, { write: true, createNew: true, mode: mode ?? 0o644 });
    try {
      const bytes = new TextEncoder().encode(text);
      for (let done = 0; done < bytes.length;) done += await file.write(bytes.subarray(done));
      await file.sync();
    } finally {
      file.close();
    }
    if (mode !== undefined && Deno.build.os !== "windows") await Deno.chmod(temp, mode & 0o7777);
    await Deno.rename(temp, path);
  } catch (err) {
    await Deno.remove(temp).catch(() => {});
    throw err;
  }
  await syncFolder(dir);
}

/** Flushes a folder's entries (the rename) to disk; a platform without folder handles skips it. */
async function syncFolder(dir: string): Promise<void> {
  if (Deno.build.os === "windows") return;
  const handle = await Deno.open(dir, { read: true });
  try {
    await handle.sync();
  } finally {
    handle.close();
  }
}
