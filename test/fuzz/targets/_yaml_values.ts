/**
 * YAML option bodies for a cell kind: its declared keys (and a few others)
 * with values of every YAML shape: scalars at the edge of the number
 * grammar, flow and block collections, anchors and aliases (an alias bomb
 * too), tags, block scalars, nesting thousands deep and tens of thousands of
 * keys.
 *
 * @module
 */
import { NUMBER_EDGES, ODD_UNICODE, PROTO_NAMES } from "../_generators.ts";
import type { Rng } from "../_rng.ts";

/** Values that mean something to the kinds: cell names, columns, models. */
const MEANINGFUL = [
  "data",
  "line",
  "x",
  "y",
  "z",
  "[line]",
  "[line, line]",
  "y = a + b*x",
  "y = a*exp(-k*x)",
  "{ x: [1, 2] }",
  "{ y: 3 }",
  "aicc",
  "bic",
  "loo",
  "koenker",
  "hc3",
  "true",
  "0.95",
  "[{ rows: [1], why: probe }]",
  "{ w: x^2 }",
  "x > 1",
  "{ a: [0, null] }",
];

/** A scalar: meaningful, a number edge, a prototype name, odd text, quoted. */
function scalar(rng: Rng): string {
  const r = rng.next();
  if (r < 0.4) return rng.pick(MEANINGFUL);
  if (r < 0.6) return rng.pick(NUMBER_EDGES);
  if (r < 0.7) return rng.pick(PROTO_NAMES);
  if (r < 0.8) return JSON.stringify(rng.pick(ODD_UNICODE) + "x");
  if (r < 0.9) {
    return rng.pick([
      "~",
      "null",
      "''",
      '""',
      "!!binary aGk=",
      "!!timestamp 2001-12-14",
      "!!js/undefined",
      "!!int 0x1F",
      "!!float .inf",
      "yes",
      "2001-12-14",
    ]);
  }
  return String(rng.next() * 10 ** rng.between(-10, 10));
}

/** A value: a scalar, or a flow or block collection, `depth` levels at most. */
export function yamlValue(rng: Rng, depth: number, indent: string): string {
  if (depth <= 0 || rng.chance(0.55)) return scalar(rng);
  const n = rng.size(6);
  const items = Array.from({ length: n }, () => yamlValue(rng, depth - 1, indent + "  "));
  switch (rng.int(4)) {
    case 0:
      return `[${items.join(", ")}]`;
    case 1:
      return `{ ${items.map((v, i) => `${rng.pick(MAPKEYS)}${i}: ${v}`).join(", ")} }`;
    case 2:
      return items.map((v) => `\n${indent}- ${v.replace(/^\n\s*/, "")}`).join("");
    default:
      return `|\n${items.map((v) => `${indent}  ${v.replace(/\n/g, " ")}`).join("\n")}`;
  }
}

const MAPKEYS = ["k", "x", "rows", "why", "__proto__", "constructor", "q"];

/** A hostile body: alias bomb, deep flow nesting, many keys, repeated keys, merges. */
export function hostileBody(rng: Rng, keys: readonly string[]): string {
  switch (rng.int(6)) {
    case 0: {
      const lines = ['a0: &a0 ["x", "x", "x", "x", "x", "x", "x", "x", "x"]'];
      for (let i = 1; i < rng.between(3, 10); i++) {
        lines.push(`a${i}: &a${i} [${Array(9).fill(`*a${i - 1}`).join(", ")}]`);
      }
      return lines.join("\n") + "\n";
    }
    case 1: {
      const d = rng.size(5000);
      return `${rng.pick(keys)}: ${"[".repeat(d)}1${"]".repeat(d)}\n`;
    }
    case 2: {
      const n = rng.chance(0.05) ? rng.between(20_000, 60_000) : rng.size(5000);
      return Array.from({ length: n }, (_, i) => `k${i}: ${i}`).join("\n") + "\n";
    }
    case 3:
      return `base: &b { ${keys.slice(0, 3).map((k) => `${k}: 1`).join(", ")} }\n<<: *b\n`;
    case 4:
      return `${rng.pick(keys)}: 1\n${rng.pick(keys)}: 2\n__proto__: { polluted: true }\n`;
    default: {
      const d = rng.size(3000);
      let out = "";
      for (let i = 0; i < d; i++) out += `${" ".repeat(i)}k:\n`;
      return out + `${" ".repeat(d)}v\n`;
    }
  }
}
