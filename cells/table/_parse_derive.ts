/**
 * Normalisers of `derive` (new columns by expression) and `where` (a row
 * filter). Syntax is checked here; names are resolved against the columns
 * in `run`.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { ExprError, parseExpression } from "../../kernel/expr/mod.ts";
import { splitComparison } from "./_where.ts";

const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * Checks `derive`: a mapping of new column names to expressions.
 *
 * @throws {CellError} On ["derive"] for a non-mapping, on ["derive", name]
 *   for a name that cannot be used in expressions or a syntax error (with
 *   the offset into the expression).
 */
export function parseDerive(v: unknown): { name: string; expression: string }[] {
  if (v === undefined || v === null) return [];
  if (typeof v !== "object" || Array.isArray(v)) {
    throw new CellError(
      `Option "derive" must be a mapping of new column names to expressions, such as { logc: log10(conc) }`,
      ["derive"],
    );
  }
  return Object.entries(v as Record<string, unknown>).map(([name, text]) => {
    if (!NAME.test(name)) {
      throw new CellError(
        `Derived column name "${name}" cannot be used in expressions: use letters, digits and _, ` +
          `starting with a letter`,
        ["derive", name],
      );
    }
    const expression = typeof text === "number" ? String(text) : text;
    if (typeof expression !== "string" || expression.trim() === "") {
      throw new CellError(`Derived column "${name}" needs an expression such as log10(conc)`, [
        "derive",
        name,
      ]);
    }
    try {
      parseExpression(expression);
    } catch (e) {
      if (e instanceof ExprError) throw new CellError(e.message, ["derive", name], e.offset);
      throw e;
    }
    return { name, expression };
  });
}

/**
 * Checks `where`: one comparison, or several joined by `and`.
 *
 * @throws {CellError} On ["where"], with the offset of the mistake.
 */
export function parseWhere(v: unknown): string | null {
  if (v === undefined || v === null) return null;
  if (typeof v !== "string" || v.trim() === "") {
    throw new CellError(`Option "where" must be a comparison such as temp >= 20`, ["where"]);
  }
  let part = { text: v, offset: 0 };
  try {
    for (const c of splitComparison(v)) {
      for (part of [c.left, c.right]) parseExpression(part.text);
    }
  } catch (e) {
    if (e instanceof ExprError) throw new CellError(e.message, ["where"], part.offset + e.offset);
    throw e;
  }
  return v;
}
