/**
 * Target "expr": expression texts through parseExpression,
 * parseColumnExpression and parseModel; what parses is simplified,
 * differentiated by each parameter, compiled (doubles and double-double) and
 * evaluated on a few rows, and printed by format and parsed again. Only an
 * ExprError with its offset inside the text may escape a parser; nothing may
 * escape the later stages; format's text parses back to the same text.
 *
 * @module
 */
import {
  compile,
  compileDD,
  derivative,
  type Expr,
  ExprError,
  format,
  freeNames,
  parseColumnExpression,
  parseExpression,
  parseModel,
  simplify,
} from "../../../kernel/expr/mod.ts";
import { Defect, located, uncaught } from "../_oracle.ts";
import { mutate } from "../_mutate.ts";
import { guard } from "./document.ts";
import type { Target } from "./_target.ts";
import { exprText, extremeText } from "./_expr_text.ts";

/** The text, how it is parsed, and the columns it may name. */
export interface ExprInput {
  text: string;
  mode: "expression" | "column" | "model";
  columns: string[];
}

const COLUMNS = ["x", "y", "z", "cycle", "capacity", "constructor"];

/** Parses by mode: the tree, its columns and parameters; null after an ExprError. */
function parse(input: ExprInput): { tree: Expr; columns: string[]; params: string[] } | null {
  const { text, mode, columns } = input;
  try {
    if (mode === "model") {
      const m = parseModel(text, columns);
      return { tree: m.rhs, columns: m.columns, params: m.parameters };
    }
    const tree = mode === "column" ? parseColumnExpression(text, columns) : parseExpression(text);
    const names = [...freeNames(tree)].filter((n) => n !== "pi" && n !== "e");
    const cols = mode === "column" ? names : [];
    return { tree, columns: cols, params: mode === "column" ? [] : names };
  } catch (err) {
    if (!(err instanceof ExprError)) throw uncaught(err, `parse (${mode})`);
    const inside = Number.isInteger(err.offset) && err.offset >= 0 &&
      err.offset + err.length <= text.length;
    located(inside, `ExprError at ${err.offset}+${err.length} of ${text.length}: ${err.message}`);
    return null;
  }
}

/** Compiles both ways and evaluates three rows. */
function evaluate(tree: Expr, columns: string[], params: string[]): void {
  const n = 3;
  const cols = columns.map((_, j) => Float64Array.from([0, 1.5 + j, -2]));
  const vals = params.map((_, k) => 0.5 + k);
  guard("compile", () => compile(tree, columns, params)(cols, vals, n));
  guard(
    "compileDD",
    () => compileDD(tree, columns, params)(cols, cols.map(() => null), vals, null, n),
  );
}

function checkExpr(input: ExprInput): void {
  const parsed = parse(input);
  if (parsed === null) return;
  const { tree, columns, params } = parsed;
  guard("simplify", () => simplify(tree));
  evaluate(tree, columns, params);
  for (const p of params.slice(0, 4)) {
    const d = guard("derivative", () => derivative(tree, p));
    evaluate(d, columns, params);
  }
  const printed = guard("format", () => format(tree));
  let again: string;
  try {
    again = format(parseExpression(printed));
  } catch (err) {
    throw new Defect("lost", `format's text does not parse: ${String(err).slice(0, 200)}`);
  }
  if (again !== printed) throw new Defect("lost", `format → parse → format changed the text`);
}

/** The expression language target. */
export const exprTarget: Target<ExprInput> = {
  name: "expr",
  about: "expression texts through the three parsers, simplify, derivative, compile, format",
  make(rng, corpus) {
    const mode = rng.pick(["expression", "column", "model"] as const);
    const r = rng.next();
    let text = r < 0.3
      ? mutate(rng.pick(corpus.models), rng, corpus.models, 3)
      : r < 0.88
      ? exprText(rng, rng.size(8))
      : extremeText(rng);
    if (mode === "model" && !text.includes("=")) text = `${rng.pick(["y", "log(y)"])} = ${text}`;
    return { text, mode, columns: rng.chance(0.9) ? COLUMNS : [] };
  },
  check: checkExpr,
  text: (i) => i.text,
  withText: (i, text) => ({ ...i, text }),
};
