/**
 * Fixtures that still fail: crashes the fuzzer found in other engineers'
 * areas, routed to them and not yet fixed. The replay test reports each of
 * these on every run (as "known open") instead of failing, and fails when a
 * listed fixture passes, so this list shrinks as fixes land and never hides
 * a fixed defect. Name → where it breaks, and whose area the fix is in.
 *
 * @module
 */
export const KNOWN_OPEN: Readonly<Record<string, string>> = {
  "document-hang-code-spans":
    "kernel/document/inline_refs.ts skipCodeSpan: quadratic in unmatched backtick runs",
  "expr-hang-derivative-chain":
    "kernel/expr compile/compileDD of a long chain's derivative: seconds at 400 terms",
  "expr-lost-format-nesting":
    "kernel/expr/format.ts writes -(-(…)) past the parser's nesting limit of 100",
};
