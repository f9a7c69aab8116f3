/**
 * Expression texts: a grammar walk over the language (numbers, names,
 * operators, calls with right and wrong argument counts, shorthands), plus
 * structure-aware extremes: parentheses thousands deep, sums and products of
 * thousands of terms, towers of `^` and unary minus, long names, odd Unicode.
 *
 * @module
 */
import { name, nest, NUMBER_EDGES, ODD_UNICODE } from "../_generators.ts";
import type { Rng } from "../_rng.ts";

const FUNCTIONS = [
  "exp",
  "log",
  "log10",
  "sqrt",
  "abs",
  "sin",
  "cos",
  "tan",
  "atan",
  "tanh",
  "pow",
  "min",
  "max",
  "sign",
  "powlog",
  "sqr",
  "polynomial",
  "linear",
];

/** A term of the grammar, `depth` levels at most. */
export function exprText(rng: Rng, depth: number): string {
  if (depth <= 0 || rng.chance(0.3)) {
    const r = rng.next();
    if (r < 0.45) return rng.pick(["x", "y", "z", "a", "b", "k", "q0", "pi", "e"]);
    if (r < 0.75) return String(rng.pick([1, 2, 0.5, 3, 10, 0, 1e-3, 2.5e10]));
    if (r < 0.9) return rng.pick(NUMBER_EDGES);
    return name(rng);
  }
  const sub = () => exprText(rng, depth - 1);
  switch (rng.int(6)) {
    case 0:
    case 1:
      return `${sub()} ${rng.pick(["+", "-", "*", "/", "^", "+", "*"])} ${sub()}`;
    case 2:
      return `(${sub()})`;
    case 3:
      return `-${sub()}`;
    case 4: {
      const fn = rng.pick(FUNCTIONS);
      const n = rng.chance(0.85) ? (/^(pow|min|max|polynomial)$/.test(fn) ? 2 : 1) : rng.int(4);
      return `${fn}(${Array.from({ length: n }, sub).join(", ")})`;
    }
    default:
      return rng.pick(["polynomial(x, 3)", "linear(x, z)", "polynomial(x, 31)", "linear()"]);
  }
}

/** An extreme: deep nesting, long chains, towers, odd characters. */
export function extremeText(rng: Rng): string {
  const n = rng.size(rng.chance(0.5) ? 1500 : 6000);
  switch (rng.int(8)) {
    case 0:
      return nest("(", "x", ")", n);
    case 1:
      return Array.from({ length: n }, (_, i) => `a${i}*x^${i % 7}`).join(" + ");
    case 2:
      return nest("-", "x", "", n);
    case 3:
      return Array(n).fill("x").join("^");
    case 4:
      return nest("exp(", "x", ")", Math.min(n, 3000));
    case 5:
      return nest("(", "x", "", n);
    case 6:
      return `x${rng.pick(ODD_UNICODE)}y + ${"v".repeat(n)}`;
    default:
      return Array(n).fill("x").join(" / ");
  }
}
