/**
 * Reading the data files cells name. The main thread reads them (the compute
 * worker has no permissions) and hands over bytes with their SHA-256: the
 * bytes are read once into one SharedArrayBuffer of the file's size, hashed
 * and their line feeds counted while read (`readOpened`), and the compute
 * worker is given that same memory, not a copy (kernel/worker/client.ts).
 *
 * A path must stay inside the document's folder: absolute paths, `..`
 * escapes and symbolic links leading out are refused, and only regular files
 * are read. The file is opened once, what was opened is checked (not the
 * path: a link or a pipe swapped in between is refused, _open_inside.ts) and
 * read from that handle. A file over the document's size limit is refused
 * before it is read. Content is cached by path, file identity, size and
 * modification time, so an unchanged file is neither read nor hashed again.
 *
 * @module
 */
import { isAbsolute, relative, resolve } from "node:path";
import type { FileData } from "../contract/mod.ts";
import { CellError, type OptionPath } from "../errors.ts";
import { countLineFeeds } from "../csv/mod.ts";
import { formatBytes } from "../format_bytes.ts";
import { openInside, type ReadBytes, readOpened } from "./_open_inside.ts";

/** Line feeds of the bytes {@link FileStore.read} gave, counted after they were read. */
const LINE_FEEDS = new WeakMap<Uint8Array, number>();

/** Files of this many bytes or more have their line feeds counted after the read. */
const COUNT_LATER_FROM = 16 << 20;

/**
 * Text lines in a file's bytes: its line feeds, and one more when the last
 * line has none. Free for bytes {@link FileStore.read} gave once the
 * thread has waited (counted then); other bytes are counted now.
 *
 * @param bytes A file's content.
 * @returns The number of lines.
 * @example
 * ```ts
 * import { lineCount } from "./files.ts";
 * if (lineCount(new TextEncoder().encode("x\n1\n2")) !== 3) throw new Error("three lines");
 * ```
 */
export function lineCount(bytes: Uint8Array): number {
  const feeds = LINE_FEEDS.get(bytes) ?? countLineFeeds(bytes);
  return bytes.length > 0 && bytes[bytes.length - 1] !== 10 ? feeds + 1 : feeds;
}

interface Entry {
  /** Device and inode of the file read. */
  id: string;
  size: number;
  mtime: number;
  data: FileData;
}

/** Reads data files for one document folder, with a content cache. */
export class FileStore {
  #dir: string;
  #cache = new Map<string, Entry>();

  /**
   * @param dir The document's folder (absolute or relative to the working directory).
   */
  constructor(dir: string) {
    this.#dir = resolve(dir);
  }

  /**
   * Resolves a path as written in a cell, refusing escapes from the document folder.
   *
   * @param path The path as written.
   * @param option The option naming it (for the error's position).
   * @returns The absolute path.
   * @throws {CellError} When the path leaves the document's folder.
   */
  resolvePath(path: string, option: OptionPath): string {
    const abs = resolve(this.#dir, path);
    const rel = relative(this.#dir, abs);
    if (isAbsolute(path) || rel.startsWith("..") || isAbsolute(rel)) {
      throw new CellError(
        `File "${path}" is outside the document's folder: data files must sit beside the document or below it`,
        option,
      );
    }
    return abs;
  }

  /**
   * Reads one file (or returns the cached content when size and mtime are unchanged).
   *
   * @param path The path as written in the cell.
   * @param option The option naming it.
   * @param maxBytes The document's size limit.
   * @returns The bytes and their SHA-256.
   * @throws {CellError} Missing, unreadable, escaping or oversized file.
   */
  async read(path: string, option: OptionPath, maxBytes: number): Promise<FileData> {
    const abs = this.resolvePath(path, option);
    // Opened once and checked as opened (_open_inside.ts), then read from that handle.
    const file = await openInside(abs, this.#dir, path, option);
    try {
      if (file.size > maxBytes) {
        throw new CellError(
          `File "${path}" is ${formatBytes(file.size)}, over the limit of ${
            formatBytes(maxBytes)
          } ` +
            `(set max_file_size in the front matter to raise it)`,
          option,
        );
      }
      const hit = this.#cache.get(abs);
      if (hit && hit.id === file.id && hit.size === file.size && hit.mtime === file.mtime) {
        return { ...hit.data, path };
      }
      let read: ReadBytes;
      try {
        read = await readOpened(file);
      } catch (err) {
        throw new CellError(`Cannot read file "${path}": ${(err as Error).message}`, option);
      }
      const { bytes, sha256 } = read;
      // A large file's line feeds are counted once this thread waits (for the compute worker to
      // parse it): counted while read, they held up the SHA-256 the cell's key waits for (about
      // 30 ms in 137 MB).
      if (bytes.length < COUNT_LATER_FROM) LINE_FEEDS.set(bytes, countLineFeeds(bytes));
      else {
        setTimeout(() => {
          if (!LINE_FEEDS.has(bytes)) LINE_FEEDS.set(bytes, countLineFeeds(bytes));
        }, 0);
      }
      const data = { path, bytes, sha256 };
      this.#cache.set(abs, { id: file.id, size: bytes.length, mtime: file.mtime, data });
      return data;
    } finally {
      await file.handle.close();
    }
  }

  /**
   * Forgets cached content (all, or one path), e.g. when a watcher reports a change.
   *
   * @param path Absolute path to forget; all when omitted.
   */
  forget(path?: string): void {
    if (path === undefined) this.#cache.clear();
    else this.#cache.delete(resolve(path));
  }
}
