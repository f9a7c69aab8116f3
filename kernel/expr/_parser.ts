/**
 * Recursive-descent parser over a token range, shared by
 * {@link parseExpression} and the two sides of a model.
 *
 * Grammar, loosest binding first:
 *
 * ```
 *  sum     := product (("+" | "-") product)*          left-associative
 *  product := unary (("*" | "/") unary)*              left-associative
 *  unary   := ("-" | "+") unary | power
 *  power   := primary ("^" unary)?                    right-associative
 *  primary := number | name | name "(" args ")" | "(" sum ")"
 *  args    := sum ("," sum)*
 * ```
 *
 * `^` binds tighter than unary minus (`-x^2` is `-(x^2)`), and its exponent
 * may itself be signed (`2^-1`). A minus applied to a number literal folds
 * into the literal, so `-2` is the number -2 and formatting round-trips.
 * Calls are checked against the function table (name and arity) here; which
 * names are columns or parameters is decided by the callers.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { FUNCTIONS, PUBLIC_FUNCTIONS } from "./functions.ts";
import { at, type Token } from "./_lexer.ts";
import { nearest } from "../suggest.ts";
import { checkDepth, MAX_NESTING, tooNested } from "./_depth.ts";

/** The model shorthands (see `_shorthands.ts`). */
export const SHORTHANDS: readonly string[] = ["polynomial", "linear"];

/** Parses tokens `[from, to)`; `tokens[to]` is treated as the end. */
export class Parser {
  #tokens: readonly Token[];
  #pos: number;
  #to: number;
  #endAt: number;
  #shorthands: boolean;
  /** Open parentheses, calls, signs and exponents around the current token. */
  #nesting = 0;

  /**
   * @param tokens Tokens of the whole text.
   * @param from First token of the range.
   * @param to Index one past the range's last token.
   * @param shorthands Accept the model shorthands `polynomial(…)` and
   *   `linear(…)` as calls with any number of arguments (expanded later by
   *   `_shorthands.ts`); otherwise they are an error.
   */
  constructor(tokens: readonly Token[], from: number, to: number, shorthands = false) {
    this.#shorthands = shorthands;
    this.#tokens = tokens;
    this.#pos = from;
    this.#to = to;
    this.#endAt = tokens[to].start;
  }

  /** Parses the whole range as one expression. */
  parseAll(): Expr {
    if (this.#atEnd()) {
      throw new ExprError("Empty expression", this.#endAt, 0);
    }
    const e = this.#sum();
    if (!this.#atEnd()) this.#unexpected(this.#peek(), true);
    return checkDepth(e);
  }

  #atEnd(): boolean {
    return this.#pos >= this.#to;
  }

  /** The next token; at the range's end, the token that closes it (`=` or the end). */
  #peek(): Token {
    return this.#tokens[this.#atEnd() ? this.#to : this.#pos];
  }

