/**
 * Target "run": whole documents and their data files through a Session with
 * the product's kinds and compute worker, the path `plumb run` takes (and
 * its RUN-JSON and human summaries). The run must finish; every failed cell
 * and every document error must carry a line and column inside the
 * document; no cell may answer "Internal error", lose its worker, or show
 * code's insides (a stack frame, a module URL, "[object Object]").
 *
 * One session serves many inputs (its cache keys on content, so results do
 * not depend on what ran before); data files are written before each run
 * and the session's file cache is forgotten.
 *
 * @module
 */
import { dirname, join } from "node:path";
import { registry } from "../../../cells/mod.ts";
import { runJson } from "../../../kernel/cli/run.ts";
import { formatHuman } from "../../../kernel/cli/format_human.ts";
import { parseDocument } from "../../../kernel/document/mod.ts";
import { lineColumnAt } from "../../../kernel/document/mod.ts";
import { Session } from "../../../kernel/session/session.ts";
import { checkPos, Defect, uncaught } from "../_oracle.ts";
import { mutate } from "../_mutate.ts";
import type { Target } from "./_target.ts";
import { dataCsv, runDocument } from "./_run_docs.ts";

/** A document and the files beside it (path → text). */
export interface RunInput {
  doc: string;
  files: Record<string, string>;
}

const WORKER = new URL("../../../cells/worker.ts", import.meta.url);
let open: { session: Session; dir: string } | null = null;

function session(): { session: Session; dir: string } {
  if (open) return open;
  const dir = Deno.makeTempDirSync({ prefix: "plumb-fuzz-" });
  open = { session: new Session({ registry, workerUrl: WORKER, dir, workers: 1 }), dir };
  return open;
}

function writeFiles(dir: string, files: Record<string, string>): void {
  for (const [path, text] of Object.entries(files)) {
    Deno.mkdirSync(dirname(join(dir, path)), { recursive: true });
    Deno.writeTextFileSync(join(dir, path), text);
  }
}

const PROBLEM = /^Internal error|The compute worker stopped/;
/** Code's insides in a message: a stack frame or a module URL. */
const LEAK = /\n\s+at |file:\/\/|\[object Object\]/;

async function checkRun(input: RunInput): Promise<void> {
  const { session: s, dir } = session();
  writeFiles(dir, input.files);
  s.files.forget();
  let report;
  try {
    report = await s.run(input.doc);
  } catch (err) {
    throw uncaught(err, "Session.run");
  }
  const lines = lineColumnAt(parseDocument(input.doc), input.doc.length).line;
  for (const e of report.errors) checkPos(e, lines, e.message);
  for (const c of report.cells) {
    if (c.state !== "failed") continue;
    if (c.error === null) throw new Defect("unlocated", `Cell "${c.name}" failed with no error`);
    checkPos(c.error, lines, c.error.message);
    if (PROBLEM.test(c.error.message)) throw new Defect("internal", c.error.message.slice(0, 300));
    if (LEAK.test(c.error.message)) throw new Defect("internal", `Leaks code: ${c.error.message}`);
  }
  try {
    JSON.stringify(runJson("doc.md", report), (_k, v) => ArrayBuffer.isView(v) ? [] : v);
    formatHuman("doc.md", report);
  } catch (err) {
    throw uncaught(err, "runJson/formatHuman");
  }
}

/** The whole-document target. */
export const runTarget: Target<RunInput> = {
  name: "run",
  about: "whole documents with data files through Session.run (the plumb run path)",
  make(rng, corpus): RunInput {
    const fade = corpus.documents.find((d) => d.includes("data/batch7.csv")) ?? "";
    const batch7 = corpus.csv[0] ?? "x\n1\n";
    const r = rng.next();
    if (r < 0.25) {
      const doc = mutate(fade, rng, corpus.documents, 3);
      const data = rng.chance(0.3) ? mutate(batch7, rng, corpus.csv, 2) : batch7;
      return { doc, files: { "data/batch7.csv": data } };
    }
    const doc = runDocument(rng);
    return {
      doc: r < 0.85 ? doc : mutate(doc, rng, corpus.documents, 2),
      files: { "d.csv": rng.chance(0.9) ? dataCsv(rng) : mutate(dataCsv(rng), rng, corpus.csv, 2) },
    };
  },
  check: checkRun,
  text: (i) => i.doc,
  withText: (i, doc) => ({ ...i, doc }),
  close() {
    if (!open) return;
    open.session.close();
    Deno.removeSync(open.dir, { recursive: true });
    open = null;
  },
};
