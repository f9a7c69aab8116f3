/**
 * Replaces the document only if it still holds the bytes the edit was made
 * from: compare and replace as nearly one step as a POSIX file system allows,
 * then check again, so an editor's write is answered with a conflict instead
 * of being overwritten.
 *
 * ```
 *  write temp (all bytes, fsync)                      ── slow part, before the check
 *  ┌ synchronous: no other work of this process runs ───────────────────────┐
 *  │ link doc → pin          pin holds the inode now at doc (A)              │
 *  │ read pin == expected?   no ─▶ conflict (an edit landed since the read)  │
 *  │ doc still inode A?      no ─▶ conflict (an editor renamed a file in)    │
 *  │ rename temp → doc                                                       │
 *  └─────────────────────────────────────────────────────────────────────────┘
 *  re-check A through pin now and after the folder's fsync: still expected?
 *     no: an editor wrote into A in place during the swap ─▶ put A back
 *         (rename pin → doc, if doc still holds our bytes) and answer conflict
 * ```
 *
 * What is left: an editor that renames a file over the document in the
 * microseconds between the inode check and our rename loses that write (no
 * POSIX call swaps two names and returns the old one without renameat2's
 * RENAME_EXCHANGE, which Deno does not offer without FFI); an editor that
 * keeps the old file open and writes to it after the second check writes
 * into a file no longer named. Without hard links (some network or FAT
 * folders) the check is the compare alone. The pin and the temporary file
 * carry our temporary-name pattern, so a crash leaves nothing the clean-up
 * (stray_temps.ts) does not recognise.
 *
 * @module
 */
import { basename, dirname } from "node:path";
import { modeOf, syncFolder, tempPathFor, writeTemp } from "./atomic_write.ts";

/** The steps a test may hook into: to fail one (throw) or to race it (write the file). */
export type SaveStep = "temp" | "compared" | "renamed";

/** Test hooks of the save path; production passes none. */
export interface SaveHooks {
  /** Called at each step, synchronously; a throw fails the save at that step. */
  step?(step: SaveStep): void;
}

/** What became of a replace. */
export type Replaced =
  | { written: true }
  | { written: false; disk: Uint8Array; note?: string };

/**
 * Replaces `path` with `next` if it still holds `expected`.
 *
 * @param path The document.
 * @param expected The bytes the edit was made from.
 * @param next The new bytes.
 * @param hooks Test hooks.
 * @returns `written`, or the bytes on disk now (a conflict: nothing of ours stays written).
 * @throws {Deno.errors.NotFound} When the document is gone; any other file-system error
 *   (the document is then unchanged).
 * @example
 * ```ts
 * import { replaceIfUnchanged } from "./replace_if_unchanged.ts";
 * const dir = await Deno.makeTempDir(), path = `${dir}/a.md`, te = new TextEncoder();
 * await Deno.writeTextFile(path, "new elsewhere\n");
 * const out = await replaceIfUnchanged(path, te.encode("old\n"), te.encode("mine\n"));
 * if (out.written || await Deno.readTextFile(path) !== "new elsewhere\n") throw new Error();
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function replaceIfUnchanged(
  path: string,
  expected: Uint8Array,
  next: Uint8Array,
  hooks: SaveHooks = {},
): Promise<Replaced> {
  hooks.step?.("temp");
  const temp = await writeTemp(path, next, await modeOf(path));
  let renamed = false;
  let pin = pinOf(path, temp);
  try {
    const now = Deno.readFileSync(pin ?? path);
    if (!sameBytes(now, expected)) return { written: false, disk: now };
    if (pin && !sameFile(Deno.statSync(path), Deno.statSync(pin))) {
      return { written: false, disk: Deno.readFileSync(path) };
    }
    hooks.step?.("compared");
    Deno.renameSync(temp, path);
    renamed = true;
    hooks.step?.("renamed");
    let late = pin !== null && !sameBytes(Deno.readFileSync(pin), expected);
    if (!late) await syncFolder(dirname(path));
    late ||= pin !== null && !sameBytes(Deno.readFileSync(pin), expected);
    if (!late || pin === null) return { written: true };
    const back = putBack(path, pin, next);
    pin = null;
    await syncFolder(dirname(path));
    return back;
  } finally {
    if (!renamed) Deno.removeSync(temp);
    if (pin) Deno.removeSync(pin);
  }
}

/** Hard-links the document to a pin name, or null where the folder has no hard links. */
function pinOf(path: string, temp: string): string | null {
  const pin = tempPathFor(path);
  try {
    Deno.linkSync(path, pin);
    return pin;
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) {
      Deno.removeSync(temp);
      throw err;
    }
    return null;
  }
}

/**
 * An editor wrote into the replaced file during the swap: its bytes go back
 * under the document's name if the document still holds ours; otherwise both
 * changed, and the editor's are kept beside it under a name that says so.
 */
function putBack(path: string, pin: string, ours: Uint8Array): Replaced {
  const editor = Deno.readFileSync(pin);
  if (sameBytes(Deno.readFileSync(path), ours)) {
    Deno.renameSync(pin, path);
    return { written: false, disk: editor };
  }
  const kept = `${path}.conflict-${Date.now()}`;
  Deno.renameSync(pin, kept);
  return {
    written: false,
    disk: Deno.readFileSync(path),
    note: `"${basename(path)}" changed twice while saving: the other editor's version is kept ` +
      `as "${basename(kept)}"`,
  };
}

function sameBytes(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

function sameFile(a: Deno.FileInfo, b: Deno.FileInfo): boolean {
  return a.ino === null || (a.ino === b.ino && a.dev === b.dev);
}
