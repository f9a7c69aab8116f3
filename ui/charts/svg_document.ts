/**
 * The DOM document charts are drawn with: the browser's own on the live
 * page, a linkedom document on the server (the static record, `deno test`,
 * the compute worker), so both produce their SVG from the same code.
 *
 * linkedom is imported only where there is no `document` (a dynamic import
 * behind the check), so a browser bundle can leave it out: bundle with
 * `external: ["linkedom"]` and the browser never asks for it.
 *
 * @module
 */

const server: Document | null = typeof globalThis.document === "undefined"
  ? await serverDocument()
  : null;

async function serverDocument(): Promise<Document> {
  const { parseHTML } = await import("linkedom");
  return parseHTML("<!doctype html><html><head></head><body></body></html>")
    .document as unknown as Document;
}

/**
 * The document to draw charts with.
 *
 * @returns The browser's `document` where there is one, else a linkedom document.
 * @example
 * ```ts
 * import { chartDocument } from "./svg_document.ts";
 * const svg = chartDocument().createElementNS("http://www.w3.org/2000/svg", "svg");
 * if (svg.tagName.toLowerCase() !== "svg") throw new Error(svg.tagName);
 * ```
 */
export function chartDocument(): Document {
  return server ?? globalThis.document;
}
