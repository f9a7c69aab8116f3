/**
 * The HTML the server answers `/` with: a shell that loads the bundled front
 * end, or, while `ui/main.tsx` does not exist, a plain page listing each
 * cell's state from the live channel.
 *
 * @module
 */
import type { Bundle } from "./bundle.ts";

const escapeHtml = (s: string): string => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/**
 * The page for `/`.
 *
 * @param bundle The built front end, or null for the plain page.
 * @param token The session token (the page sends it back in `X-Plumb-Token`).
 * @param nonce The Content-Security-Policy nonce for the plain page's script.
 * @returns HTML text.
 * @example
 * ```ts
 * import { shellHtml } from "./shell.ts";
 * const html = shellHtml({ hash: "ab", js: new Uint8Array(), css: null }, "t", "n");
 * if (!html.includes('src="/app.ab.js"')) throw new Error(html);
 * ```
 */
export function shellHtml(bundle: Bundle | null, token: string, nonce: string): string {
  const head = `<!doctype html>
<html lang="en">
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="plumb-token" content="${escapeHtml(token)}">
<title>Plumb</title>
`;
  if (bundle) {
    const css = bundle.css ? `<link rel="stylesheet" href="/app.${bundle.hash}.css">\n` : "";
    return head + css + `<div id="app"></div>
<script type="module" src="/app.${bundle.hash}.js"></script>
`;
  }
  return head + `<h1 id="title">Plumb</h1>
<p>The front end is not built yet (no ui/main.tsx); cell states from the live channel:</p>
<ul id="cells"></ul>
<script nonce="${escapeHtml(nonce)}">
const cells = new Map();
const list = document.getElementById("cells");
const ws = new WebSocket("ws://" + location.host + "/live");
ws.onmessage = (e) => {
  const m = JSON.parse(e.data);
  if (m.type === "document") document.getElementById("title").textContent = m.title;
  if (m.type !== "cell") return;
  let li = cells.get(m.name);
  if (!li) { li = document.createElement("li"); cells.set(m.name, li); list.append(li); }
  li.textContent = m.kind + " " + m.name + ": " + m.state +
    (m.summaryLine ? " · " + m.summaryLine : "") + (m.error ? " · " + m.error.message : "");
};
</script>
`;
}
