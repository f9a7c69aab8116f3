/**
 * What the browser suites share: the skip rule, a real `plumb serve` on a
 * free port over a temporary copy of an example folder, headless Chromium
 * through puppeteer-core, and a tap on the page's WebSocket frames (through
 * the DevTools protocol, so the page runs unmodified).
 *
 * Skip rule: without /usr/bin/chromium every browser test is registered as
 * ignored (`ignore: skipWithoutBrowser(suite)`) and the run says so in one
 * line, once, with how to get Chromium; with PLUMB_REQUIRE_BROWSER=1 the
 * suite fails instead.
 *
 * @module
 */
import puppeteer, { type Browser, type Page } from "puppeteer-core";
import type { ServerMessage } from "../../kernel/server/protocol.ts";
import { printOnce } from "../_once.ts";
import { copyDir } from "../_copy_dir.ts";

/** The browser the suites drive. */
export const CHROMIUM = "/usr/bin/chromium";

const FLAGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];

const REPO = new URL("../../", import.meta.url);

function hasChromium(): boolean {
  try {
    return Deno.statSync(CHROMIUM).isFile;
  } catch {
    return false;
  }
}

/**
 * Whether this suite is skipped; the first suite of a run to skip prints the
 * one skip line.
 *
 * @param suite The suite's name, for the line.
 * @returns `ignore` for Deno.test: true to skip.
 * @throws {Error} When Chromium is absent and PLUMB_REQUIRE_BROWSER=1.
 */
export function skipWithoutBrowser(suite: string): boolean {
  if (hasChromium()) return false;
  if (Deno.env.get("PLUMB_REQUIRE_BROWSER") === "1") {
    throw new Error(`Browser suite "${suite}" needs ${CHROMIUM}: PLUMB_REQUIRE_BROWSER=1 is set`);
  }
  printOnce(
    "browser",
    `skip: browser suites (no ${CHROMIUM}): apt-get install -y chromium (Debian) to run them`,
  );
  return true;
}

/** A running `plumb serve`. */
export interface Served {
  /** The printed URL with the token. */
  url: string;
  origin: string;
  token: string;
  /** The temporary folder holding the document and its data. */
  dir: string;
  /** Path of the document in `dir`. */
  doc: string;
  /** Stops the server and removes the folder. */
  close(): Promise<void>;
}

function freePort(): number {
  const l = Deno.listen({ hostname: "127.0.0.1", port: 0 });
  const port = (l.addr as Deno.NetAddr).port;
  l.close();
  return port;
}

/**
 * Starts the real server on a copy of an example folder.
 *
 * @param example The folder under `examples/` (e.g. "fade").
 * @param docName The document's file name in it.
 * @param prepare Changes to the copy before the server starts (e.g. extra cells or rows).
 * @returns The server, once it printed its URL.
 * @throws {Error} When it exits or prints no URL within 60 s.
 */
export async function serve(
  example: string,
  docName: string,
  prepare?: (dir: string) => void | Promise<void>,
): Promise<Served> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-e2e-" });
  copyDir(new URL(`examples/${example}`, REPO).pathname, dir);
  await prepare?.(dir);
  const doc = `${dir}/${docName}`;
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "-A",
      "--unstable-bundle",
      new URL("cells/main.ts", REPO).pathname,
      "serve",
      doc,
      "--port",
      String(freePort()),
    ],
    cwd: REPO.pathname,
    stdout: "piped",
    stderr: "piped",
    stdin: "null",
  }).spawn();
  const errText: string[] = [];
  const stderrDone = child.stderr.pipeThrough(new TextDecoderStream()).pipeTo(
    new WritableStream({ write: (s) => void errText.push(s) }),
  );
  const reader = child.stdout.pipeThrough(new TextDecoderStream()).getReader();
  let out = "";
  let url: string | null = null;
  const deadline = setTimeout(() => child.kill("SIGTERM"), 60_000);
  while (url === null) {
    const { value, done } = await reader.read();
    if (done) break;
    out += value;
    url = /Open (http:\/\/\S+)/.exec(out)?.[1] ?? null;
  }
  clearTimeout(deadline);
  const drain = (async () => {
    while (!(await reader.read()).done) { /* keep the pipe flowing */ }
  })();
  const close = async () => {
    try {
      child.kill("SIGTERM");
    } catch { /* gone */ }
    await child.status;
    await drain;
    await stderrDone;
    await Deno.remove(dir, { recursive: true });
  };
  if (url === null) {
    await close();
    throw new Error(`plumb serve printed no URL: ${out}${errText.join("")}`);
  }
  const u = new URL(url);
  return { url, origin: u.origin, token: u.searchParams.get("token") ?? "", dir, doc, close };
}

