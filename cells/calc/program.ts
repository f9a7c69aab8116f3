/**
 * The two modules made from a calc cell's code: one to type-check, with
 * declarations generated from its inputs' shapes, and one to run, which
 * binds the inputs and each fit's `evaluate`. In both the code is the body of
 * the default export, one line below its head in the run module.
 *
 * ```
 *  check module                              run module
 *  ─────────────                             ──────────
 *  type CalcData = …                         export default async function (__in) { const power = …;
 *  declare const power: { readonly r2: …;    <code, line 1>
 *    evaluate(at: …): number; … };           …
 *  export default async function          }
 *    (): Promise<CalcData> {
 *  <code, line 1>
 *  }
 * ```
 *
 * Declarations follow the data, not its values, so code whose inputs changed
 * value but not shape needs no second check (kernel/sandbox/check.ts keeps
 * checks by the module's digest).
 *
 * @module
 */
import type { Expr } from "../../kernel/expr/mod.ts";
import { CONSTANTS, FUNCTIONS } from "../../kernel/expr/mod.ts";
import type { CalcSpec } from "./spec.ts";

/** One input as the code sees it: its data and, for a fit, its model. */
export interface CalcInputData {
  as: string;
  data: unknown;
  /** A fit's model: right side, columns, parameters (for `evaluate`). */
  model?: { rhs: Expr; columns: string[]; parameters: string[] };
}

const DATA_TYPES = `type CalcData =
  | null | boolean | number | string | Float64Array
  | readonly CalcData[]
  | { readonly [key: string]: CalcData };
interface CalcTable {
  columns: { readonly [name: string]: ArrayLike<number | null> };
  units?: { readonly [name: string]: string };
}`;

/** Distinct element types an array's declaration lists before it gives up (`unknown`). */
const MAX_UNION = 6;

/**
 * The TypeScript type of a value as it crosses into the sandbox.
 *
 * @param v Plain data, Float64Array where arrays travel as such.
 * @param depth Nesting so far (deep values are `unknown`).
 * @returns The type's text.
 * @example
 * ```ts
 * import { typeOf } from "./program.ts";
 * const t = typeOf({ n: 3, ci: [1, 2], f: new Float64Array(2), s: null });
 * if (t !== '{ readonly "n": number; readonly "ci": readonly number[]; readonly "f": Float64Array; readonly "s": null }') throw new Error(t);
 * ```
 */
export function typeOf(v: unknown, depth = 0): string {
  if (v === null) return "null";
  if (typeof v === "number") return "number";
  if (typeof v === "string") return "string";
  if (typeof v === "boolean") return "boolean";
  if (v instanceof Float64Array) return "Float64Array";
  if (depth > 12 || typeof v !== "object") return "unknown";
  if (Array.isArray(v)) {
    const shape = sameKeys(v);
    if (shape !== null) {
      return `readonly ${mergedObject(v as Record<string, unknown>[], shape, depth)}[]`;
    }
    const kinds: string[] = [];
    for (const x of v) {
      const t = typeOf(x, depth + 1);
      if (!kinds.includes(t)) kinds.push(t);
      if (kinds.length > MAX_UNION) return "readonly unknown[]";
    }
    if (kinds.length === 0) return "readonly never[]";
    return kinds.length === 1 && !kinds[0].includes(" ")
      ? `readonly ${kinds[0]}[]`
      : `readonly (${kinds.join(" | ")})[]`;
  }
  const fields = Object.keys(v).map((k) =>
    `readonly ${JSON.stringify(k)}: ${typeOf((v as Record<string, unknown>)[k], depth + 1)}`
  );
  return fields.length === 0 ? "{}" : `{ ${fields.join("; ")} }`;
}

/** The keys every element has, when the array holds two or more plain objects with the same keys. */
function sameKeys(v: unknown[]): string[] | null {
  if (v.length < 2) return null;
  let keys: string[] | null = null;
  for (const x of v) {
    if (x === null || typeof x !== "object" || Array.isArray(x) || x instanceof Float64Array) {
      return null;
    }
    const k = Object.keys(x);
    if (keys === null) keys = k;
    else if (k.length !== keys.length || k.some((name, i) => name !== keys![i])) return null;
  }
  return keys;
}

