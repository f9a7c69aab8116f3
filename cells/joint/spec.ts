/**
 * The options of a `joint` cell and their normaliser: one model fitted to
 * several tables at once, some parameters shared by every table and the
 * others one per table.
 *
 * ```joint decay
 * tables: [at-20, at-30, at-40]      # the table cells, one group each (or on + by)
 * on: runs                           # one table whose rows ...
 * by: batch                          # ... are split into groups by this column
 * model: signal = a*exp(-k*t) + b    # response = expression, as a fit writes it (required)
 * shared: [k]                        # parameters with one value for every group (default none)
 * start: { k: 0.1, a: { at-20: 90, at-30: 70 } }  # a number for every group, or one per group
 * within: { k: [0, null] }           # ranges [lower, upper] every copy stays inside
 * count_variance: true               # AIC, AICc, BIC count σ² as a parameter (default)
 * ```
 *
 * Model text is only checked for being a string here: its names are known
 * only when the tables have run, so `run` parses it against their columns.
 *
 * @module
 */
import { parseRange } from "../fit/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import {
  badOption,
  checkOptionKeys,
  missingOption,
  type OptionDecls,
  type ParseContext,
  readBoolean,
  readMapping,
  shown,
} from "../../kernel/contract/mod.ts";

/** A start value: one number for every group, or one per group (by group label). */
export type StartValue = number | Record<string, number>;

/** A `joint` cell's normalised options (plain JSON: hashed into the cache key). */
export interface JointSpec {
  /** The table cells, one group each, in the order written (empty with `on`). */
  tables: string[];
  /** One table whose rows `by` splits into groups (absent with `tables`). */
  on?: string;
  /** The grouping column of `on`. */
  by?: string;
  /** The model equation as written. */
  model: string;
  /** Parameters shared by every group, in the order written. */
  shared: string[];
  /** Start values by parameter. */
  start: Record<string, StartValue>;
  /** Ranges [lower, upper] by parameter, null for an open end. */
  within: Record<string, [number | null, number | null]>;
  /** False when the criteria count only the mean parameters. */
  countVariance: boolean;
}

/** Options a `joint` cell understands, each declared once. */
export const JOINT_OPTIONS: OptionDecls = {
  tables: {
    type: "list",
    doc: "the table cells fitted together, one group each (or give on and by)",
    names: "cells",
  },
  on: {
    type: "text",
    doc: "one table cell whose rows the by column splits into groups",
    names: "cell",
  },
  by: {
    type: "text",
    doc: "with on: the column whose values name the groups",
    names: "column",
  },
  model: {
    type: "equation",
    doc: "the model equation, response = expression, as in a fit",
    required: true,
  },
  shared: {
    type: "list",
    doc: "parameters with one value for every group; the others get one value per group",
  },
  start: {
    type: "mapping",
    doc: "start values: a number for every group, or a mapping of group to number",
  },
  within: {
    type: "mapping",
    doc: "ranges [lower, upper] that every copy of a parameter stays inside, null for an open end",
  },
  count_variance: {
    type: "boolean",
    doc: "whether AIC, AICc and BIC count the error variance as a parameter",
    default: true,
  },
};

const isName = (v: unknown): v is string =>
  typeof v === "string" && v.trim() !== "" && !/\s/.test(v.trim());

/**
 * Checks and normalises a `joint` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For an unknown option, neither or both of `tables` and
 *   `on`, fewer than two tables, a table listed twice, `by` without `on` (or
 *   the reverse), a missing model, a bad `shared` list, start value or range.
 * @example
 * ```ts
 * import { parseJointSpec } from "./spec.ts";
 * const spec = parseJointSpec({
 *   name: "decay", kind: "joint", body: "", warn() {},
 *   options: { tables: ["t20", "t30"], model: "y = a*exp(-k*t)", shared: ["k"] },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.shared[0] !== "k" || spec.tables.length !== 2) throw new Error(JSON.stringify(spec));
 * ```
 */
export function parseJointSpec(ctx: ParseContext): JointSpec {
  checkOptionKeys(ctx, JOINT_OPTIONS);
  return {
    ...groupsOf(ctx),
    model: modelText(ctx),
    shared: sharedNames(ctx),
    start: startValues(ctx),
    within: ranges(ctx),
    countVariance: readBoolean(ctx, "count_variance", true),
  };
}

