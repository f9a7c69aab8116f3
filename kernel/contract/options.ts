/**
 * Declared options and the readers every kind shares.
 *
 * A kind declares each option once: its type, default, one line of
 * documentation, and whether its value names a cell, a column or a file.
 * The declaration drives the unknown-key check (with a near-miss
 * suggestion), the reference documentation and the add-cell templates. The
 * readers below check the common types with one message vocabulary:
 *
 * ```
 * Missing "on" in fit "line": name the table cell to fit, as in on: cycles
 * Option "folds" of compare "shape" is "1": expected a whole number, 2 or more
 * Unknown option "wieghts" in fit "line": did you mean "weights"?
 * ```
 *
 * @module
 */
import { CellError } from "../errors.ts";
import { didYouMean } from "../suggest.ts";
import type { ParseContext } from "./kind.ts";

import type { OptionDecls } from "./option_decl.ts";
export type { OptionDecl, OptionDecls, OptionType } from "./option_decl.ts";

/**
 * Refuses an option key the kind does not declare, suggesting the nearest.
 *
 * @param ctx The parse context.
 * @param decls The kind's declared options.
 * @throws {CellError} For the first unknown key, at that key.
 * @example
 * ```ts
 * import { checkOptionKeys } from "./options.ts";
 * const ctx = { name: "line", kind: "fit", options: { wieghts: "1/x" } } as never;
 * try {
 *   checkOptionKeys(ctx, { weights: { type: "expression", doc: "relative weights" } });
 *   throw new Error("accepted");
 * } catch (e) {
 *   if (!(e as Error).message.includes('did you mean "weights"')) throw e;
 * }
 * ```
 */
export function checkOptionKeys(ctx: ParseContext, decls: OptionDecls): void {
  const keys = Object.keys(decls);
  for (const key of Object.keys(ctx.options)) {
    if (Object.hasOwn(decls, key)) continue;
    const hint = didYouMean(key, keys) ||
      `: a ${ctx.kind} cell takes ${keys.map((k) => `"${k}"`).join(", ")}`;
    throw new CellError(`Unknown option "${key}" in ${ctx.kind} "${ctx.name}"${hint}`, [key]);
  }
}

/** The value as it reads in a message. */
export function shown(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(shown).join(", ")}]`;
  if (v !== null && typeof v === "object") return "a mapping";
  return String(v);
}

/** A {@link CellError} at `key`: `Option "key" of kind "name" is "v": expected …`. */
export function badOption(ctx: ParseContext, key: string, expected: string): CellError {
  return new CellError(
    `Option "${key}" of ${ctx.kind} "${ctx.name}" is "${
      shown(ctx.options[key])
    }": expected ${expected}`,
    [key],
  );
}

/** A {@link CellError} on the cell: `Missing "key" in kind "name": how`. */
export function missingOption(ctx: ParseContext, key: string, how: string): CellError {
  return new CellError(`Missing "${key}" in ${ctx.kind} "${ctx.name}": ${how}`, []);
}

const isName = (v: unknown): v is string =>
  typeof v === "string" && v.trim() !== "" && !/\s/.test(v.trim());

/**
 * A required option naming one other cell.
 *
 * @param ctx The parse context.
 * @param key The option.
 * @param what The kind of cell it names ("table", "fit").
 * @param how How to fill it in, for the missing case ("name the table cell to fit, as in on: cycles").
 * @returns The name, trimmed.
 * @throws {CellError} When missing or not a single word.
 * @example
 * ```ts
 * import { readCellName } from "./options.ts";
 * const ctx = { name: "j", kind: "check", options: { fit: " line " } } as never;
 * if (readCellName(ctx, "fit", "fit", "name it") !== "line") throw new Error();
 * ```
 */
export function readCellName(ctx: ParseContext, key: string, what: string, how: string): string {
  const v = ctx.options[key];
  if (v === undefined || v === null) throw missingOption(ctx, key, how);
  if (!isName(v)) throw badOption(ctx, key, `the name of a ${what} cell`);
  return v.trim();
}

/**
 * An optional choice among words (any letter case).
 *
 * @param ctx The parse context.
 * @param key The option.
 * @param allowed The words accepted.
 * @returns The word in lower case, or null when not given.
 * @throws {CellError} For another value, suggesting the nearest word.
 */
export function readChoice<T extends string>(
  ctx: ParseContext,
  key: string,
  allowed: readonly T[],
): T | null {
  const v = ctx.options[key];
  if (v === undefined || v === null) return null;
  const s = typeof v === "string" ? v.trim().toLowerCase() : "";
  if ((allowed as readonly string[]).includes(s)) return s as T;
  const hint = typeof v === "string" ? didYouMean(s, allowed) : "";
  throw new CellError(
    `Option "${key}" of ${ctx.kind} "${ctx.name}" is "${shown(v)}"${
      hint || `: expected one of ${allowed.join(", ")}`
    }`,
    [key],
  );
}

/**
 * An optional number passing a test.
 *
 * @param ctx The parse context.
 * @param key The option.
 * @param fallback The value when not given.
 * @param ok The test a given value must pass.
 * @param expected What is expected, for the message ("a number in (0, 0.5], such as 0.05").
 * @returns The number.
 * @throws {CellError} For a value that is not a number or fails the test.
 * @example
 * ```ts
 * import { readNumber } from "./options.ts";
 * const ctx = { name: "j", kind: "check", options: {} } as never;
 * if (readNumber(ctx, "significance", 0.05, (x) => x > 0 && x <= 0.5, "a level") !== 0.05) throw new Error();
 * ```
 */
export function readNumber(
  ctx: ParseContext,
  key: string,
  fallback: number,
  ok: (x: number) => boolean,
  expected: string,
): number {
  const v = ctx.options[key];
  if (v === undefined || v === null) return fallback;
  if (typeof v !== "number" || !ok(v)) throw badOption(ctx, key, expected);
  return v;
}

/**
 * An optional true or false.
 *
 * @param ctx The parse context.
 * @param key The option.
 * @param fallback The value when not given.
 * @returns The boolean.
 * @throws {CellError} For any other value.
 */
export function readBoolean(ctx: ParseContext, key: string, fallback: boolean): boolean {
  const v = ctx.options[key];
  if (v === undefined || v === null) return fallback;
  if (typeof v !== "boolean") throw badOption(ctx, key, "true or false");
  return v;
}

/**
 * An optional mapping (a YAML mapping, not a list).
 *
 * @param ctx The parse context.
 * @param key The option.
 * @param example An example for the message ("{ a: 1, b: 0.5 }").
 * @returns The mapping, or null when not given.
 * @throws {CellError} For a list or a scalar.
 */
export function readMapping(
  ctx: ParseContext,
  key: string,
  example: string,
): Record<string, unknown> | null {
  const v = ctx.options[key];
  if (v === undefined || v === null) return null;
  if (typeof v !== "object" || Array.isArray(v)) {
    throw badOption(ctx, key, `a mapping such as ${example}`);
  }
  return v as Record<string, unknown>;
}
