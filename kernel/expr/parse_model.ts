/**
 * Parsing a model equation `response = expression`.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { CONSTANTS } from "./functions.ts";
import { at, type Token, tokenize } from "./_lexer.ts";
import { Parser } from "./_parser.ts";
import { identifiers, type IdNode, likelyColumn, rejectBareFunction } from "./_identifiers.ts";
import { expandShorthands } from "./_shorthands.ts";
import { checkDepth } from "./_depth.ts";

/** A parsed and resolved model equation. */
export interface Model {
  /** The text as given. */
  text: string;
  /** The left side: one column, possibly transformed (`log(y)`, `1/y`). */
  response: Expr;
  /** The column the response is made of. */
  responseColumn: string;
  /** The right side, shorthands expanded (`polynomial(x, 2)` is `b0 + b1*x + b2*x^2` here). */
  rhs: Expr;
  /** Parameters of the right side, in first-appearance order. */
  parameters: string[];
  /** Columns used on the right side, in first-appearance order. */
  columns: string[];
  /** Things worth telling the user that are not errors, with offsets into `text`. */
  warnings: { message: string; offset: number }[];
}

const FORM = "a model is written response = expression";
const RESPONSE_FORM = "the left side is a column or a transformed column such as log(y)";

/**
 * Parses `response = expression` and sorts its identifiers: on the right,
 * names of `columns` are columns, `pi` and `e` are constants and every other
 * name is a parameter. A parameter of three or more characters one edit away
 * from a column name (or equal to it but for case) gets a warning (`"cylce" is taken as a parameter: did you mean column "cycle"?`).
 * The response must contain exactly one column and no parameters, and that
 * column may not appear on the right.
 *
 * The right side may use the shorthands `polynomial(x, d)` and
 * `linear(x1, x2, …)` (see the module notes of `mod.ts`); they are expanded
 * here, so `rhs` and `parameters` show the explicit terms while `text`
 * stays as written.
 *
 * @param text The model text.
 * @param columns Names of the columns of the table being fitted.
 * @returns The model.
 * @throws {ExprError} On syntax errors (see {@link parseExpression}), a
 *   missing or repeated `=`, a response that is not one (transformed)
 *   column, the response column used on the right, or a misused shorthand
 *   (a degree that is not a whole-number literal, an argument that is not a
 *   column, an unknown column).
 * @example
 * ```ts
 * import { parseModel } from "./mod.ts";
 * const m = parseModel("capacity = q0 - a*sqrt(cycle)", ["cycle", "capacity"]);
 * if (m.parameters.join() !== "q0,a" || m.columns.join() !== "cycle") throw new Error("bad");
 * ```
 */
export function parseModel(text: string, columns: readonly string[]): Model {
  const tokens = tokenize(text);
  const eq = splitAtEquals(text, tokens);
  const response = new Parser(tokens, 0, eq).parseAll();
  const parsed = new Parser(tokens, eq + 1, tokens.length - 1, true).parseAll();
  const { rhs, generated } = expandShorthands(parsed, columns, text);
  checkDepth(rhs);
  const responseColumn = checkResponse(text, response, columns);
  const parameters: string[] = [], used: string[] = [];
  const warnings: Model["warnings"] = [];
  const shadowed = new Set<string>();
  for (const node of identifiers(rhs)) {
    const name = node.name;
    if (CONSTANTS.has(name)) {
      if (columns.includes(name) && !shadowed.has(name)) {
        shadowed.add(name);
        warnings.push({
          message: `"${name}" is taken as the constant ${name}, not column "${name}"`,
          offset: node.start,
        });
      }
    } else if (columns.includes(name)) {
      if (name === responseColumn) {
        throw new ExprError(
          `Column "${name}" is the response and cannot appear on the right`,
          node.start,
          node.end - node.start,
        );
      }
      if (!used.includes(name)) used.push(name);
    } else if (!parameters.includes(name)) {
      rejectBareFunction(node);
      parameters.push(name);
      const near = generated.has(name) ? undefined : likelyColumn(name, columns, 1);
      if (near !== undefined) {
        warnings.push({
          message: `"${name}" is taken as a parameter: did you mean column "${near}"?`,
          offset: node.start,
        });
      }
    }
  }
  return {
    text,
    response,
    responseColumn,
    rhs,
    parameters,
    columns: used,
    warnings,
  };
}

/** Index of the one `=` token, or an error saying what is wrong. */
function splitAtEquals(text: string, tokens: readonly Token[]): number {
  const eqs = tokens.flatMap((t, i) => (t.kind === "sym" && t.text === "=" ? [i] : []));
  if (eqs.length === 0) throw new ExprError(`Missing "=": ${FORM}`, 0, text.length);
  if (eqs.length > 1) {
    const t = tokens[eqs[1]];
    throw new ExprError(`Unexpected "=" at ${at(t.start)}: a model has one "="`, t.start, 1);
  }
  const eq = eqs[0], t = tokens[eq];
  if (eq === 0) throw new ExprError(`Missing response before "=": ${FORM}`, t.start, 1);
  if (eq === tokens.length - 2) {
    throw new ExprError(`Missing expression after "=": ${FORM}`, t.start, 1);
  }
  return eq;
}

/** The response's one column; throws unless the left side is one (transformed) column. */
function checkResponse(text: string, response: Expr, columns: readonly string[]): string {
  const found: IdNode[] = [];
  for (const node of identifiers(response)) {
    if (CONSTANTS.has(node.name)) continue;
    if (!columns.includes(node.name)) {
      rejectBareFunction(node);
      const near = likelyColumn(node.name, columns);
      const tail = near === undefined ? `: ${RESPONSE_FORM}` : `: did you mean "${near}"?`;
      throw new ExprError(
        `Unknown column "${node.name}" in the response${tail}`,
        node.start,
        node.end - node.start,
      );
    }
    if (!found.some((f) => f.name === node.name)) found.push(node);
  }
  if (found.length === 0) {
    const written = text.slice(response.start, response.end);
    throw new ExprError(
      `Response "${written}" contains no column: ${RESPONSE_FORM}`,
      response.start,
      response.end - response.start,
    );
  }
  if (found.length > 1) {
    const [a, b] = found;
    throw new ExprError(
      `Response uses more than one column, "${a.name}" and "${b.name}": the left side contains exactly one column`,
      b.start,
      b.end - b.start,
    );
  }
  return found[0].name;
}
