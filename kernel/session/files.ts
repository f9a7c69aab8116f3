/**
 * Reading the data files cells name. The main thread reads them (the compute
 * worker has no permissions) and hands over bytes with their SHA-256.
 *
 * A path must stay inside the document's folder: absolute paths, `..`
 * escapes and symbolic links leading out are refused. A file over the
 * document's size limit is refused before it is read. Content is cached by
 * path, size and modification time, so an unchanged file is neither read nor
 * hashed again.
 *
 * @module
 */
import { isAbsolute, join, relative, resolve } from "node:path";
import type { FileData } from "../contract/mod.ts";
import { CellError, type OptionPath } from "../errors.ts";
import { sha256Hex } from "../hash.ts";
import { formatBytes } from "../format_bytes.ts";

interface Entry {
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
    let info: Deno.FileInfo;
    try {
      info = await Deno.stat(abs);
      const real = await Deno.realPath(abs);
      const realDir = await Deno.realPath(this.#dir);
      const rel = relative(realDir, real);
      if (rel.startsWith("..") || isAbsolute(rel)) {
        throw new CellError(`File "${path}" links outside the document's folder`, option);
      }
    } catch (err) {
      if (err instanceof CellError) throw err;
      if (err instanceof Deno.errors.NotFound) {
        throw new CellError(`File "${path}" not found in ${join(this.#dir)}`, option);
      }
      throw new CellError(`Cannot read file "${path}": ${(err as Error).message}`, option);
    }
    if (!info.isFile) throw new CellError(`"${path}" is not a file`, option);
    if (info.size > maxBytes) {
      throw new CellError(
        `File "${path}" is ${formatBytes(info.size)}, over the limit of ${formatBytes(maxBytes)} ` +
          `(set max_file_size in the front matter to raise it)`,
        option,
      );
    }
    const mtime = info.mtime?.getTime() ?? 0;
    const hit = this.#cache.get(abs);
    if (hit && hit.size === info.size && hit.mtime === mtime) return { ...hit.data, path };
    let bytes: Uint8Array;
    try {
      bytes = await Deno.readFile(abs);
    } catch (err) {
      throw new CellError(`Cannot read file "${path}": ${(err as Error).message}`, option);
    }
    const data = { path, bytes, sha256: await sha256Hex(bytes) };
    this.#cache.set(abs, { size: info.size, mtime, data });
    return data;
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
