/**
 * A snapshot of the record of a small document with inline, invented data:
 * the whole HTML, numbers rounded to two decimals, ids renumbered and the
 * software line (which names this machine's Deno and OS) replaced, so the
 * snapshot changes only when the record's content or look does. A
 * mismatch writes `record-small-changed.html` beside the snapshot; a
 * missing snapshot is written (except under CI=true).
 */
import { normalizeSvg } from "../../ui/charts/_snapshot.ts";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import { gatherRecord, renderRecord } from "../../ui/record/mod.ts";

const F = "```";
const DOC = `---
title: Spring constant, bench test 3
---

Invented readings: extension of a spring under known loads.

${F}table loads
columns: [load, extension]
units: { load: N, extension: mm }
rows:
  - [1, 2.1]
  - [2, 4.0]
  - [3, 6.2]
  - [4, 7.9]
  - [5, 10.1]
  - [6, 11.8]
${F}

${F}fit hooke
on: loads
model: extension = c + k*load
${F}

The compliance is @(hooke.k, 3) mm/N.

${F}predict at-7
fit: hooke
at: { load: 7 }
${F}

${F}chart spring
on: loads
x: load
y: extension
fits: [hooke]
${F}
`;

const SNAPSHOT = new URL("../snapshots/record-small.html", import.meta.url);

function normalize(html: string): string {
  return normalizeSvg(
    html.replace(/Plumb [^;<]+; Deno [^<]+/, "Plumb (version); Deno (version); (system)"),
  ) + "\n";
}

Deno.test("record of a small document matches its snapshot", async () => {
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir: new URL(".", import.meta.url).pathname,
    page: true,
  });
  let html: string;
  try {
    const report = await session.run(DOC);
    html = renderRecord(
      await gatherRecord({
        path: "spring.md",
        bytes: new TextEncoder().encode(DOC),
        source: DOC,
        report,
        startedMs: 0,
        durationMs: 0,
        sourceDateEpoch: "1767225600",
      }),
    );
  } finally {
    session.close();
  }
  const actual = normalize(html);
  const changed = new URL(SNAPSHOT.href.replace(/\.html$/, "-changed.html"));
  let expected: string | null = null;
  try {
    expected = await Deno.readTextFile(SNAPSHOT);
  } catch (e) {
    if (!(e instanceof Deno.errors.NotFound)) throw e;
  }
  if (expected === null) {
    if (Deno.env.get("CI") === "true") {
      throw new Error(`Snapshot "${SNAPSHOT.pathname}" is missing`);
    }
    await Deno.writeTextFile(SNAPSHOT, actual);
    return;
  }
  if (expected === actual) {
    await Deno.remove(changed).catch(() => {});
    return;
  }
  await Deno.writeTextFile(changed, actual);
  throw new Error(`Snapshot "${SNAPSHOT.pathname}" differs: see "${changed.pathname}"`);
});
