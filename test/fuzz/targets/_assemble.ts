/**
 * Documents built from parts: front matter, prose with inline references and
 * math, cells with every fence shape and near-miss info strings, prose
 * fences, nesting hundreds deep, thousands of repeated cells, very long
 * lines, odd Unicode and mixed line ends.
 *
 * @module
 */
import type { Corpus } from "../_corpus.ts";
import { lineEnd, longLine, name, nest, ODD_UNICODE, spice } from "../_generators.ts";
import type { Rng } from "../_rng.ts";
import { MAX_TEXT } from "../_mutate.ts";

const KINDS = ["table", "fit", "compare", "check", "predict", "chart", "calc", "Fit", "fti"];

/** An info string: `<kind> <name>` or a near miss of it. */
function infoString(rng: Rng): string {
  const kind = rng.pick(KINDS), n = name(rng);
  if (rng.chance(0.7)) return `${kind} ${n}`;
  return rng.pick([
    `${kind}  ${n}`,
    `${kind}\t${n}`,
    ` ${kind} ${n} `,
    `${kind} ${n} extra`,
    `${kind}-${n}`,
    `${kind} ${n}\`\`\``,
    `${kind}`,
    `${kind} ${n}{.x}`,
    `${kind}${rng.pick(ODD_UNICODE)} ${n}`,
    `${kind} ${rng.pick(ODD_UNICODE)}`,
  ]);
}

/** A fenced block: random fence character, length, indent; cell or prose fence. */
function fence(rng: Rng, corpus: Corpus, eol: string): string {
  const ch = rng.chance(0.75) ? "`" : "~";
  const len = rng.chance(0.8) ? 3 : rng.between(3, rng.chance(0.9) ? 6 : 2000);
  const indent = " ".repeat(rng.chance(0.85) ? 0 : rng.int(5));
  const info = rng.chance(0.85) ? infoString(rng) : rng.pick(["", "js", "yaml", "math"]);
  const body = rng.chance(0.7) ? rng.pick(corpus.bodies).body : spice(rng) + eol;
  const close = rng.chance(0.85) ? indent + ch.repeat(len + (rng.chance(0.1) ? 1 : 0)) : "";
  return `${indent}${ch.repeat(len)}${info}${eol}${body.replace(/\n/g, eol)}${close}${eol}`;
}

/** A prose paragraph with words, an inline reference, math, spice. */
function prose(rng: Rng, eol: string): string {
  const parts = ["Capacity", "fades", "by", "@(root.r2, 3)", "$x^2$", "$$\\frac{a}{b}$$", "*a*"];
  const words: string[] = [];
  for (let i = rng.size(30); i > 0; i--) {
    words.push(rng.chance(0.8) ? rng.pick(parts) : spice(rng));
  }
  if (rng.chance(0.1)) {
    words.push(`@(${name(rng)}.${name(rng)}, ${rng.pick(["3", "-1", "1e9", ""])})`);
  }
  return words.join(" ") + eol + eol;
}

/** Hostile structure: deep nesting, repetition, one very long line. */
function hostile(rng: Rng, corpus: Corpus, eol: string): string {
  const depth = rng.size(3000);
  switch (rng.int(6)) {
    case 0:
      return nest("> ", "deep", "", depth) + eol;
    case 1:
      return nest("- ", "deep", "", Math.min(depth, 500)) + eol;
    case 2:
      return fence(rng, corpus, eol).repeat(rng.size(3000));
    case 3:
      return longLine(rng, rng.size(200_000)) + eol;
    case 4:
      return nest("[", "x", "]", depth) + eol;
    default:
      return `@(${"a.".repeat(depth)}b, 3)${eol}`;
  }
}

/**
 * A document assembled from parts.
 *
 * @param rng The input's generator.
 * @param corpus Cell bodies come from here.
 * @returns The document text.
 */
export function assembleDocument(rng: Rng, corpus: Corpus): string {
  const mixed = rng.chance(0.2);
  const fixed = lineEnd(rng);
  const eol = () => (mixed ? lineEnd(rng) : fixed);
  let out = rng.chance(0.1) ? "\uFEFF" : "";
  if (rng.chance(0.4)) {
    const fm = rng.pick([
      "title: T",
      "confidence: 0.9",
      "seed: 7",
      "confidence: .nan",
      "__proto__: 1",
    ]);
    out += `---${eol()}${fm}${eol()}${rng.chance(0.9) ? "---" : ""}${eol()}`;
  }
  for (let n = rng.size(25); n > 0; n--) {
    const r = rng.next();
    if (r < 0.45) out += fence(rng, corpus, eol());
    else if (r < 0.9) out += prose(rng, eol());
    else out += hostile(rng, corpus, eol());
  }
  return out.slice(0, MAX_TEXT);
}
