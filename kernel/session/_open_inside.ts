/**
 * Opening a data file once and checking what was opened, not the path.
 *
 * Checking a path and then reading it by name leaves a window: a symbolic
 * link to a file outside the document's folder, or a named pipe, renamed
 * onto the path between the two was read (the outside file shown in RUN-JSON
 * in 10 of 40 tries) or hung the run (11 of 40; issue 11). So:
 *
 * ```
 *  realPath(path) inside the folder? ── lstat: a regular file? (a pipe is refused unopened)
 *     └─▶ open(real, O_RDONLY | O_NOFOLLOW | O_NONBLOCK)   a link swapped in: ELOOP;
 *           │                                              a pipe swapped in: no wait
 *           └─▶ fstat(handle): a regular file, the same (dev, ino) as the lstat above,
 *               and realPath(path) still the same file inside the folder
 *                  └─▶ the caller reads from this handle, never by name again
 * ```
 *
 * O_NOFOLLOW guards the last component only; a folder on the way swapped
 * for a link is caught by the (dev, ino) comparison and the second realPath.
 *
 * @module
 */
import { createHash } from "node:crypto";
import { promises as fsp } from "node:fs";
import fs from "node:fs";
import { isAbsolute, join, relative } from "node:path";
import { CellError, type OptionPath } from "../errors.ts";

/** An open data file with the status of what was opened. */
export interface OpenedFile {
  handle: fsp.FileHandle;
  size: number;
  mtime: number;
  /** Device and inode of what was opened (its identity for the cache). */
  id: string;
}

const { O_RDONLY, O_NOFOLLOW, O_NONBLOCK } = fs.constants;

function inside(dir: string, real: string): boolean {
  const rel = relative(dir, real);
  return !rel.startsWith("..") && !isAbsolute(rel);
}

/** What a non-regular entry is, in words, from its mode's type bits (stat(2), S_IFMT). */
function kindOf(mode: number | null): string {
  switch ((mode ?? 0) & 0o170000) {
    case 0o040000:
      return "a folder";
    case 0o010000:
      return "a named pipe";
    case 0o140000:
      return "a socket";
    case 0o120000:
      return "a symbolic link";
    default:
      return "a device or special file";
  }
}

function notRegular(path: string, option: OptionPath, mode: number | null): CellError {
  return new CellError(`"${path}" is not a regular file: it is ${kindOf(mode)}`, option);
}

/**
 * Opens a data file inside the document's folder, checking the opened handle.
 *
 * @param abs The absolute path (lexically inside `dir`).
 * @param dir The document's folder.
 * @param path The path as written (for messages).
 * @param option The option naming it.
 * @returns The open handle (the caller closes it) with its size, time and identity.
 * @throws {CellError} Missing, linking outside, not a regular file, or changed while opened.
 */
export async function openInside(
  abs: string,
  dir: string,
  path: string,
  option: OptionPath,
): Promise<OpenedFile> {
  const outside = () => new CellError(`File "${path}" links outside the document's folder`, option);
  const changed = () =>
    new CellError(`File "${path}" changed while it was being opened; nothing was read`, option);
  let real: string, before: Deno.FileInfo;
  try {
    const realDir = await Deno.realPath(dir);
    real = await Deno.realPath(abs);
    if (!inside(realDir, real)) throw outside();
    before = await Deno.lstat(real);
  } catch (err) {
    if (err instanceof CellError) throw err;
    if (err instanceof Deno.errors.NotFound) {
      throw new CellError(`File "${path}" not found in ${join(dir)}`, option);
    }
    throw new CellError(`Cannot read file "${path}": ${(err as Error).message}`, option);
  }
  if (before.isSymlink) throw changed();
  if (!before.isFile) throw notRegular(path, option, before.mode);
  let handle: fsp.FileHandle;
  try {
    handle = await fsp.open(real, O_RDONLY | O_NOFOLLOW | O_NONBLOCK);
  } catch (err) {
    const code = (err as { code?: string }).code;
    if (code === "ELOOP" || code === "ENOENT") throw changed();
    throw new CellError(`Cannot read file "${path}": ${(err as Error).message}`, option);
  }
  try {
    const st = await handle.stat();
    if (!st.isFile()) throw notRegular(path, option, st.mode);
    const same = st.dev === before.dev && st.ino === before.ino;
    const realDir = await Deno.realPath(dir);
    const again = await Deno.realPath(abs).catch(() => null);
    if (again !== null && !inside(realDir, again)) throw outside();
    if (!same || again !== real) throw changed();
    return { handle, size: st.size, mtime: st.mtimeMs, id: `${st.dev}:${st.ino}` };
  } catch (err) {
    await handle.close();
    if (err instanceof CellError) throw err;
    throw new CellError(`Cannot read file "${path}": ${(err as Error).message}`, option);
  }
}

/** What {@link readOpened} gives: the bytes and their SHA-256. */
export interface ReadBytes {
  /** The content, in a SharedArrayBuffer (handed to the compute worker without a copy). */
  bytes: Uint8Array;
  /** Lower-case hex SHA-256 of `bytes`. */
  sha256: string;
}

/** Bytes read per request: big enough that requests cost nothing, small enough to overlap. */
const CHUNK = 1 << 22;

/**
 * Reads an opened file from its handle into one buffer of the size fstat gave
 * (no more: a file growing meanwhile is read again on the watcher's next
 * change), hashing chunk by chunk while the next
 * chunk is being read.
 *
 * The buffer is a SharedArrayBuffer: the compute worker is handed the same
 * memory (postMessage shares it), where a copy would cost as much again as
 * the read, since touching new memory is what reading a large file costs
 * (about 2.8 ms a MB on this project's machines, more than the copy itself).
 * SHA-256 is node:crypto's (hardware SHA where the processor has it: 85 ms
 * for 137 MB here, against 750 ms for `crypto.subtle.digest`, which also
 * refuses shared memory).
 *
 * @param file From {@link openInside}.
 * @returns The bytes (shorter when the file shrank meanwhile) and their SHA-256.
 */
export async function readOpened(file: OpenedFile): Promise<ReadBytes> {
  const bytes = new Uint8Array(new SharedArrayBuffer(file.size));
  const hash = createHash("sha256");
  const readAt = (at: number) =>
    file.handle.read(bytes, at, Math.min(CHUNK, file.size - at), at).then((r) => r.bytesRead);
  let at = 0;
  let next = file.size > 0 ? readAt(0) : null;
  while (next !== null) {
    const got = await next;
    if (got === 0) break; // shrank meanwhile
    const end = at + got;
    next = end < file.size ? readAt(end) : null;
    const chunk = bytes.subarray(at, end);
    hash.update(chunk);
    at = end;
  }
  return {
    bytes: at === file.size ? bytes : bytes.subarray(0, at),
    sha256: hash.digest("hex"),
  };
}
