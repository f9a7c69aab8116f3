/**
 * The static record (ui/record): rendered from real runs and read back as
 * HTML. What a reviewer relies on is checked on the markup itself: nothing
 * that runs, nothing fetched, the hashes true, the exclusions and failures
 * shown, and the same bytes from the same inputs.
 */
import { equal, match, ok } from "node:assert/strict";
import { parseHTML } from "linkedom";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import { sha256Hex } from "../../kernel/hash.ts";
import { CAUTION, gatherRecord, renderRecord } from "../../ui/record/mod.ts";

const DEMO = new URL("../../examples/fade/fade.md", import.meta.url);
const WORKER = new URL("../../cells/worker.ts", import.meta.url);

async function record(docUrl: URL, source?: string, epoch?: string): Promise<string> {
  const bytes = source === undefined
    ? await Deno.readFile(docUrl)
    : new TextEncoder().encode(source);
  const text = new TextDecoder().decode(bytes);
  const session = new Session({ registry, workerUrl: WORKER, dir: new URL(".", docUrl).pathname });
  try {
    const started = Date.now();
    const report = await session.run(text);
    const input = await gatherRecord({
      path: "fade.md",
      bytes,
      source: text,
      report,
      startedMs: started,
      durationMs: Date.now() - started,
      sourceDateEpoch: epoch,
    });
    return renderRecord(input);
  } finally {
    session.close();
  }
}

/** Every URL-bearing place of the markup and its CSS. */
function urls(html: string): string[] {
  const { document } = parseHTML(html);
  const out: string[] = [];
  for (const el of document.querySelectorAll("*")) {
    for (const a of ["src", "href", "xlink:href", "action", "poster", "data"]) {
      const v = el.getAttribute(a);
      if (v !== null) out.push(v);
    }
  }
  for (const m of html.matchAll(/url\(\s*['"]?([^'")]*)/g)) out.push(m[1]);
  for (const m of html.matchAll(/@import\s+(?:url\()?['"]?([^'");\s]*)/g)) out.push(m[1]);
  return out;
}

Deno.test("record of the demo: no script, no handler, nothing fetched, charts as SVG", async () => {
  const html = await record(DEMO);
  const { document } = parseHTML(html);
  equal(document.querySelectorAll("script").length, 0);
  const handlers = [...document.querySelectorAll("*")].flatMap((el) =>
    [...el.attributes].filter((a) => /^on/i.test(a.name)).map((a) => `${el.tagName} ${a.name}`)
  );
  equal(handlers.length, 0, handlers.join(", "));
  const external = urls(html).filter((u) => !u.startsWith("#"));
  equal(external.length, 0, external.join(", "));
  const figures = document.querySelectorAll("figure.plumb-chart-figure");
  ok(figures.length >= 1, "the demo has charts");
  for (const f of figures) ok(f.querySelector("svg") !== null, "every chart is an <svg>");
  match(html, new RegExp(CAUTION.slice(0, 40)));
});

Deno.test("record of the demo: provenance hashes are the files' own, exclusions with reasons", async () => {
  const html = await record(DEMO);
  const data = await sha256Hex(await Deno.readFile(new URL("data/batch7.csv", DEMO)));
  const doc = await sha256Hex(await Deno.readFile(DEMO));
  const { document } = parseHTML(html);
  const hashes = [...document.querySelectorAll(".pl-record-provenance .pl-hash")].map((e) =>
    e.textContent
  );
  ok(hashes.includes(doc), `document hash ${doc} in ${hashes}`);
  ok(hashes.includes(data), `data hash ${data} in ${hashes}`);
  match(html, /thermocouple came loose/);
  match(document.querySelector(".pl-record-provenance")!.textContent!, /rows read, \d+ used/);
  equal(document.querySelector("#banner"), null, "the demo computes: no banner");
});

Deno.test("record banner lists a failed and a held cell", async () => {
  const source = (await Deno.readTextFile(DEMO)).replace(
    "model: capacity = q0 - a*sqrt(cycle)",
    "model: capacity = q0 - a*sqrt(cylce)",
  ) + "\nThe root law reads $q = q_0 - a\\sqrt{n}$.\n";
  const html = await record(DEMO, source);
  const { document } = parseHTML(html);
  ok(document.querySelector(".pl-record-prose math") !== null, "math typeset as MathML at export");
  const banner = document.querySelector("#banner");
  ok(banner !== null, "a banner");
  match(banner!.textContent!, /fit “root” failed/);
  match(banner!.textContent!, /was not computed \(an input failed\)/);
});

Deno.test("record bytes are the same for the same inputs with SOURCE_DATE_EPOCH", async () => {
  const a = await record(DEMO, undefined, "1767225600");
  const b = await record(DEMO, undefined, "1767225600");
  equal(a, b);
  match(a, /2026-01-01T00:00:00Z/);
  ok(!/\d+ ms\b/.test(parseHTML(a).document.querySelector("#provenance")!.textContent!));
});

Deno.test("record: a view that cannot draw its result costs only that result", () => {
  const cell = (name: string, kind: string, result: unknown) => ({
    name,
    kind,
    line: 1,
    state: "current" as const,
    error: null,
    warnings: [],
    result,
    summaryLine: null,
    ms: 0,
    cached: false,
  });
  const html = renderRecord({
    title: "Broken view",
    document: { path: "x.md", sha256: "0".repeat(64), bytes: 1 },
    blocks: [
      { type: "cell", name: "c", kind: "check", line: 1, body: "fit: f\n" },
      { type: "prose", line: 5, text: "After the cell." },
    ],
    cells: [cell("c", "check", { findings: null })],
    errors: [],
    files: [],
    settings: {
      title: "Broken view",
      confidence: 0.95,
      seed: 1,
      criterion: "aicc",
      maxFileBytes: 1,
      extra: {},
    },
    versions: { plumb: "0", deno: "0", v8: "0", os: "test" },
    run: { utc: "2026-01-01T00:00:00Z", ms: null, reproducible: true },
  });
  match(html, /This result could not be drawn in the record: /);
  match(html, /After the cell\./);
  match(html, /id="provenance"/);
});

Deno.test("record of page copies says which per-row values it leaves out", async () => {
  const bytes = await Deno.readFile(DEMO);
  const text = new TextDecoder().decode(bytes);
  const session = new Session({
    registry,
    workerUrl: WORKER,
    dir: new URL(".", DEMO).pathname,
    page: true,
  });
  try {
    const report = await session.run(text);
    const html = renderRecord(
      await gatherRecord({
        path: "fade.md",
        bytes,
        source: text,
        report,
        startedMs: 0,
        durationMs: 0,
      }),
    );
    match(html, /Per-row values not shown in this record: fitted, residuals/);
  } finally {
    session.close();
  }
});
