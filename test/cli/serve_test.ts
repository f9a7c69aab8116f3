import { equal, match, ok, throws } from "node:assert/strict";
import { join } from "node:path";
import { parseServeArgs } from "../../kernel/cli/serve.ts";

const MAIN = new URL("../../cells/main.ts", import.meta.url).pathname;
const REPO = new URL("../../", import.meta.url).pathname;

Deno.test("parseServeArgs() reads port and host and refuses bad ones", () => {
  const a = parseServeArgs(["d.md", "--host", "0.0.0.0", "--port", "9000"]);
  equal(a.host, "0.0.0.0");
  equal(a.port, 9000);
  throws(() => parseServeArgs(["d.md", "--port", "70000"]), {
    name: "RangeError",
    message: `Bad port "70000": a whole number from 1 to 65535`,
  });
  throws(() => parseServeArgs(["d.md", "--open"]), {
    name: "RangeError",
    message: `Unknown option "--open"`,
  });
});

/** Reads the child's standard output until a line matches, for at most `ms`. */
async function readUntil(reader: ReadableStreamDefaultReader<string>, re: RegExp, ms: number) {
  let text = "";
  const deadline = Date.now() + ms;
  while (Date.now() < deadline) {
    const timer = new Promise<null>((r) => setTimeout(() => r(null), deadline - Date.now()));
    const next = await Promise.race([reader.read(), timer]);
    if (next === null || next.done) break;
    text += next.value;
    const m = text.match(re);
    if (m) return m;
  }
  throw new Error(`No line matching ${re} within ${ms} ms; got: ${text}`);
}

Deno.test("plumb serve prints the URL and serves the page and its bundle until stopped", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-serve-cli-" });
  await Deno.writeTextFile(join(dir, "a.csv"), "x,y\n1,2\n2,4.1\n3,5.9\n");
  await Deno.writeTextFile(
    join(dir, "doc.md"),
    "# Demo\n\n```table t\nfrom: a.csv\n```\n\n```fit f\non: t\nmodel: y = a + b*x\n```\n",
  );
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-run",
      "--allow-net=127.0.0.1",
      "--allow-env=LOG_TOKENS,LOG_STREAM",
      MAIN,
      "serve",
      join(dir, "doc.md"),
    ],
    cwd: REPO,
    stdout: "piped",
    stderr: "inherit",
  }).spawn();
  const reader = child.stdout.pipeThrough(new TextDecoderStream()).getReader();
  try {
    const [url, origin] = await readUntil(
      reader,
      /(http:\/\/127\.0\.0\.1:\d+)\/enter\/\w+/,
      60000,
    );
    const ex = await fetch(url, { redirect: "manual" });
    await ex.body?.cancel();
    equal(ex.status, 303);
    const cookie = (ex.headers.get("set-cookie") ?? "").split(";")[0];
    const page = await fetch(`${origin}/`, { headers: { cookie } });
    equal(page.status, 200);
    const html = await page.text();
    const script = html.match(/src="(\/app\.[0-9a-f]{16}\.js)"/);
    if (script) {
      const js = await fetch(`${origin}${script[1]}`, { headers: { cookie } });
      equal(js.status, 200);
      match(js.headers.get("cache-control") ?? "", /immutable/);
      ok((await js.arrayBuffer()).byteLength > 1000);
    } else match(html, /live channel/);
  } finally {
    await reader.cancel();
    child.kill("SIGTERM");
    const status = await child.status;
    ok(status.code === 0 || status.signal === "SIGTERM", JSON.stringify(status));
    await Deno.remove(dir, { recursive: true });
  }
});
