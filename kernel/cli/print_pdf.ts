/**
 * Printing a record to PDF with headless Chromium's own print path
 * (`--print-to-pdf`): the page size is the record's CSS `@page size`, the
 * running title and page numbers its page-margin boxes. Chromium gets a
 * fresh profile in a temporary folder beside the output (the one folder
 * `plumb export` may write), removed afterwards, and is stopped if it takes
 * longer than a minute.
 *
 * @module
 */
import { dirname, join } from "node:path";

/** Where Debian and other Linux systems put Chromium, and Chrome. */
const CANDIDATES = [
  "/usr/bin/chromium",
  "/usr/bin/chromium-browser",
  "/usr/bin/google-chrome",
  "/usr/bin/google-chrome-stable",
  "/Applications/Chromium.app/Contents/MacOS/Chromium",
  "/Applications/Google Chrome.app/Contents/MacOS/Google Chrome",
];

/**
 * The first Chromium (or Chrome) found, or null.
 *
 * @returns Its path.
 */
export function findChromium(): string | null {
  for (const c of CANDIDATES) {
    try {
      if (Deno.statSync(c).isFile) return c;
    } catch { /* not there, or not readable */ }
  }
  return null;
}

const TIMEOUT_MS = 60_000;

/**
 * Prints an HTML document to a PDF file.
 *
 * @param chromium The browser's path.
 * @param html The document (self-contained: nothing is fetched).
 * @param out The PDF's path.
 * @throws {Error} When the browser fails or times out, with its last line of output.
 */
export async function printToPdf(chromium: string, html: string, out: string): Promise<void> {
  const tmp = await Deno.makeTempDir({ dir: dirname(out), prefix: ".plumb-pdf-" });
  try {
    const page = join(tmp, "record.html");
    await Deno.writeTextFile(page, html);
    const child = new Deno.Command(chromium, {
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--no-first-run",
        "--disable-background-networking",
        `--user-data-dir=${join(tmp, "profile")}`,
        "--no-pdf-header-footer",
        `--print-to-pdf=${out}`,
        `file://${page}`,
      ],
      stdin: "null",
      stdout: "piped",
      stderr: "piped",
    }).spawn();
    const timer = setTimeout(() => child.kill("SIGKILL"), TIMEOUT_MS);
    const done = await child.output().finally(() => clearTimeout(timer));
    if (!done.success) {
      const said = new TextDecoder().decode(done.stderr).trim().split("\n").at(-1) ?? "";
      throw new Error(`the browser stopped (exit ${done.code})${said ? `: ${said}` : ""}`);
    }
  } finally {
    await Deno.remove(tmp, { recursive: true }).catch(() => {});
  }
}
