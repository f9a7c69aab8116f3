/**
 * Watching a document's folder, with bursts of events merged into one call.
 *
 * ```
 *  editor saves (write temp, rename over)   ─┐
 *  logger appends rows (many small writes)  ─┼─▶ Deno.watchFs(folder) ─▶ paths
 *                                            ┘         │ quiet for `debounceMs`?
 *                                                      ▼
 *                                          onChange(set of absolute paths)
 * ```
 *
 * The folder is watched, not the files: an atomic replace gives the document
 * a new inode, and a watch on the old one would go blind. Our own temporary
 * files (atomic_write.ts) are ignored.
 *
 * @module
 */
import { basename, resolve } from "node:path";
import { TEMP_PREFIX } from "./atomic_write.ts";

/** A running folder watch. */
export interface FolderWatch {
  /** Stops watching; pending changes are dropped. */
  close(): void;
}

/**
 * Watches a folder (recursively) and reports changed paths after a quiet spell.
 *
 * @param dir The folder.
 * @param onChange Called with the absolute paths changed in one burst; not
 *   called again until its promise settles (changes meanwhile are collected).
 * @param debounceMs Quiet time that ends a burst (default 2 ms: an editor's save, temporary
 *   file, write and rename, and a logger's appended block land within a millisecond or
 *   two here; the file event itself arrives about 1 ms after the write (measured on
 *   this machine kind); runs never overlap and equal content is never recomputed, so a
 *   burst split in two costs at most one extra, superseded run, whose messages the page
 *   never sees: a run's messages are held for its first 200 ms, live_workspace.ts).
 * @returns A handle to stop the watch.
 * @throws {Deno.errors.NotFound} When the folder does not exist.
 * @example
 * ```ts ignore
 * import { watchFolder } from "./watch_folder.ts";
 * const w = watchFolder("examples/fade", (paths) => console.log([...paths]));
 * w.close();
 * ```
 */
export function watchFolder(
  dir: string,
  onChange: (paths: Set<string>) => void | Promise<void>,
  debounceMs = 2,
): FolderWatch {
  const watcher = Deno.watchFs(resolve(dir), { recursive: true });
  let pending = new Set<string>();
  let timer: ReturnType<typeof setTimeout> | undefined;
  let busy = false;
  let closed = false;
  const flush = async () => {
    timer = undefined;
    if (busy || closed || pending.size === 0) return;
    const paths = pending;
    pending = new Set();
    busy = true;
    try {
      await onChange(paths);
    } catch (err) {
      console.error(`Watcher: ${(err as Error).message}`);
    } finally {
      busy = false;
      if (pending.size > 0 && !closed) timer = setTimeout(flush, debounceMs);
    }
  };
  (async () => {
    try {
      for await (const event of watcher) {
        if (event.kind === "access") continue;
        for (const p of event.paths) {
          if (!basename(p).startsWith(TEMP_PREFIX)) pending.add(resolve(p));
        }
        if (pending.size === 0) continue;
        if (timer !== undefined) clearTimeout(timer);
        timer = setTimeout(flush, debounceMs);
      }
    } catch (err) {
      if (!closed) console.error(`Watcher stopped: ${(err as Error).message}`);
    }
  })();
  return {
    close() {
      closed = true;
      if (timer !== undefined) clearTimeout(timer);
      try {
        watcher.close();
      } catch { /* already closed */ }
    },
  };
}
