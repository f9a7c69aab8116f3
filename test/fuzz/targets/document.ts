/**
 * Target "document": whole document texts through the document layer
 * (parseDocument, writeDocument, readSettings, parseOptions of every cell,
 * findInlineRefs of every prose block, replaceCellBody with the same body).
 * Nothing may throw; every error is a LocatedError inside the document; the
 * text written back is the text read ("nothing lost").
 *
 * @module
 */
import {
  findInlineRefs,
  lineColumnAt,
  type ParsedDocument,
  parseDocument,
  parseOptions,
  readSettings,
  replaceCellBody,
  writeDocument,
} from "../../../kernel/document/mod.ts";
import { LocatedError } from "../../../kernel/errors.ts";
import { checkPos, Defect, located, uncaught } from "../_oracle.ts";
import { mutate } from "../_mutate.ts";
import type { Target } from "./_target.ts";
import { assembleDocument } from "./_assemble.ts";

/** Checks a list of errors that must be LocatedErrors inside the document. */
export function checkErrors(errors: readonly unknown[], lines: number): void {
  for (const e of errors) {
    located(e instanceof LocatedError, `Not a LocatedError: ${String(e)}`);
    const le = e as LocatedError;
    checkPos(le.pos, lines, le.message);
  }
}

/** Calls `fn`, turning anything it throws into an "uncaught" defect. */
export function guard<T>(during: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    throw uncaught(err, during);
  }
}

/** replaceCellBody with a cell's own body gives the document back, where that is promised. */
function sameBodyRoundTrip(doc: ParsedDocument): void {
  const seen = new Set<string>();
  for (const b of doc.blocks) {
    if (b.type !== "cell" || seen.has(b.name)) continue;
    seen.add(b.name);
    const eol = /\r\n|\r|\n/.exec(doc.source.slice(b.bodyStart - 2, b.bodyStart))?.[0];
    const endings = b.body.match(/\r\n|\r|\n/g) ?? [];
    const plain = b.error === null && eol !== undefined && endings.every((x) => x === eol) &&
      (b.body === "" || b.body.endsWith(eol));
    if (!plain) continue;
    const out = guard("replaceCellBody", () => replaceCellBody(doc, b.name, b.body));
    if (out !== doc.source) {
      throw new Defect("lost", `replaceCellBody of "${b.name}" with its own body changed the text`);
    }
  }
}

function checkDocument(source: string): void {
  const doc = guard("parseDocument", () => parseDocument(source));
  if (guard("writeDocument", () => writeDocument(doc)) !== source) {
    throw new Defect("lost", "writeDocument(parseDocument(text)) is not the text");
  }
  const lines = lineColumnAt(doc, source.length).line;
  checkErrors(doc.errors, lines);
  checkErrors(guard("readSettings", () => readSettings(doc)).errors, lines);
  for (const b of doc.blocks) {
    if (b.type === "prose") {
      checkErrors(guard("findInlineRefs", () => findInlineRefs(b)).errors, lines);
      continue;
    }
    const opts = guard("parseOptions", () => parseOptions(b, doc));
    checkErrors(opts.errors, lines);
    for (const key of Object.keys(opts.options).slice(0, 20)) {
      checkPos(guard("locate", () => opts.locate([key], 1)), lines, `locate(["${key}"])`);
    }
  }
  sameBodyRoundTrip(doc);
}

/** The document target. */
export const documentTarget: Target<string> = {
  name: "document",
  about: "document texts through parse, write, settings, options, inline references",
  make(rng, corpus) {
    const r = rng.next();
    if (r < 0.45) return mutate(rng.pick(corpus.documents), rng, corpus.documents, 5);
    if (r < 0.9) return assembleDocument(rng, corpus);
    return mutate(assembleDocument(rng, corpus), rng, corpus.documents, 3);
  },
  check: checkDocument,
  text: (s) => s,
  withText: (_s, t) => t,
};