/**
 * Serves a copy of an example and opens a browser on nothing yet; closes both after `fn`,
 * whatever it throws.
 *
 * @param example The folder under `examples/`.
 * @param docName The document's file name in it.
 * @param fn The test body, given the server and the browser.
 * @param prepare Changes to the copy before the server starts.
 */
export async function withServedBrowser(
  example: string,
  docName: string,
  fn: (served: Served, b: Session) => Promise<void>,
  prepare?: (dir: string) => void | Promise<void>,
): Promise<void> {
  let served: Served | null = null;
  let b: Session | null = null;
  try {
    served = await serve(example, docName, prepare);
    b = await openBrowser();
    await fn(served, b);
  } finally {
    await b?.close();
    await served?.close();
  }
}

/** A headless browser with its own profile. */
export interface Session {
  browser: Browser;
  page: Page;
  /** Console errors and page errors seen so far. */
  errors: string[];
  /** Live messages received by the page, in order. */
  messages: ServerMessage[];
  close(): Promise<void>;
}

/**
 * Launches Chromium and opens a page that records console errors and the
 * live channel's frames.
 *
 * @param opts `tap: false` leaves the live channel's frames unrecorded
 *   (`messages` stays empty): the DevTools protocol then sends nothing per
 *   frame, for measurements that should not carry that load.
 * @returns The session.
 */
export async function openBrowser(opts: { tap?: boolean } = {}): Promise<Session> {
  const profile = await Deno.makeTempDir({ prefix: "plumb-chromium-" });
  const browser = await puppeteer.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [...FLAGS, `--user-data-dir=${profile}`],
    defaultViewport: { width: 1280, height: 900 },
  });
  const page = await browser.newPage();
  const errors: string[] = [];
  const messages: ServerMessage[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(`console: ${m.text()}`);
  });
  page.on("pageerror", (e) => errors.push(`page: ${String(e)}`));
  if (opts.tap ?? true) {
    const cdp = await page.createCDPSession();
    await cdp.send("Network.enable");
    cdp.on("Network.webSocketFrameReceived", (e) => {
      try {
        // A frame holds one message or an array of them (a run's burst).
        for (const m of [JSON.parse(e.response.payloadData)].flat()) {
          (m as { receivedAt?: number }).receivedAt = Date.now();
          messages.push(m);
        }
      } catch { /* not ours */ }
    });
  }
  return {
    browser,
    page,
    errors,
    messages,
    close: async () => {
      await browser.close();
      await Deno.remove(profile, { recursive: true }).catch(() => {});
    },
  };
}

/**
 * Waits until every cell block on the page is current.
 *
 * @param page The page.
 * @param timeout In ms.
 * @returns Nothing; throws on timeout.
 */
export async function allCurrent(page: Page, timeout = 30_000): Promise<void> {
  await page.waitForFunction(() => {
    const cells = [...document.querySelectorAll("[data-block][data-state]")];
    return cells.length > 0 && cells.every((c) => c.getAttribute("data-state") === "current");
  }, { timeout, polling: 50 });
}

/**
 * Waits until every cell block on the page has settled: current or failed.
 *
 * @param page The page.
 * @param timeout In ms.
 * @returns Nothing; throws on timeout.
 */
export async function settled(page: Page, timeout = 60_000): Promise<void> {
  await page.waitForFunction(() => {
    const cells = [...document.querySelectorAll("[data-block][data-state]")];
    return cells.length > 0 &&
      cells.every((c) => ["current", "failed"].includes(c.getAttribute("data-state") ?? ""));
  }, { timeout, polling: 50 });
}

/** A phone, a half screen and a desktop: the widths every browser feature is tested at. */
export const THREE_WIDTHS = [
  { width: 390, height: 844 },
  { width: 960, height: 800 },
  { width: 1440, height: 900 },
];

/** Where screenshots go (git-ignored; made here, so the first suite to run finds it). */
export const ARTIFACTS = new URL("test/artifacts/", REPO);
Deno.mkdirSync(ARTIFACTS, { recursive: true });
