/**
 * The linear solver's refusal of aliased terms, in words: which term is a
 * multiple or a linear combination of which others, as the pivoted QR's
 * aliasing report (kernel/linalg `describeAliased`) names them, located at
 * the first aliased parameter in the model text.
 *
 * @module
 */
import { type Expr, format } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { type AliasedColumn, quotedList } from "../../kernel/linalg/mod.ts";
import type { FitProblem } from "./problem.ts";
import { identifierOffset } from "./_offsets.ts";

/** The refusal naming the aliased terms, located at the first one. */
export function aliased(problem: FitProblem, aliasing: AliasedColumn[], terms: Expr[]): CellError {
  const params = problem.model.parameters;
  return new CellError(
    `Cannot fit "${problem.name}": ${
      aliasing.map((a) => aliasPhrase(a, terms, params)).join("; ")
    }`,
    ["model"],
    identifierOffset(problem.model.rhs, aliasing[0].name),
  );
}

/** `column "x3" is a linear combination of "x1" and "x2"`, or the same for general terms. */
function aliasPhrase(a: AliasedColumn, terms: Expr[], params: readonly string[]): string {
  const idx = (name: string) => params.indexOf(name);
  const termOf = (name: string) => format(terms[idx(name)]);
  const isColumn = (name: string) => terms[idx(name)].op === "id";
  const all = [a.name, ...a.of];
  const relation = a.of.length === 0
    ? "is zero in every row used"
    : a.of.length === 1
    ? "is a multiple of"
    : "is a linear combination of";
  if (all.every(isColumn)) {
    const list = a.of.length === 0 ? "" : ` ${quotedList(a.of.map(termOf))}`;
    return `column "${
      termOf(a.name)
    }" ${relation}${list}, so parameter "${a.name}" cannot be estimated`;
  }
  const list = a.of.length === 0
    ? ""
    : ` the ${a.of.length === 1 ? "term" : "terms"} of ${
      joinAnd(a.of.map((p) => `"${p}" (${termOf(p)})`))
    }`;
  return `the term of parameter "${a.name}" (${termOf(a.name)}) ${relation}${list}`;
}

function joinAnd(items: string[]): string {
  return items.length <= 1
    ? items.join("")
    : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}
