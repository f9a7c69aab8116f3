/**
 * The live workspace's server side: `plumb serve` binds 127.0.0.1, guards
 * every request with a token cookie and Host and Origin checks, watches the
 * document's folder, reruns what changed through one Session and pushes
 * cell states to the browsers; edits from the page are written atomically
 * and only onto the version they were based on.
 *
 * ```
 *  protocol.ts        the messages and requests (shared with ui/)
 *  server.ts          startServer: HTTP, WebSocket, edits
 *  live_workspace.ts  one document, its Session, serialised runs
 *  guard.ts           token, cookie, Host, Origin and CSRF checks
 *  watch_folder.ts    folder watch with debounce
 *  atomic_write.ts    temp file, fsync, rename, fsync of the folder
 *  edits.ts           save, new, delete and restore on the text
 *  bundle.ts          ui/main.tsx → /app.<hash>.js by Deno's esbuild
 *  permissions.ts     the narrowed flags `plumb serve` relaunches itself with
 * ```
 *
 * @example
 * ```ts
 * import { newToken } from "./mod.ts";
 * if (newToken().length !== 32) throw new Error("not 128 bits");
 * ```
 *
 * @module
 */
export * from "./protocol.ts";
export { type LiveServer, type ServerOptions, startServer } from "./server.ts";
export { type LiveOptions, LiveWorkspace } from "./live_workspace.ts";
export { allowedHosts, checkRequest, type GuardContext, newToken, sameSecret } from "./guard.ts";
export { type FolderWatch, watchFolder } from "./watch_folder.ts";
export { TEMP_PREFIX, writeFileAtomic } from "./atomic_write.ts";
export { deleteCell, type Edited, EditError, newCell, restoreCell, saveCell } from "./edits.ts";
export { buildBundle, type Bundle, BundleError, canBundle } from "./bundle.ts";
export { templateFor } from "./templates.ts";
export { type NarrowedFlags, narrowedFlags } from "./permissions.ts";