/** `tables: [a, b, …]`, or `on: table` with `by: column`: exactly one of the two. */
function groupsOf(ctx: ParseContext): Pick<JointSpec, "tables" | "on" | "by"> {
  const o = ctx.options;
  const has = (k: string) => o[k] !== undefined && o[k] !== null;
  if (has("tables") && has("on")) {
    throw new CellError(
      `Joint fit "${ctx.name}" names both "tables" and "on": give a list of tables, or one table with a grouping column (on and by)`,
      ["on"],
    );
  }
  if (has("on") || has("by")) {
    if (!has("on")) {
      throw missingOption(ctx, "on", "name the table whose rows by splits, as in on: runs");
    }
    if (!has("by")) {
      throw missingOption(
        ctx,
        "by",
        "name the column whose values name the groups, as in by: batch",
      );
    }
    if (!isName(o.on)) throw badOption(ctx, "on", "the name of a table cell");
    if (!isName(o.by)) throw badOption(ctx, "by", "the name of a column of that table");
    return { tables: [], on: o.on.trim(), by: o.by.trim() };
  }
  if (!has("tables")) {
    throw missingOption(
      ctx,
      "tables",
      "list the tables fitted together, as in tables: [at-20, at-30], or give one table and a grouping column (on: runs, by: batch)",
    );
  }
  const v = o.tables;
  if (!Array.isArray(v)) {
    throw badOption(ctx, "tables", "a list of table cells, such as [at-20, at-30]");
  }
  const out: string[] = [];
  v.forEach((x, i) => {
    if (!isName(x)) {
      throw new CellError(
        `Entry ${i + 1} of "tables" in joint "${ctx.name}" is "${
          shown(x)
        }": expected the name of a table cell`,
        ["tables", i],
      );
    }
    const name = x.trim();
    if (out.includes(name)) {
      throw new CellError(
        `Table "${name}" is listed twice in "tables" of joint "${ctx.name}"`,
        ["tables", i],
      );
    }
    out.push(name);
  });
  if (out.length < 2) {
    throw new CellError(
      `Joint fit "${ctx.name}" lists ${out.length} ${
        out.length === 1 ? "table" : "tables"
      }: a joint fit needs two or more (one table alone is a fit)`,
      ["tables"],
    );
  }
  return { tables: out };
}

function modelText(ctx: ParseContext): string {
  const v = ctx.options.model;
  if (v === undefined || v === null) {
    throw missingOption(
      ctx,
      "model",
      "write the model as response = expression, as in model: y = a*exp(-k*t)",
    );
  }
  if (typeof v !== "string" || v.trim() === "") {
    throw badOption(ctx, "model", "an equation such as y = a*exp(-k*t)");
  }
  return v;
}

function sharedNames(ctx: ParseContext): string[] {
  const v = ctx.options.shared;
  if (v === undefined || v === null) return [];
  const list = typeof v === "string" ? [v] : v;
  if (!Array.isArray(list)) throw badOption(ctx, "shared", "a list of parameters, such as [k]");
  const out: string[] = [];
  list.forEach((x, i) => {
    if (!isName(x)) {
      throw new CellError(
        `Entry ${i + 1} of "shared" in joint "${ctx.name}" is "${
          shown(x)
        }": expected a parameter's name`,
        Array.isArray(v) ? ["shared", i] : ["shared"],
      );
    }
    if (out.includes(x.trim())) {
      throw new CellError(
        `Parameter "${x.trim()}" is listed twice in "shared" of joint "${ctx.name}"`,
        ["shared", i],
      );
    }
    out.push(x.trim());
  });
  return out;
}

function startValues(ctx: ParseContext): Record<string, StartValue> {
  const v = readMapping(ctx, "start", "{ k: 0.1, a: { at-20: 90, at-30: 70 } }");
  if (v === null) return {};
  const out: Record<string, StartValue> = {};
  const finite = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
  for (const [k, x] of Object.entries(v)) {
    if (finite(x)) {
      out[k] = x;
      continue;
    }
    if (x === null || typeof x !== "object" || Array.isArray(x)) {
      throw new CellError(
        `Start value of "${k}" in joint "${ctx.name}" is "${
          shown(x)
        }": expected a number, or a mapping of group to number such as { at-20: 90, at-30: 70 }`,
        ["start", k],
      );
    }
    const per: Record<string, number> = {};
    for (const [g, y] of Object.entries(x as Record<string, unknown>)) {
      if (!finite(y)) {
        throw new CellError(
          `Start value of "${k}" for group "${g}" in joint "${ctx.name}" is "${
            shown(y)
          }": expected a finite number`,
          ["start", k, g],
        );
      }
      per[g] = y;
    }
    out[k] = per;
  }
  return out;
}

function ranges(ctx: ParseContext): Record<string, [number | null, number | null]> {
  const v = readMapping(ctx, "within", "{ k: [0, null] }");
  if (v === null) return {};
  const out: Record<string, [number | null, number | null]> = {};
  for (const [k, range] of Object.entries(v)) out[k] = parseRange(ctx, k, range, "joint");
  return out;
}
