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
  "document-uncaught-yaml-stack":
    "kernel/document/_yaml.ts: the yaml package's parser overflows the stack, uncaught",
  "document-uncaught-yaml-stack-2":
    "kernel/document/_yaml.ts: the same overflow, another place in the yaml package",
  "run-leak-object-at":
    "cells/predict/spec.ts atValues: String(v) quotes a list as [object Object]",
  "run-leak-object-solve":
    "cells/predict/spec.ts solveValues: String(v) quotes a list as [object Object]",
  "run-leak-object-weights": "cells/fit/_parse_weighting.ts expression: String(v) quotes a mapping",
};
