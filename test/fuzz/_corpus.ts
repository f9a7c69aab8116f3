/**
 * The seed corpus: valid (and deliberately awkward) documents the project
 * already keeps, the data files beside the examples, and the cell bodies and
 * model texts found in them. Mutations start from these.
 *
 * @module
 */
import { join } from "node:path";
import { parseDocument } from "../../kernel/document/mod.ts";

/** What the generators start from. */
export interface Corpus {
  /** Whole documents: test/corpus/documents and examples/. */
  documents: string[];
  /** Data files (CSV) from examples/. */
  csv: string[];
  /** Cell bodies (YAML options) with their kinds. */
  bodies: { kind: string; body: string }[];
  /** Model texts (`y = …`) and right sides found in the documents. */
  models: string[];
}

const ROOT = new URL("../../", import.meta.url);

function filesUnder(dir: string, ends: string): string[] {
  const out: string[] = [];
  for (const e of Deno.readDirSync(dir)) {
    const path = join(dir, e.name);
    if (e.isDirectory) out.push(...filesUnder(path, ends));
    else if (e.isFile && e.name.endsWith(ends)) out.push(path);
  }
  return out.sort();
}

/** Models that every generator may use besides those in the documents. */
const MORE_MODELS = [
  "y = a + b*x",
  "log(y) = a + b*log(x)",
  "y = polynomial(x, 3)",
  "y = linear(x, z)",
  "y = a*exp(-k*x) + c",
  "y = max(a, b*x) - min(c, x^2)",
  "sqrt(y) = pow(x, n)/(1 + tanh(x/s))",
  "y = q0 - a*x^b + polynomial(x, 2)",
];

let loaded: Corpus | null = null;

/**
 * Loads the corpus once (reads the repository; needs read permission).
 *
 * @returns The corpus, sorted so every run sees the same order.
 */
export function loadCorpus(): Corpus {
  if (loaded) return loaded;
  const documents = [
    ...filesUnder(join(ROOT.pathname, "test/corpus/documents"), ".txt"),
    ...filesUnder(join(ROOT.pathname, "examples"), ".md"),
  ].map((p) => Deno.readTextFileSync(p));
  const csv = filesUnder(join(ROOT.pathname, "examples"), ".csv").map((p) =>
    Deno.readTextFileSync(p)
  );
  const bodies: Corpus["bodies"] = [];
  const models = [...MORE_MODELS];
  for (const doc of documents) {
    for (const b of parseDocument(doc).blocks) {
      if (b.type !== "cell") continue;
      bodies.push({ kind: b.kind, body: b.body });
      for (const m of b.body.matchAll(/^(?:model|weights): (.+)$/gm)) models.push(m[1]);
    }
  }
  loaded = { documents, csv, bodies, models };
  return loaded;
}
