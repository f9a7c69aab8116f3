/**
 * Target "yaml": option bodies of every kind, read as YAML with positions
 * (parseOptions) and parsed into specs by the kinds (buildGraph with the
 * product's registry, the path a run takes before any cell computes). Every
 * problem must be a LocatedError inside the document, never an "Internal
 * error", and nothing may throw.
 *
 * @module
 */
import { registry } from "../../../cells/mod.ts";
import { lineColumnAt, parseDocument, parseOptions } from "../../../kernel/document/mod.ts";
import { readSettings } from "../../../kernel/document/mod.ts";
import { buildGraph } from "../../../kernel/graph/build.ts";
import { Defect } from "../_oracle.ts";
import { mutate } from "../_mutate.ts";
import { PROTO_NAMES } from "../_generators.ts";
import { checkErrors, guard } from "./document.ts";
import type { Target } from "./_target.ts";
import { hostileBody, yamlValue } from "./_yaml_values.ts";

/** An option body for one cell of `kind`. */
export interface YamlInput {
  kind: string;
  body: string;
}

/** A table and a fit the subject cell can name. */
const PREFIX = "```table data\ncolumns: [x, y, z]\n" +
  "rows: [[1, 2.1, 3], [2, 3.9, 1], [3, 6.2, 4], [4, 7.8, 1], [5, 10.1, 5]]\n```\n\n" +
  "```fit line\non: data\nmodel: y = a + b*x\n```\n\n";

/** The document a body is checked in. */
export function yamlDocument(input: YamlInput): string {
  const body = input.body.endsWith("\n") || input.body === "" ? input.body : input.body + "\n";
  return `${PREFIX}\`\`\`\`${input.kind} subject\n${body}\`\`\`\`\n`;
}

function makeBody(rng: Parameters<Target["make"]>[0], kind: string): string {
  const keys = [...Object.keys(registry.get(kind)?.options ?? {}), ...PROTO_NAMES.slice(0, 3)];
  if (rng.chance(0.12)) return hostileBody(rng, keys);
  const lines: string[] = [];
  for (let n = rng.size(8); n > 0; n--) {
    lines.push(`${rng.pick(keys)}: ${yamlValue(rng, rng.size(4), "  ")}`);
  }
  return lines.join("\n") + "\n";
}

function checkYaml(input: YamlInput): void {
  const source = yamlDocument(input);
  const doc = guard("parseDocument", () => parseDocument(source));
  const lines = lineColumnAt(doc, source.length).line;
  const cell = doc.blocks.findLast((b) => b.type === "cell");
  if (cell?.type === "cell") {
    checkErrors(guard("parseOptions", () => parseOptions(cell, doc)).errors, lines);
  }
  const { settings } = readSettings(doc);
  const graph = guard("buildGraph", () => buildGraph(doc, registry, settings));
  const errors = graph.nodes.map((n) => n.error).filter((e) => e !== null);
  checkErrors(errors, lines);
  for (const e of errors) {
    if (e.message.startsWith("Internal error")) {
      throw new Defect("internal", e.message.slice(0, 300));
    }
  }
}

/** The YAML options target. */
export const yamlTarget: Target<YamlInput> = {
  name: "yaml",
  about: "cell option bodies through parseOptions and every kind's parse (buildGraph)",
  make(rng, corpus) {
    const kinds = [...registry.keys()];
    if (rng.chance(0.35)) {
      const b = rng.pick(corpus.bodies);
      return { kind: b.kind, body: mutate(b.body, rng, corpus.bodies.map((x) => x.body), 4) };
    }
    const kind = rng.pick(kinds);
    return { kind, body: makeBody(rng, kind) };
  },
  check: checkYaml,
  text: (i) => i.body,
  withText: (i, body) => ({ ...i, body }),
};