  #isSym(text: string): boolean {
    const t = this.#peek();
    return t.kind === "sym" && t.text === text;
  }

  /** One level deeper; refused past {@link MAX_NESTING} before the call stack runs out. */
  #enter(t: Token): void {
    if (++this.#nesting > MAX_NESTING) throw tooNested(t.start, t.end - t.start);
  }

  #unexpected(t: Token, afterOperand = false): never {
    if (t.kind === "end") {
      throw new ExprError(`Unexpected end of expression at ${at(t.start)}`, t.start, 0);
    }
    const juxtaposed = t.kind !== "sym" || t.text === "(";
    const hint = afterOperand && juxtaposed ? ': a product needs "*"' : "";
    throw new ExprError(
      `Unexpected "${t.text}" at ${at(t.start)}${hint}`,
      t.start,
      t.end - t.start,
    );
  }

  #sum(): Expr {
    let left = this.#product();
    while (this.#isSym("+") || this.#isSym("-")) {
      const op = this.#tokens[this.#pos++].text as "+" | "-";
      const right = this.#product();
      left = { op, left, right, start: left.start, end: right.end };
    }
    return left;
  }

  #product(): Expr {
    let left = this.#unary();
    while (this.#isSym("*") || this.#isSym("/")) {
      const op = this.#tokens[this.#pos++].text as "*" | "/";
      const right = this.#unary();
      left = { op, left, right, start: left.start, end: right.end };
    }
    return left;
  }

  /** Signs then a power; a run of signs is read in a loop (5,000 signs cost no call stack). */
  #unary(): Expr {
    const signs: Token[] = [];
    while (this.#isSym("-") || this.#isSym("+")) signs.push(this.#tokens[this.#pos++]);
    let arg = this.#power();
    for (let s = signs.length - 1; s >= 0; s--) {
      const sign = signs[s];
      const start = sign.start, end = arg.end;
      if (sign.text === "+") arg = { ...arg, start };
      else if (arg.op === "num") arg = { op: "num", value: -arg.value, start, end };
      else arg = { op: "neg", arg, start, end };
    }
    return arg;
  }

  #power(): Expr {
    const base = this.#primary();
    if (!this.#isSym("^")) return base;
    this.#enter(this.#tokens[this.#pos++]);
    const exponent = this.#unary();
    this.#nesting--;
    return { op: "^", left: base, right: exponent, start: base.start, end: exponent.end };
  }

  #primary(): Expr {
    const t = this.#peek();
    if (t.kind === "num") {
      this.#pos++;
      return { op: "num", value: Number(t.text), start: t.start, end: t.end };
    }
    if (t.kind === "id") {
      this.#pos++;
      if (this.#isSym("(")) {
        // `a (b)` with a space and no such function is a product missing its "*".
        const spaced = this.#peek().start > t.end && !FUNCTIONS.has(t.text) &&
          !SHORTHANDS.includes(t.text);
        if (spaced) this.#unexpected(this.#peek(), true);
        return this.#call(t);
      }
      return { op: "id", name: t.text, start: t.start, end: t.end };
    }
    if (t.kind === "sym" && t.text === "(") {
      this.#pos++;
      this.#enter(t);
      const inner = this.#sum();
      this.#nesting--;
      this.#expectClose(t);
      // Parentheses are not kept in the tree; the span still covers them.
      return { ...inner, start: t.start, end: this.#tokens[this.#pos - 1].end };
    }
    this.#unexpected(t);
  }

  #expectClose(open: Token): void {
    if (this.#isSym(")")) {
      this.#pos++;
      return;
    }
    const t = this.#peek();
    if (t.kind === "end") {
      throw new ExprError(`Missing ")" to close "(" at ${at(open.start)}`, open.start, 1);
    }
    this.#unexpected(t, true);
  }

  #call(name: Token): Expr {
    const info = FUNCTIONS.get(name.text);
    if (SHORTHANDS.includes(name.text)) return this.#shorthand(name);
    if (info === undefined) {
      const near = nearest(name.text, [...PUBLIC_FUNCTIONS, ...SHORTHANDS]);
      const tail = near === undefined
        ? `: the functions are ${PUBLIC_FUNCTIONS.join(", ")}`
        : `: did you mean "${near}"?`;
      throw new ExprError(
        `Unknown function "${name.text}"${tail}`,
        name.start,
        name.end - name.start,
      );
    }
    const open = this.#tokens[this.#pos++];
    const args = this.#args();
    const end = this.#closeArgs(open);
    if (args.length !== info.arity) {
      const noun = info.arity === 1 ? "argument" : "arguments";
      throw new ExprError(
        `Function "${info.name}" takes ${info.arity} ${noun}, got ${args.length}`,
        name.start,
        end - name.start,
      );
    }
    return { op: "call", fn: info.name, args, start: name.start, end };
  }

  #args(): Expr[] {
    this.#enter(this.#tokens[this.#pos - 1]);
    const args: Expr[] = [];
    if (!this.#isSym(")")) {
      args.push(this.#sum());
      while (this.#isSym(",")) {
        this.#pos++;
        args.push(this.#sum());
      }
    }
    this.#nesting--;
    return args;
  }

  #closeArgs(open: Token): number {
    this.#expectClose(open);
    return this.#tokens[this.#pos - 1].end;
  }

  /** `polynomial(…)` or `linear(…)`: kept as a call for `_shorthands.ts`, arguments unchecked. */
  #shorthand(name: Token): Expr {
    if (!this.#shorthands) {
      throw new ExprError(
        `Shorthand "${name.text}" may be used only on the right side of a model`,
        name.start,
        name.end - name.start,
      );
    }
    const open = this.#tokens[this.#pos++];
    const args = this.#args();
    const end = this.#closeArgs(open);
    return { op: "call", fn: name.text, args, start: name.start, end };
  }
}
