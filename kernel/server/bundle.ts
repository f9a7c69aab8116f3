/**
 * Bundling the front end (`ui/main.tsx`) for the browser.
 *
 * ```
 *  ui/main.tsx ─Deno.bundle (esbuild; deno.json imports, npm packages)─▶ main.js (+ main.css)
 *        │                                                               │ SHA-256, 16 hex digits
 *        ▼                                                               ▼
 *   in-memory cache by the hash of the output ──▶ /app.<hash>.js, /app.<hash>.css
 * ```
 *
 * Deno's built-in bundler runs esbuild inside the runtime: it resolves the
 * repository's import map and npm packages the way the kernel does, needs only
 * read permission (no `--allow-run`, unlike the `esbuild` npm package, which
 * spawns its binary) and takes about 0.1 s for Preact with Markdown (measured
 * with a probe entry: 120 kB minified, 0.11 s warm, 0.44 s on first use when
 * Deno fetches its esbuild). It needs `--unstable-bundle`.
 *
 * Fonts and images imported from CSS have no loader there: a stylesheet that
 * needs them (KaTeX's) is served from its package instead (see server.ts).
 *
 * @module
 */
import { sha256Hex } from "../hash.ts";

/** A built front end, named by content hash. */
export interface Bundle {
  /** 16 hex digits of the SHA-256 of the JavaScript and CSS. */
  hash: string;
  js: Uint8Array<ArrayBuffer>;
  /** The bundled CSS, or null when the entry imports none. */
  css: Uint8Array<ArrayBuffer> | null;
}

/** Raised when the front end does not build. */
export class BundleError extends Error {
  override name = "BundleError";
}

const memory = new Map<string, Bundle>();

/** The part of `Deno.bundle` used here (its types ship only with `--unstable-bundle`). */
type BundleFn = (opts: {
  entrypoints: string[];
  outputDir: string;
  write: false;
  platform: "browser";
  format: "esm";
  minify: boolean;
}) => Promise<{
  success: boolean;
  errors: { text: string; location?: { file: string; line: number } }[];
  outputFiles?: { path: string; contents?: Uint8Array<ArrayBuffer> }[];
}>;

/**
 * Whether this runtime offers the bundler (`deno run --unstable-bundle`).
 *
 * @returns True when `Deno.bundle` exists.
 * @example
 * ```ts
 * import { canBundle } from "./bundle.ts";
 * if (typeof canBundle() !== "boolean") throw new Error("not a boolean");
 * ```
 */
export function canBundle(): boolean {
  return typeof (Deno as { bundle?: unknown }).bundle === "function";
}

/**
 * Bundles an entry module for the browser (ESM, minified). Equal outputs share
 * one cached {@link Bundle}.
 *
 * @param entry Path or file URL of the entry (e.g. `ui/main.tsx`).
 * @returns The bundle.
 * @throws {BundleError} When the runtime lacks the bundler or the entry does not build.
 * @example
 * ```ts ignore
 * import { buildBundle } from "./bundle.ts";
 * const b = await buildBundle(new URL("../../ui/main.tsx", import.meta.url));
 * console.log(`/app.${b.hash}.js`);
 * ```
 */
export async function buildBundle(entry: string | URL): Promise<Bundle> {
  if (!canBundle()) {
    throw new BundleError("Cannot bundle the front end: run deno with --unstable-bundle");
  }
  const url = entry instanceof URL ? entry : new URL(entry, `file://${Deno.cwd()}/`);
  const bundle = (Deno as unknown as { bundle: BundleFn }).bundle;
  const result = await bundle({
    entrypoints: [url.href],
    outputDir: new URL(".bundle-out/", url).pathname,
    write: false,
    platform: "browser",
    format: "esm",
    minify: true,
  });
  if (!result.success || !result.outputFiles) {
    const first = result.errors[0];
    const where = first?.location ? ` (${first.location.file}:${first.location.line})` : "";
    throw new BundleError(
      `Cannot bundle "${url.pathname}": ${first?.text ?? "no output"}${where}`,
    );
  }
  const js = result.outputFiles.find((f) => f.path.endsWith(".js"))?.contents;
  const css = result.outputFiles.find((f) => f.path.endsWith(".css"))?.contents ?? null;
  if (!js) throw new BundleError(`Cannot bundle "${url.pathname}": esbuild wrote no JavaScript`);
  const both = new Uint8Array(js.length + (css?.length ?? 0));
  both.set(js);
  if (css) both.set(css, js.length);
  const hash = (await sha256Hex(both)).slice(0, 16);
  const hit = memory.get(hash);
  if (hit) return hit;
  const built = { hash, js, css };
  memory.set(hash, built);
  return built;
}