/** One object type for objects of the same keys, each field the union of its types. */
function mergedObject(v: Record<string, unknown>[], keys: string[], depth: number): string {
  const fields = keys.map((k) => {
    const kinds: string[] = [];
    for (const x of v) {
      const t = typeOf(x[k], depth + 2);
      if (!kinds.includes(t)) kinds.push(t);
    }
    const t = kinds.length > MAX_UNION ? "unknown" : kinds.join(" | ");
    return `readonly ${JSON.stringify(k)}: ${t}`;
  });
  return `{ ${fields.join("; ")} }`;
}

function record(names: readonly string[], type: string, optional = false): string {
  return names.length === 0
    ? "{}"
    : `{ ${
      names.map((n) => `readonly ${JSON.stringify(n)}${optional ? "?" : ""}: ${type}`).join("; ")
    } }`;
}

/** The declaration of one input. */
function declaration(input: CalcInputData): string {
  const base = typeOf(input.data);
  if (!input.model) return `declare const ${input.as}: ${base};`;
  const { columns, parameters } = input.model;
  const extra = `{ readonly estimates: ${record(parameters, "number")}; ` +
    `evaluate(at: ${record(columns, "number")}, estimates?: ${
      record(parameters, "number", true)
    }): number }`;
  return `declare const ${input.as}: ${base === "{}" ? "" : `${base} & `}${extra};`;
}

/**
 * The module to type-check and the line its code starts on.
 *
 * @param spec The cell's spec.
 * @param inputs Its inputs' data.
 * @returns The module's text and the 1-based line of the code's first line.
 */
export function checkModule(spec: CalcSpec, inputs: readonly CalcInputData[]): {
  text: string;
  firstLine: number;
} {
  const head = [
    DATA_TYPES,
    ...inputs.map(declaration),
    `export default async function __calc(): Promise<${
      spec.gives === "table" ? "CalcTable" : "CalcData"
    }> {`,
  ].join("\n");
  const firstLine = head.split("\n").length + 1;
  return { text: `${head}\n${spec.code}\n}\n`, firstLine };
}

/** JavaScript for a model's right side over `at` (columns) and `p` (parameters). */
function modelJs(e: Expr, columns: ReadonlySet<string>): string {
  switch (e.op) {
    case "num":
      return Number.isFinite(e.value) ? `(${String(e.value)})` : String(e.value);
    case "id":
      if (columns.has(e.name)) return `(+at[${JSON.stringify(e.name)}])`;
      if (CONSTANTS.has(e.name)) return `(${String(CONSTANTS.get(e.name))})`;
      return `p[${JSON.stringify(e.name)}]`;
    case "neg":
      return `(-${modelJs(e.arg, columns)})`;
    case "call": {
      const f = FUNCTIONS.get(e.fn);
      if (!f) return "NaN";
      return `(${f.js(e.args.map((a) => modelJs(a, columns)))})`;
    }
    case "^":
      return `Math.pow(${modelJs(e.left, columns)}, ${modelJs(e.right, columns)})`;
    default:
      return `(${modelJs(e.left, columns)} ${e.op} ${modelJs(e.right, columns)})`;
  }
}

/**
 * The module to run: the code as the body of the default export, which binds
 * each input (and each fit's `evaluate`) on the line above the code.
 *
 * @param spec The cell's spec.
 * @param inputs Its inputs' models (the data comes as the export's argument).
 * @returns The module's text; the code starts on line 2.
 */
export function runModule(spec: CalcSpec, inputs: readonly CalcInputData[]): string {
  const binds = inputs.map((i) => `const ${i.as} = __in[${JSON.stringify(i.as)}];`);
  for (const i of inputs) {
    if (!i.model) continue;
    const body = modelJs(i.model.rhs, new Set(i.model.columns));
    binds.push(
      `${i.as}.evaluate = (at: any, estimates?: any) => { ` +
        `const p = { ...${i.as}.estimates, ...(estimates ?? {}) }; return ${body}; };`,
    );
  }
  // The head stays on one line, so code line k is module line k + 1; the code
  // runs in a function of its own, so it may shadow an input's name.
  return `export default async function __calc(__in: any) { ${binds.join(" ")} ` +
    `return await (async () => {\n${spec.code}\n})(); }\n`;
}
