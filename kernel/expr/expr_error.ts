/**
 * The error raised for a mistake in an expression's text.
 *
 * @module
 */

/**
 * A located mistake in an expression: the message follows the team style and
 * `offset`/`length` mark the offending characters (0-based, UTF-16 units) in
 * the text that was parsed. Callers holding the text inside a document option
 * turn the offset into a line and column (see `CellError` in kernel/errors.ts).
 *
 * @example
 * ```ts
 * import { ExprError } from "./expr_error.ts";
 * const err = new ExprError('Unexpected ")" at column 3', 2, 1);
 * if (err.offset !== 2 || !(err instanceof Error)) throw new Error("bad ExprError");
 * ```
 */
export class ExprError extends Error {
  /** 0-based character offset of the mistake in the parsed text. */
  offset: number;
  /** Number of characters the mistake spans (0 at the end of the text). */
  length: number;
  /**
   * @param message Sentence case, no final period, offending text quoted.
   * @param offset 0-based character offset in the parsed text.
   * @param length Characters covered, at least 0.
   */
  constructor(message: string, offset: number, length: number) {
    super(message);
    this.name = "ExprError";
    this.offset = offset;
    this.length = Math.max(0, length);
  }
}
