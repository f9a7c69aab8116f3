/**
 * Prose lines that once took the page down (issue 11, defect 6), each one
 * prose block: math braces thousands deep, long runs of `*`, emphasis,
 * strike-through, links and brackets, quotes and lists nested far. Shared by
 * ui/prose_test.tsx and test/e2e/hostile_prose_test.ts.
 *
 * @module
 */

/** Name → the block's Markdown. */
export const HOSTILE_PROSE: Readonly<Record<string, string>> = {
  open_braces: "$" + "{".repeat(3000),
  closed_braces: "$" + "{".repeat(3000) + "$",
  display_braces: "$$" + "{".repeat(3000) + "$$",
  fracs: "$$" + "\\frac{".repeat(2000) + "$$",
  stars: "*".repeat(20000),
  star_text: "a " + "*".repeat(20000) + " b",
  emphasis: "*".repeat(6000) + "x" + "*".repeat(6000),
  underscores: "_".repeat(6000) + "x" + "_".repeat(6000),
  strikes: "~~".repeat(3000) + "x" + "~~".repeat(3000),
  links: "[".repeat(5000) + "x" + "](u)".repeat(5000),
  quotes: "> ".repeat(5000) + "deep",
  lists: "- ".repeat(5000) + "deep",
};
